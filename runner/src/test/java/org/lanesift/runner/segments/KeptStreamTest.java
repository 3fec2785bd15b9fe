package org.lanesift.runner.segments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;

/**
 * A segment's kept stream gives back exactly the blocks the front emitted (edge lists rebuilt from
 * pooled chunks), and clips them as {@link SegmentedRun.Streams#clip} clips the originals; chunks
 * given back are reused without changing what a later segment reads.
 */
class KeptStreamTest {
    /** Random edge lists, some empty, some with unknown spans, some larger than a chunk; a logic block among them. */
    private static List<Block> stream(Random r) {
        List<Block> l = new ArrayList<>();
        long t = r.nextInt(1000);
        for (int b = 0; b < 40; b++) {
            int n = switch (r.nextInt(6)) {
                case 0 -> 0;
                case 1 -> TimeChunks.CHUNK_LONGS + r.nextInt(100);
                default -> r.nextInt(5000);
            };
            long start = t;
            long[] times = new long[n];
            for (int i = 0; i < n; i++) {
                t += 1 + r.nextInt(50);
                times[i] = t;
            }
            long end = t + 1 + r.nextInt(50);
            long[] spans = null;
            int spanCount = 0;
            if (n > 2 && r.nextInt(4) == 0) {
                spans = new long[] {times[0], times[1], times[n - 1], end};
                spanCount = 2;
            }
            l.add(new Edges("c", start, end, r.nextBoolean(), times, n, spans, spanCount));
            if (b == 20) {
                long[] bits = {r.nextLong()};
                l.add(new LogicBlock("c", 0, end, 10.0, bits, 64, null));
            }
            t = end;
        }
        return l;
    }

    private static void assertSameBlocks(List<Block> want, List<Block> got) {
        assertEquals(want.size(), got.size());
        for (int i = 0; i < want.size(); i++) {
            Block w = want.get(i);
            Block g = got.get(i);
            if (w instanceof Edges a) {
                Edges b = (Edges) g;
                assertEquals(a.channel(), b.channel());
                assertEquals(a.startFs(), b.startFs(), "block " + i);
                assertEquals(a.endFs(), b.endFs(), "block " + i);
                assertEquals(a.initialLevel(), b.initialLevel(), "block " + i);
                assertArrayEquals(java.util.Arrays.copyOf(a.timesFs(), a.count()), java.util.Arrays.copyOf(b.timesFs(), b.count()), "block " + i);
                assertArrayEquals(java.util.Arrays.copyOf(a.invalidSpans(), 2 * a.invalidCount()),
                        java.util.Arrays.copyOf(b.invalidSpans(), 2 * b.invalidCount()), "block " + i);
            } else {
                assertEquals(w, g, "block " + i);
            }
        }
    }

    @Test
    void keptBlocksComeBackAsEmittedAndClipAsTheOriginals() {
        TimeChunks pool = new TimeChunks();
        for (long seed = 1; seed <= 30; seed++) {
            Random r = new Random(seed);
            List<Block> emitted = stream(r);
            KeptStream k = new KeptStream(pool);
            emitted.forEach(k::add);
            assertSameBlocks(emitted, k.blocks());
            long first = emitted.get(0).startFs();
            long last = ((Edges) emitted.get(emitted.size() - 1)).endFs();
            for (int cut = 0; cut < 5; cut++) {
                long from = first + (long) (r.nextDouble() * (last - first));
                long to = from + (long) (r.nextDouble() * (last - from));
                List<Block> want = new ArrayList<>();
                for (Block b : emitted) {
                    Block c = SegmentedRun.Streams.clip(b, from, to);
                    if (c != null) {
                        want.add(c);
                    }
                }
                assertSameBlocks(want, k.clipped(from, to));
            }
            k.release();
            assertEquals(List.of(), k.blocks());
        }
    }

    @Test
    void chunksGivenBackAreReusedAndTheEmittedArraysAreNotKept() {
        TimeChunks pool = new TimeChunks();
        long[] times = {5, 6, 7};
        KeptStream k = new KeptStream(pool);
        k.add(new Edges("c", 0, 10, false, times, 3, null, 0));
        times[0] = 1; // the front may reuse its array once the block is handed on
        Edges back = (Edges) k.blocks().get(0);
        assertArrayEquals(new long[] {5, 6, 7}, back.timesFs());
        assertNotSame(times, back.timesFs());
        k.release();
        long[] reused = pool.take(1);
        assertEquals(TimeChunks.CHUNK_LONGS, reused.length);
        assertEquals(5, reused[0], "the chunk the stream gave back");
    }
}
