package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link LogicEdges} (64-bit words, XOR of shifted words, trailing-zero counts, integer times for
 * whole-femtosecond periods) against a naive one-sample-at-a-time loop that applies the documented
 * convention directly, over a large seeded corpus of random streams cut into random blocks.
 */
class LogicEdgesOracleTest {
    // sample periods: whole femtoseconds even and odd (50 MHz, a made-up odd one), and fractional (3 MHz, 1/3 GHz)
    static final double[] PERIODS = {2e7, 20_000_001, 1e15 / 3e6, 1e15 / 3.3e8};

    /** The oracle: the level carried sample by sample; a transition at known sample i is at origin + round((i - 0.5) p). */
    static final class Naive {
        boolean have;
        boolean level;

        Edges toEdges(LogicBlock b) {
            int n = b.length();
            double p = b.periodFs();
            long origin = b.startFs();
            long spanStart = origin - Math.round(p * 0.5);
            long spanEnd = origin + Math.round((n - 0.5) * p);
            boolean initial;
            if (have || n == 0) {
                // an empty block carries the last level seen (nothing in it needs a level)
                initial = level;
            } else {
                initial = false;
                for (int i = 0; i < n; i++) {
                    if (!unknown(b, i)) {
                        initial = bit(b, i);
                        break;
                    }
                }
            }
            boolean cur = initial;
            boolean any = have;
            long[] times = new long[n];
            int k = 0;
            long[] spans = new long[2 * n + 2];
            int sc = 0;
            for (int i = 0; i < n; i++) {
                if (unknown(b, i)) {
                    int s = i;
                    while (i + 1 < n && unknown(b, i + 1)) {
                        i++;
                    }
                    spans[2 * sc] = Math.max(spanStart, origin + Math.round((s - 0.5) * p));
                    spans[2 * sc + 1] = Math.min(spanEnd, origin + Math.round((i + 1 - 0.5) * p));
                    sc++;
                    continue;
                }
                any = true;
                if (bit(b, i) != cur) {
                    times[k++] = origin + Math.round((i - 0.5) * p);
                    cur = !cur;
                }
            }
            if (any && n > 0) {
                have = true;
                level = cur;
            }
            return new Edges(b.channel(), spanStart, spanEnd, initial, Arrays.copyOf(times, k), k,
                    sc == 0 ? null : Arrays.copyOf(spans, 2 * sc), sc);
        }

        private static boolean bit(LogicBlock b, int i) {
            return ((b.bits()[i / 64] >>> (i % 64)) & 1) != 0;
        }

        private static boolean unknown(LogicBlock b, int i) {
            return b.invalid() != null && ((b.invalid()[i / 64] >>> (i % 64)) & 1) != 0;
        }
    }

    @Test
    void sameEdgesAsTheNaiveLoopForAnyCutsPeriodsAndUnknownSamples() {
        for (int seed = 0; seed < 600; seed++) {
            Random r = new Random(seed);
            double p = PERIODS[seed % PERIODS.length];
            int unknownEvery = seed % 5;
            int total = 1 + r.nextInt(3000);
            long startIndex = r.nextInt(1 << 20);
            LogicEdges fast = new LogicEdges();
            Naive ref = new Naive();
            int at = 0;
            boolean level = r.nextBoolean();
            int density = 1 + r.nextInt(40);
            while (at < total) {
                int n = Math.min(total - at, r.nextInt(4) == 0 ? r.nextInt(3) : 1 + r.nextInt(300));
                long[] bits = new long[(n + 63) / 64 + 1];
                long[] inv = null;
                for (int i = 0; i < n; i++) {
                    if (r.nextInt(density) == 0) {
                        level = !level;
                    }
                    if (level) {
                        bits[i >>> 6] |= 1L << i;
                    }
                }
                if (unknownEvery > 0 && n > 0 && r.nextInt(unknownEvery + 1) == 0) {
                    inv = new long[bits.length];
                    int from = r.nextInt(n);
                    int to = Math.min(n, from + 1 + r.nextInt(n - from));
                    for (int i = from; i < to; i++) {
                        inv[i >>> 6] |= 1L << i;
                    }
                } else if (n > 0 && r.nextInt(5) == 0) {
                    inv = new long[bits.length]; // a mask with nothing set takes the fast path
                }
                if (n > 0 && r.nextInt(3) == 0) {
                    bits[bits.length - 1] |= 1L << 63; // junk past the length must be ignored
                }
                if (n > 0 && r.nextInt(40) == 0) {
                    fast.reset(); // a gap
                    ref.have = false;
                }
                long first = startIndex + at;
                LogicBlock b = new LogicBlock("d", first, Math.round(first * p), p, bits, n, inv);
                Edges want = ref.toEdges(b);
                Edges got = fast.toEdges(b);
                String where = "seed " + seed + " block at " + at + "+" + n + " period " + p;
                assertEquals(want.startFs(), got.startFs(), where);
                assertEquals(want.endFs(), got.endFs(), where);
                assertEquals(want.initialLevel(), got.initialLevel(), where);
                assertEquals(want.count(), got.count(), where);
                assertEquals(got.count(), got.timesFs().length, where + ": exact-length times");
                assertArrayEquals(want.timesFs(), Arrays.copyOf(got.timesFs(), got.count()), where);
                assertEquals(want.invalidCount(), got.invalidCount(), where);
                if (want.invalidCount() > 0) {
                    assertArrayEquals(want.invalidSpans(), Arrays.copyOf(got.invalidSpans(), 2 * got.invalidCount()), where);
                }
                at += n;
            }
        }
    }
}
