package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

class SampleStatsTest {
    @Test
    void meanStdMinMaxAgainstExactSums() {
        Random r = new Random(21);
        SampleStats s = new SampleStats("ps", 0);
        int n = 100_000;
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = 1e6 + 3.5 * r.nextGaussian(); // a large offset, where naive sums of squares lose digits
            s.add(v[i]);
        }
        // oracle: exact decimal sums (Source: JDK BigDecimal)
        BigDecimal sum = BigDecimal.ZERO;
        for (double x : v) {
            sum = sum.add(new BigDecimal(x));
        }
        BigDecimal mean = sum.divide(BigDecimal.valueOf(n), MathContext.DECIMAL128);
        BigDecimal sq = BigDecimal.ZERO;
        for (double x : v) {
            BigDecimal d = new BigDecimal(x).subtract(mean);
            sq = sq.add(d.multiply(d));
        }
        double std = Math.sqrt(sq.divide(BigDecimal.valueOf(n), MathContext.DECIMAL128).doubleValue());
        assertEquals(n, s.count());
        assertEquals(mean.doubleValue(), s.mean(), 1e-7); // 1e-13 relative
        assertEquals(std, s.std(), 1e-9);
        assertEquals(Arrays.stream(v).min().orElseThrow(), s.min());
        assertEquals(Arrays.stream(v).max().orElseThrow(), s.max());
        assertEquals(s.max() - s.min(), s.peakToPeak());
    }

    @Test
    void percentilesAgainstAPlainSort() {
        Random r = new Random(8);
        for (int n : new int[] {1, 2, 5, 999, 5000}) {
            SampleStats s = new SampleStats("V", 4000);
            double[] v = new double[n];
            for (int i = 0; i < n; i++) {
                v[i] = r.nextDouble() * 10 - 3;
                s.add(v[i]);
            }
            double[] kept = Arrays.copyOf(v, Math.min(n, 4000));
            assertArrayEquals(kept, s.keptValues());
            Arrays.sort(kept);
            for (double p : new double[] {0, 1, 25, 50, 75, 99, 100}) {
                // oracle: the order statistic at rank p/100 * (m - 1), interpolated by hand
                double rank = p / 100 * (kept.length - 1);
                int below = (int) rank;
                double expected = below + 1 < kept.length ? kept[below] + (rank - below) * (kept[below + 1] - kept[below]) : kept[below];
                assertEquals(expected, s.percentile(p), 1e-12, "n=" + n + " p=" + p);
            }
        }
    }

    @Test
    void histogramCountsEveryKeptValueInItsBin() {
        SampleStats s = new SampleStats("%", 1000);
        Random r = new Random(2);
        for (int i = 0; i < 1500; i++) {
            s.add(r.nextDouble() * 50);
        }
        s.add(Double.NaN);
        s.add(Double.POSITIVE_INFINITY);
        assertEquals(1500, s.count());
        SampleStats.Histogram h = s.histogram(20, 1.0);
        long total = Arrays.stream(h.counts()).sum();
        assertEquals(1000, total);
        double[] kept = s.keptValues();
        long[] expected = new long[20];
        for (double x : kept) {
            int b = (int) Math.floor((x - h.lo()) / (h.hi() - h.lo()) * 20);
            expected[Math.max(0, Math.min(19, b))]++;
        }
        assertArrayEquals(expected, h.counts());
        assertEquals(Arrays.stream(kept).min().orElseThrow(), h.lo());
        assertEquals(Arrays.stream(kept).max().orElseThrow(), h.hi());
    }

    @Test
    void aTightSpreadIsWidenedToTheLeastSpan() {
        SampleStats s = new SampleStats("ps", 10);
        s.add(5.0);
        s.add(5.0);
        SampleStats.Histogram h = s.histogram(4, 1.0);
        assertEquals(4.5, h.lo());
        assertEquals(5.5, h.hi());
        assertEquals(2, Arrays.stream(h.counts()).sum());
    }

    @Test
    void emptyIsNaN() {
        SampleStats s = new SampleStats("ps", 10);
        assertTrue(Double.isNaN(s.mean()));
        assertTrue(Double.isNaN(s.std()));
        assertTrue(Double.isNaN(s.percentile(50)));
        assertEquals(0, s.histogram(8, 1).counts().length);
    }
}
