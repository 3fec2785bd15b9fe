package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

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
    void coarseColumnsReadWholeLevelElementsAndAreExactForTheRangeTheyCover() {
        Random rnd = new Random(11);
        float[] got = new float[2];
        for (int n : new int[] {1_000_003, 65_536, 4_099}) {
            float[] v = new float[n];
            for (int i = 0; i < n; i++) {
                v[i] = (float) rnd.nextGaussian();
            }
            MinMaxPyramid p = MinMaxPyramid.build(v, n);
            for (double samplesPerPx : new double[] {32, 33.3, 100, 1000.7, 4096, n / 1000.0, n / 300.0}) {
                int level = p.levelFor(samplesPerPx);
                if (level < 0) {
                    continue;
                }
                int size = MinMaxPyramid.BUCKET << level;
                assertTrue(2.0 * size <= samplesPerPx, "an element spans at most half a column");
                for (int x = 0; ; x++) {
                    int i0 = Math.max(0, (int) Math.ceil(x * samplesPerPx) - 1);
                    int i1 = Math.min(n, (int) Math.ceil((x + 1) * samplesPerPx));
                    if (i0 >= n) {
                        break;
                    }
                    p.column(i0, i1, level, got);
                    int a = p.alignedFrom(i0, level);
                    int b = p.alignedTo(i1, level);
                    assertTrue(a <= i0 && i0 - a < size && b >= i1 && b - i1 < size, "[" + a + ", " + b + ") covers [" + i0 + ", " + i1 + ") by less than an element");
                    float[] want = bruteForce(v, a, b);
                    assertEquals(want[0], got[0], "min of column " + x + " at " + samplesPerPx + " samples/px over " + n);
                    assertEquals(want[1], got[1], "max of column " + x + " at " + samplesPerPx + " samples/px over " + n);
                }
            }
        }
        assertEquals(-1, MinMaxPyramid.build(new float[1000], 1000).levelFor(31), "below two buckets a column uses range()");
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
