package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import java.util.Random;
import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.interpolation.SplineInterpolator;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Edges;
import org.lanesift.testkit.StageHarness;

/** Edge times from the whole plugin against exact crossings and against a reference library. */
class EdgeAccuracyTest {
    static final double PERIOD_FS = 200_000; // 5 GS/s

    private static long[] run(Map<String, ?> options, float[] diff) {
        AnalogBlock d = TestSignals.block("d", PERIOD_FS, diff);
        StageHarness h = TestSignals.runPair(options, TestSignals.legP(d, 1.2), TestSignals.legN(d, 1.2));
        return TestSignals.times(h.outputs("edges", Edges.class));
    }

    @Test
    void trianglesCrossWhereTheRampsSayLinear() {
        // mathematics: a triangle wave of +/-0.3 V with half-period 37.3 samples starting at -0.3 V rises through 0
        // at 18.65 samples and then every 37.3 samples, alternately rising and falling
        double half = 37.3;
        int n = 4000;
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            double ph = (i % (2 * half)) / half; // 0..2
            double x = i / half;
            double frac = x - Math.floor(x);
            boolean rising = ((long) Math.floor(x) & 1) == 0;
            v[i] = (float) (rising ? -0.3 + 0.6 * frac : 0.3 - 0.6 * frac);
            assert ph >= 0;
        }
        long[] t = run(Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.1), v);
        assertTrue(t.length > 100, "expected about 107 crossings, got " + t.length);
        for (int k = 0; k < t.length; k++) {
            double exact = (half / 2 + k * half) * PERIOD_FS;
            // float samples round the voltages by ~3e-8 V; at 16 mV per sample that is well under 1 fs
            assertEquals(exact, t[k], 2.0, "crossing " + k);
        }
    }

    @Test
    void sineZeroCrossingsMatchTheFormula() {
        // mathematics: A sin(2 pi f t + phi) crosses 0 at t = (k pi - phi) / (2 pi f)
        double samplesPerCycle = 23.7;
        double phi = 0.37;
        int n = 5000;
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            v[i] = (float) (0.35 * Math.sin(2 * Math.PI * i / samplesPerCycle + phi));
        }
        for (String interp : new String[] {"linear", "cubic"}) {
            // the crossings of the formula are those of 0 V: given, so that only the interpolation is measured (the
            // level finder puts a 5000-sample sine's learned middle 0.9 mV off 0, which alone is 1 % of a sample here)
            long[] t = run(Map.of("interpolation", interp, "thresholdVolts", 0.0), v);
            double sumErr = 0;
            int k0 = 1; // first zero crossing after t = 0
            for (int k = 0; k < t.length; k++) {
                double exact = ((k + k0) * Math.PI - phi) / (2 * Math.PI) * samplesPerCycle * PERIOD_FS;
                double err = Math.abs(t[k] - exact);
                sumErr += err;
                assertTrue(err < 0.01 * PERIOD_FS, interp + " crossing " + k + " off by " + err + " fs");
            }
            assertTrue(t.length > 400, "crossings " + t.length);
            double mean = sumErr / t.length;
            assertTrue(mean < (interp.equals("cubic") ? 0.002 : 0.01) * PERIOD_FS, interp + " mean error " + mean + " fs");
        }
    }

    @Test
    void sineOffsetCrossingsNeedTheCubic() {
        // mathematics: A sin(theta) = L at theta = asin(L / A) (rising) and pi - asin(L / A) (falling); away from the
        // inflection point the straight line between samples is visibly off while the cubic is not
        double spc = 11.3; // samples per cycle: each half-swing spans more than 3 samples
        double amp = 0.35;
        double level = 0.15;
        int n = 3000;
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            v[i] = (float) (amp * Math.sin(2 * Math.PI * i / spc));
        }
        double a = Math.asin(level / amp);
        Map<String, Object> cubic = Map.of("thresholdVolts", level, "hysteresisVolts", 0.05, "interpolation", "cubic");
        Map<String, Object> linear = Map.of("thresholdVolts", level, "hysteresisVolts", 0.05, "interpolation", "linear");
        double[] mean = new double[2];
        int idx = 0;
        for (Map<String, Object> o : java.util.List.of(cubic, linear)) {
            long[] t = run(o, v);
            double sum = 0;
            for (int k = 0; k < t.length; k++) {
                int cycle = k / 2;
                double theta = (k % 2 == 0) ? a : Math.PI - a;
                double exact = (cycle + theta / (2 * Math.PI)) * spc * PERIOD_FS;
                sum += Math.abs(t[k] - exact);
            }
            mean[idx++] = sum / t.length / PERIOD_FS;
        }
        assertTrue(mean[0] < 0.002, "cubic mean error " + mean[0] + " samples");
        assertTrue(mean[1] > 3 * mean[0], "linear " + mean[1] + " should be clearly worse than cubic " + mean[0]);
    }

    @Test
    void cubicAgreesWithCommonsMathSplineAndBrent() {
        // reference library: Apache Commons Math 3.6.1, SplineInterpolator (natural cubic spline through the same
        // samples) and BrentSolver on the bracketing sample interval; edges spanning >= 3 samples (10-90 % rise of
        // a tanh step with tau = 2 samples is 4.4 samples); issue 4 asks for mean error < 1 % of the sample period
        Random r = new Random(44);
        boolean[] bits = new boolean[400];
        for (int i = 0; i < bits.length; i++) {
            bits[i] = r.nextBoolean();
        }
        double ui = 24.37;
        double tau = 2.0;
        int n = (int) (bits.length * ui) - 30;
        float[] v = TestSignals.nrz(bits, ui, tau, 0.175, 3.3, n);
        long[] t = run(Map.of("interpolation", "cubic", "thresholdVolts", 0.0, "hysteresisVolts", 0.05), v);
        double[] exact = TestSignals.nrzEdges(bits, ui, 3.3, n);
        assertEquals(exact.length, t.length, "edge count");
        SplineInterpolator si = new SplineInterpolator();
        BrentSolver brent = new BrentSolver(1e-12);
        double sumVsRef = 0;
        double sumRefVsExact = 0;
        for (int k = 0; k < t.length; k++) {
            double pos = t[k] / PERIOD_FS;
            int j = (int) Math.floor(exact[k]);
            int lo = Math.max(0, j - 8);
            int hi = Math.min(n - 1, j + 9);
            double[] x = new double[hi - lo + 1];
            double[] y = new double[x.length];
            for (int i = lo; i <= hi; i++) {
                x[i - lo] = i;
                // the same float differences the plugin sees: p - n of the float legs
                float p = (float) (1.2 + v[i] / 2.0);
                float nn = (float) (1.2 - v[i] / 2.0);
                y[i - lo] = p - nn;
            }
            UnivariateFunction f = si.interpolate(x, y);
            int jj = (int) Math.floor(pos);
            double ref = brent.solve(100, f, jj, jj + 1.0 - 1e-12);
            sumVsRef += Math.abs(pos - ref);
            sumRefVsExact += Math.abs(ref - exact[k]);
        }
        double meanVsRef = sumVsRef / t.length;
        assertTrue(meanVsRef < 0.01, "mean |plugin - Commons Math| = " + meanVsRef + " samples");
        assertTrue(sumRefVsExact / t.length < 0.01, "reference itself is off the exact crossings: " + sumRefVsExact / t.length);
    }
}
