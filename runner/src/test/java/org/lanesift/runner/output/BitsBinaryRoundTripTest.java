package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.WordStream;

/** The packed binary forms read back, by a reader written from docs/bits-binary.md, exactly as written. */
class BitsBinaryRoundTripTest {
    @TempDir
    Path tmp;

    /** Random bits in blocks of awkward sizes (1, 63, 64, 65 and more), every plane random; garbage past each count. */
    static List<BitStream> randomBlocks(long seed, int... sizes) {
        Random r = new Random(seed);
        List<BitStream> out = new java.util.ArrayList<>();
        long edge = 7;
        long t = -5_000_000L;
        for (int n : sizes) {
            int words = BitSets.words(n) + 1; // one word more than needed, filled too: the writer must not copy it
            long[] v = new long[words];
            long[] f = new long[words];
            long[] d = new long[words];
            for (int w = 0; w < words; w++) {
                v[w] = r.nextLong();
                f[w] = r.nextLong() & r.nextLong();
                d[w] = r.nextLong();
            }
            long[] times = new long[n];
            long[] edges = new long[n];
            for (int i = 0; i < n; i++) {
                times[i] = t;
                edges[i] = edge++;
                t += 2_500_000L + r.nextInt(1000);
            }
            long[] margins = new long[n];
            out.add(new BitStream("d0", times[0], t, n, v, times, edges, d, null, margins, margins, f, 2_500_000.4));
            edge += r.nextInt(3) * 100; // a clock dropout now and then
        }
        return out;
    }

    @Test
    void bitsComeBackBitForBitWithTheirChunkHeaders() throws Exception {
        List<BitStream> blocks = randomBlocks(19, 1, 63, 64, 65, 1000, 4097);
        Path file = tmp.resolve("d0.bits");
        try (BitsBinaryWriter w = new BitsBinaryWriter(file)) {
            for (BitStream b : blocks) {
                w.write(b);
            }
        }
        BinaryOutputs.Bits back = BinaryOutputs.bits(file);
        int total = blocks.stream().mapToInt(BitStream::count).sum();
        assertEquals(total, back.count());
        assertEquals(total, back.headerCount());
        assertEquals(2_500_000L, back.unitIntervalFs(), "the unit interval rounded to whole fs");
        assertEquals(blocks.size(), back.chunks().size());
        int at = 0;
        for (int c = 0; c < blocks.size(); c++) {
            BitStream b = blocks.get(c);
            BinaryOutputs.Chunk h = back.chunks().get(c);
            assertEquals(b.count(), h.count());
            assertEquals(b.clockEdge()[0], h.firstClockEdge());
            assertEquals(b.clockEdge()[b.count() - 1], h.lastClockEdge());
            assertEquals(b.timesFs()[0], h.firstTimeFs());
            assertEquals(b.timesFs()[b.count() - 1], h.lastTimeFs());
            for (int i = 0; i < b.count(); i++, at++) {
                assertEquals(b.bit(i), BitSets.get(back.values(), at), "value of bit " + i + " of block " + c);
                assertEquals(b.isFlagged(i), BitSets.get(back.flagged(), at), "flag of bit " + i + " of block " + c);
                assertEquals(BitSets.get(b.falling(), i), BitSets.get(back.falling(), at), "edge of bit " + i + " of block " + c);
            }
        }
        // Source: docs/bits-binary.md, chunk size 40 + 24 w bytes after a 32-byte header
        long size = 32;
        for (BitStream b : blocks) {
            size += 40 + 24L * ((b.count() + 63) / 64);
        }
        assertEquals(size, Files.size(file));
    }

    @Test
    void aFileWithNoBitsHasAHeaderAndACountOfZero() throws Exception {
        Path file = tmp.resolve("none.bits");
        new BitsBinaryWriter(file).close();
        BinaryOutputs.Bits back = BinaryOutputs.bits(file);
        assertEquals(0, back.count());
        assertEquals(0, back.headerCount());
        assertEquals(32, Files.size(file));
    }

    @Test
    void wordsComeBackRecordByRecord() throws Exception {
        Random r = new Random(5);
        Path file = tmp.resolve("p.words");
        List<long[]> want = new java.util.ArrayList<>();
        try (WordsBinaryWriter w = new WordsBinaryWriter(file)) {
            for (int block = 0; block < 3; block++) {
                int n = 10 + block * 7;
                long[] v = new long[n];
                long[] s = new long[n];
                long[] e = new long[n];
                int[] lane = new int[n];
                byte[] flags = new byte[n];
                for (int i = 0; i < n; i++) {
                    v[i] = r.nextLong() >>> 8;
                    s[i] = block * 1_000_000L + i * 1000L;
                    e[i] = s[i] + 900;
                    lane[i] = r.nextInt(4);
                    flags[i] = (byte) r.nextInt(128);
                    want.add(new long[] {v[i], s[i], e[i], lane[i], flags[i]});
                }
                w.write(new WordStream("p", s[0], e[n - 1], n, 56, v, s, e, lane, flags));
            }
        }
        List<BinaryOutputs.Word> back = BinaryOutputs.words(file);
        assertEquals(want.size(), back.size());
        for (int i = 0; i < want.size(); i++) {
            long[] x = want.get(i);
            BinaryOutputs.Word y = back.get(i);
            assertEquals(new BinaryOutputs.Word(x[0], x[1], x[2], (int) x[3], (int) x[4], 56), y, "word " + i);
        }
        assertEquals(32 + 32L * want.size(), Files.size(file));
    }
}
