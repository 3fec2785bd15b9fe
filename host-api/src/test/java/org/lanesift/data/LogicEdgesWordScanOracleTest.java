package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link LogicEdges} against {@link OldPerBitLogicEdges}, the per-bit code it replaced, bit for bit:
 * seeded random streams built from whole words of every kind (all zeros, all ones, random, sparse
 * transitions) with unknown samples in every shape (none, single samples, runs across word and
 * block boundaries, whole words, whole blocks), cut into blocks that start and end anywhere in a word.
 */
class LogicEdgesWordScanOracleTest {
    static final double[] PERIODS = {2e7, 20_000_001, 1e15 / 3e6, 1e15 / 3.3e8, 1e6};

    @Test
    void sameEdgesAsThePerBitCode() {
        long blocksWithUnknowns = 0;
        long transitions = 0;
        for (int seed = 0; seed < 400; seed++) {
            Random r = new Random(1000 + seed);
            double p = PERIODS[seed % PERIODS.length];
            int totalWords = 1 + r.nextInt(60);
            long[] bits = new long[totalWords];
            long[] inv = new long[totalWords];
            for (int w = 0; w < totalWords; w++) {
                bits[w] = word(r);
                inv[w] = switch (seed % 4) {
                    case 0 -> 0L;
                    case 1 -> r.nextInt(4) == 0 ? word(r) : 0L;
                    default -> unknownWord(r);
                };
            }
            int total = totalWords * 64 - r.nextInt(64);
            LogicEdges fast = new LogicEdges();
            OldPerBitLogicEdges old = new OldPerBitLogicEdges();
            int at = 0;
            while (at < total) {
                int n = Math.min(total - at, r.nextInt(5) == 0 ? r.nextInt(3) : 1 + r.nextInt(r.nextBoolean() ? 70 : 900));
                long[] bb = BitSets.slice(bits, at, n);
                long[] ii = r.nextInt(6) == 0 ? null : BitSets.slice(inv, at, n);
                if (r.nextInt(3) == 0 && bb.length > 0 && (n & 63) != 0) {
                    bb[bb.length - 1] |= -1L << (n & 63); // junk past the length
                    if (ii != null) {
                        ii[ii.length - 1] |= r.nextLong() << (n & 63);
                    }
                }
                if (r.nextInt(30) == 0) {
                    fast.reset();
                    old.reset();
                }
                long first = 977L + at;
                LogicBlock b = new LogicBlock("d", first, Math.round(first * p), p, bb, n, ii);
                Edges want = old.toEdges(b);
                Edges got = fast.toEdges(b);
                String where = "seed " + seed + " block at " + at + "+" + n;
                assertEquals(want.startFs(), got.startFs(), where);
                assertEquals(want.endFs(), got.endFs(), where);
                assertEquals(want.initialLevel(), got.initialLevel(), where);
                assertEquals(want.count(), got.count(), where);
                assertEquals(got.count(), got.timesFs().length, where + ": exact-length times");
                assertArrayEquals(Arrays.copyOf(want.timesFs(), want.count()), got.timesFs(), where);
                assertEquals(want.invalidCount(), got.invalidCount(), where);
                assertArrayEquals(Arrays.copyOf(want.invalidSpans(), 2 * want.invalidCount()),
                        Arrays.copyOf(got.invalidSpans(), 2 * got.invalidCount()), where);
                blocksWithUnknowns += got.invalidCount() > 0 ? 1 : 0;
                transitions += got.count();
                at += n;
            }
        }
        // the corpus must exercise both paths, or the comparison proves little
        assertEquals(true, blocksWithUnknowns > 1000, "blocks with unknown samples: " + blocksWithUnknowns);
        assertEquals(true, transitions > 100_000, "transitions: " + transitions);
    }

    @Test
    void fillCopiesTheKnownBitBelowThroughUnknownRuns() {
        Random r = new Random(7);
        for (int k = 0; k < 20_000; k++) {
            long unknown = unknownWord(r);
            long v = r.nextLong() & ~unknown;
            long want = 0;
            boolean cur = false;
            for (int j = 0; j < 64; j++) {
                if ((unknown >>> j & 1) == 0) {
                    cur = (v >>> j & 1) != 0;
                }
                if (cur) {
                    want |= 1L << j;
                }
            }
            // positions below the first known bit have nothing to copy: 0
            long lead = unknown & ~(unknown + 1);
            assertEquals(want & ~lead, LogicEdges.fillUnknown(v, unknown), "unknown " + Long.toHexString(unknown));
        }
    }

    private static long word(Random r) {
        switch (r.nextInt(5)) {
            case 0:
                return 0L;
            case 1:
                return -1L;
            case 2:
                return r.nextLong();
            default:
                long x = 0;
                boolean level = r.nextBoolean();
                int every = 1 + r.nextInt(40);
                for (int j = 0; j < 64; j++) {
                    if (r.nextInt(every) == 0) {
                        level = !level;
                    }
                    x |= level ? 1L << j : 0;
                }
                return x;
        }
    }

    private static long unknownWord(Random r) {
        switch (r.nextInt(7)) {
            case 0:
            case 1:
                return 0L;
            case 2:
                return -1L;
            case 3:
                return 1L << r.nextInt(64);
            case 4:
                return r.nextLong() & r.nextLong() & r.nextLong();
            default:
                int from = r.nextInt(64);
                int len = 1 + r.nextInt(64 - from);
                return len == 64 ? -1L : ((1L << len) - 1) << from;
        }
    }
}
