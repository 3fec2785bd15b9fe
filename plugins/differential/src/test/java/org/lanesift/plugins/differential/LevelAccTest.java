package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.data.BitSets;

/**
 * {@link LevelAcc#add} gathers the samples of each comparator state first and sums them state by
 * state. On a seeded corpus (double-edge-link-like pairs, random comparator states, masked runs,
 * unmarked NaNs, samples beyond the level limit, any cut into segments, offsets into the arrays,
 * strides from 1 to 1024, one channel or two legs) every field must be bit for bit what the
 * one-sample-at-a-time loop ({@link LevelAccOracle}) gives.
 */
class LevelAccTest {
    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16})
    void sameFieldsAsTheOneSampleAtATimeLoop(int seed) {
        Random r = new Random(seed * 7919L);
        int len = 20_000 + r.nextInt(50_000);
        int ao = r.nextInt(50);
        int bo = r.nextInt(50);
        boolean single = seed % 5 == 0;
        float[] a = new float[ao + len];
        float[] b = single ? null : new float[bo + len];
        long[] bits = new long[BitSets.words(len)];
        long[] inv = seed % 3 == 0 ? null : new long[BitSets.words(len)];
        boolean level = false;
        for (int i = 0; i < len; i++) {
            if (r.nextInt(25) == 0) {
                level = !level; // a transition every 12.5 samples on average
            }
            double d = (level ? 0.175 : -0.175) * (0.5 + r.nextDouble()) + 0.01 * r.nextGaussian();
            if (r.nextInt(500) == 0) {
                d = -1.2; // beyond the level limit
            }
            double cm = 1.2 + 0.02 * r.nextGaussian();
            if (single) {
                a[ao + i] = (float) d;
            } else {
                a[ao + i] = (float) (cm + d / 2);
                b[bo + i] = (float) (cm - d / 2);
            }
            if (level ^ r.nextInt(20) == 0) {
                bits[i >>> 6] |= 1L << i;
            }
            if (r.nextInt(3000) == 0) {
                a[ao + i] = Float.NaN; // unmarked: counted the same either way
            }
        }
        if (inv != null) {
            for (int g = 0; g < 5; g++) {
                int s = r.nextInt(len - 400);
                BitSets.setRange(inv, s, s + 1 + r.nextInt(300));
            }
        }
        int stride = new int[] {1, 3, 16, 16, 1024, 7}[seed % 6];
        float thr = (float) (0.01 * r.nextGaussian());
        float half = (float) (0.02 * r.nextDouble());
        float settled = Math.max(half, (float) (0.15 * r.nextDouble()));
        float maxAbs = seed % 2 == 0 ? Float.POSITIVE_INFINITY : 0.6f;
        long base = r.nextInt(1 << 20);
        LevelAcc now = new LevelAcc(base);
        LevelAcc old = new LevelAcc(base);
        int pos = 0;
        int segments = 0;
        while (pos < len) {
            int e = Math.min(len, pos + 1 + r.nextInt(seed % 4 == 0 ? 40 : 9000));
            now.add(a, ao, b, bo, base, pos, e, bits, inv, thr, half, settled, stride, maxAbs);
            LevelAccOracle.add(old, a, ao, b, bo, base, pos, e, bits, inv, thr, half, settled, stride, maxAbs);
            pos = e;
            segments++;
        }
        assertTrue(segments > 1);
        assertTrue(old.nRaw[0] > 10 && old.nRaw[1] > 10 && old.n[0] > 5, "both states counted: " + Arrays.toString(old.nRaw));
        assertArrayEquals(old.n, now.n, "settled counts");
        assertArrayEquals(old.nRaw, now.nRaw, "counts");
        assertBits(old.sum, now.sum, "sum");
        assertBits(old.sq, now.sq, "sq");
        assertBits(old.min, now.min, "min");
        assertBits(old.max, now.max, "max");
        assertBits(old.cmSum, now.cmSum, "cmSum");
        assertBits(old.cmSq, now.cmSq, "cmSq");
        assertBits(old.sumRaw, now.sumRaw, "sumRaw");
        assertBits(old.cmRaw, now.cmRaw, "cmRaw");
        assertBits(old.sqRaw, now.sqRaw, "sqRaw");
        assertBits(old.cqRaw, now.cqRaw, "cqRaw");
        assertEquals(old.samples, now.samples);
        assertEquals(old.invalid, now.invalid);
        assertEquals(old.endIndex, now.endIndex);
    }

    private static void assertBits(double[] expected, double[] actual, String what) {
        for (int c = 0; c < 2; c++) {
            assertEquals(Double.doubleToRawLongBits(expected[c]), Double.doubleToRawLongBits(actual[c]),
                    what + "[" + c + "]: " + expected[c] + " against " + actual[c]);
        }
    }
}
