package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** The pyramid's min and max, checked exactly against a plain scan of the same samples. */
class MinMaxPyramidTest {

    private static float[] bruteForce(float[] v, int from, int to) {
        float lo = Float.POSITIVE_INFINITY;
        float hi = Float.NEGATIVE_INFINITY;
        for (int i = from; i < to; i++) {
            lo = Math.min(lo, v[i]);
            hi = Math.max(hi, v[i]);
        }
        return new float[] {lo, hi};
    }

    @Test
    void everyRangeOfRandomDataMatchesAPlainScanExactly() {
        Random rnd = new Random(20261203L);
        int[] lengths = {1, 2, 15, 16, 17, 31, 32, 33, 255, 1000, 4096, 65_537, 100_003};
        float[] got = new float[2];
        for (int n : lengths) {
            float[] v = new float[n + 7]; // longer than used: the tail must never be read
            for (int i = 0; i < v.length; i++) {
                v[i] = (float) rnd.nextGaussian();
            }
            v[n] = 1e9f;
            v[n + 1] = -1e9f;
            MinMaxPyramid p = MinMaxPyramid.build(v, n);
            for (int k = 0; k < 2000; k++) {
                int a = rnd.nextInt(n);
                int b = a + 1 + rnd.nextInt(n - a);
                p.range(a, b, got);
                float[] want = bruteForce(v, a, b);
                assertEquals(want[0], got[0], "min of [" + a + ", " + b + ") over " + n + " samples");
                assertEquals(want[1], got[1], "max of [" + a + ", " + b + ") over " + n + " samples");
            }
            p.range(0, n, got);
            assertEquals(bruteForce(v, 0, n)[0], got[0]);
            assertEquals(bruteForce(v, 0, n)[1], got[1]);
        }
    }

    @Test
    void pixelColumnsOfARandomTraceMatchAPlainScanAtEveryZoom() {
        // the painter asks for [ceil((t0 - start) / period) - 1, ceil((t1 - start) / period)) per column
        Random rnd = new Random(7);
        int n = 300_001;
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            v[i] = rnd.nextFloat() * 2 - 1;
        }
        MinMaxPyramid p = MinMaxPyramid.build(v, n);
        float[] got = new float[2];
        for (double samplesPerPx : new double[] {1.0, 1.7, 16, 63.5, 1000.3, n / 800.0}) {
            for (int x = 0; x < 800; x++) {
                int i0 = Math.max(0, (int) Math.ceil(x * samplesPerPx) - 1);
                int i1 = Math.min(n, (int) Math.ceil((x + 1) * samplesPerPx));
                if (i1 <= i0) {
                    continue;
                }
                p.range(i0, i1, got);
                float[] want = bruteForce(v, i0, i1);
                assertEquals(want[0], got[0], "column " + x + " at " + samplesPerPx + " samples/px");
                assertEquals(want[1], got[1], "column " + x + " at " + samplesPerPx + " samples/px");
            }
        }
    }

    @Test
    void emptyAndOutsideRangesAreRefused() {
        MinMaxPyramid p = MinMaxPyramid.build(new float[40], 40);
        float[] out = new float[2];
        assertThrows(IllegalArgumentException.class, () -> p.range(5, 5, out));
        assertThrows(IllegalArgumentException.class, () -> p.range(-1, 5, out));
        assertThrows(IllegalArgumentException.class, () -> p.range(0, 41, out));
        assertThrows(IllegalArgumentException.class, () -> MinMaxPyramid.build(new float[4], 5));
    }
}
