package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link LogicEdges} against a naive per-sample reference on eight channels at once, as the live
 * decode feeds it: each channel toggles with its own seeded probability, from never to at every
 * sample, so words of every density reach both the bit-by-bit loop and the byte-table path for
 * words with many transitions; blocks are cut at random lengths (1 sample to 70 000), with junk
 * bits past a block's end, and with gaps where the index jumps and the converter is reset, as the
 * {@code logic-edges} stage does. Periods: a whole even and odd number of femtoseconds (the
 * integer path) and a fractional one.
 */
class LogicEdgesDenseWordsTest {
    /** Toggle probabilities per sample, from none to every sample. */
    private static final double[] DENSITIES = {0, 1.0 / 5000, 1.0 / 64, 1.0 / 8, 1.0 / 3, 0.5, 0.8, 0.97, 1};
    private static final double[] PERIODS = {2e7, 20_000_001, 1e15 / 3e6};

    @Test
    void sameTimesAsTheNaiveLoopOnEveryChannel() {
        long denseWords = 0;
        long transitions = 0;
        for (int seed = 0; seed < 12; seed++) {
            Random r = new Random(190_600 + seed);
            double p = PERIODS[seed % PERIODS.length];
            double[] toggle = new double[8];
            for (int c = 0; c < 8; c++) {
                toggle[c] = DENSITIES[r.nextInt(DENSITIES.length)];
            }
            toggle[r.nextInt(8)] = 1; // one channel at the sample rate, one silent, in every run
            toggle[r.nextInt(8)] = 0;
            LogicEdges[] conv = new LogicEdges[8];
            boolean[] level = new boolean[8];
            boolean[] havePrevious = new boolean[8];
            boolean[] previous = new boolean[8];
            for (int c = 0; c < 8; c++) {
                conv[c] = new LogicEdges();
                level[c] = r.nextBoolean();
            }
            long index = r.nextInt(1000);
            for (int block = 0; block < 20; block++) {
                int n = switch (r.nextInt(4)) {
                    case 0 -> 1 + r.nextInt(130);
                    case 1 -> 1 + r.nextInt(5000);
                    default -> 20_000 + r.nextInt(50_001);
                };
                boolean gap = block > 0 && r.nextInt(6) == 0;
                if (gap) {
                    index += 1 + r.nextInt(300);
                }
                long startFs = Math.round(index * p);
                for (int c = 0; c < 8; c++) {
                    boolean[] s = new boolean[n];
                    long[] bits = new long[BitSets.words(n)];
                    for (int i = 0; i < n; i++) {
                        if (r.nextDouble() < toggle[c]) {
                            level[c] = !level[c];
                        }
                        s[i] = level[c];
                        bits[i >>> 6] |= s[i] ? 1L << i : 0L;
                    }
                    if ((n & 63) != 0 && r.nextBoolean()) {
                        bits[bits.length - 1] |= r.nextLong() << (n & 63); // junk past the length
                    }
                    if (gap) {
                        conv[c].reset();
                        havePrevious[c] = false;
                    }
                    String where = "seed " + seed + " block " + block + " channel " + c + " (" + n + " samples, toggle "
                            + toggle[c] + ", period " + p + " fs)";
                    Edges got = conv[c].toEdges(new LogicBlock("ch" + c, index, startFs, p, bits, n, null));
                    long[] want = naive(s, havePrevious[c], previous[c], startFs, p);
                    assertEquals(havePrevious[c] ? previous[c] : s[0], got.initialLevel(), where);
                    assertEquals(startFs - Math.round(p * 0.5), got.startFs(), where);
                    assertEquals(startFs + Math.round((n - 0.5) * p), got.endFs(), where);
                    assertEquals(want.length, got.count(), where);
                    assertEquals(got.count(), got.timesFs().length, where + ": exact-length times");
                    assertArrayEquals(want, got.timesFs(), where);
                    havePrevious[c] = true;
                    previous[c] = s[n - 1];
                    transitions += want.length;
                    denseWords += denseWords(bits, n, got.count());
                }
                index += n;
            }
        }
        // the corpus must reach the byte-table path often, or the comparison proves little about it
        assertTrue(denseWords > 10_000, "words with many transitions: " + denseWords);
        assertTrue(transitions > 1_000_000, "transitions: " + transitions);
    }

    /** The transition before sample i sits at {@code startFs + round((i - 0.5) * p)}, sample by sample. */
    private static long[] naive(boolean[] s, boolean havePrevious, boolean previous, long startFs, double p) {
        long[] t = new long[s.length];
        int k = 0;
        boolean last = havePrevious ? previous : s[0];
        for (int i = 0; i < s.length; i++) {
            if (s[i] != last) {
                t[k++] = startFs + Math.round((i - 0.5) * p);
            }
            last = s[i];
        }
        return java.util.Arrays.copyOf(t, k);
    }

    /** Words of a block with at least {@link LogicEdges#DENSE_WORD} transitions inside it, in a block with room for the table path. */
    private static long denseWords(long[] bits, int n, int count) {
        if (count < 128) {
            return 0;
        }
        long dense = 0;
        for (int w = 0; w + 1 < BitSets.words(n); w++) {
            long x = bits[w];
            if (Long.bitCount(x ^ (x << 1)) >= LogicEdges.DENSE_WORD) {
                dense++;
            }
        }
        return dense;
    }
}
