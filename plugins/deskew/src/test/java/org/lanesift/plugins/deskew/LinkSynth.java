package org.lanesift.plugins.deskew;

import java.util.Random;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Edges;

/**
 * Synthetic source-synchronous links for the estimator tests (invented data): a clock, data
 * lanes of random bits launched on clock edges or midway between them, each lane with its own
 * skew, every transition with Gaussian jitter; and the two analog legs of one pair.
 */
final class LinkSynth {
    private LinkSynth() {
    }

    /** Clock edges: rising at t0 + k*period, falling half a period later, each with Gaussian jitter. */
    static Edges clock(String name, int cycles, double periodFs, long t0, double jitterFs, long seed) {
        Random r = new Random(seed);
        long[] t = new long[2 * cycles];
        for (int i = 0; i < 2 * cycles; i++) {
            t[i] = t0 + Math.round(i * periodFs / 2 + r.nextGaussian() * jitterFs);
        }
        java.util.Arrays.sort(t);
        return Edges.of(name, 0, t0 + Math.round(cycles * periodFs) + Math.round(periodFs), false, t);
    }

    /**
     * A data lane: bit i occupies [t0 + i*ui + phase + skew, ...); a transition where the bit
     * changes, with Gaussian jitter.
     */
    static Edges lane(String name, int bits, double uiFs, long t0, double phaseFs, double skewFs, double jitterFs, long seed) {
        Random r = new Random(seed);
        Random j = new Random(seed * 31 + 7);
        long[] t = new long[bits];
        int k = 0;
        boolean level = false;
        for (int i = 0; i < bits; i++) {
            boolean b = r.nextBoolean();
            if (b != level) {
                t[k++] = t0 + Math.round(i * uiFs + phaseFs + skewFs + j.nextGaussian() * jitterFs);
                level = b;
            }
        }
        long[] s = java.util.Arrays.copyOf(t, k);
        java.util.Arrays.sort(s);
        return Edges.of(name, 0, t0 + Math.round((bits + 2) * uiFs), false, s);
    }

    /**
     * The legs of one pair at a common mode of 1.2 V and +/-175 mV: P carries the bits, N their
     * complement delayed by {@code skewNFs}; edges are tanh-shaped with the given 10-90 % rise
     * time; the driver's jitter is common to both legs, the noise is independent.
     *
     * @return {P, N}
     */
    static AnalogBlock[] legs(int bits, double uiFs, double rateHz, double riseFs, double skewNFs, double jitterFs,
                              double noiseVolts, long seed) {
        Random r = new Random(seed);
        double periodFs = 1e15 / rateHz;
        int n = (int) Math.ceil((bits + 2) * uiFs / periodFs);
        double[] tr = new double[bits + 1];
        double[] step = new double[bits + 1];
        int k = 0;
        boolean level = false;
        for (int i = 0; i < bits; i++) {
            boolean b = r.nextBoolean();
            if (b != level) {
                tr[k] = (i + 1) * uiFs + r.nextGaussian() * jitterFs;
                step[k++] = b ? 1 : -1;
                level = b;
            }
        }
        double tau = riseFs / 2.197; // 10-90 % of 0.5(1 + tanh(t / tau)) is 2.197 tau
        float[] p = new float[n];
        float[] m = new float[n];
        Random noise = new Random(seed ^ 0x5DEECE66DL);
        fill(p, periodFs, tr, step, k, tau, 0, +1, noise, noiseVolts);
        fill(m, periodFs, tr, step, k, tau, skewNFs, -1, noise, noiseVolts);
        return new AnalogBlock[] {AnalogBlock.of("d0p", 0, periodFs, p), AnalogBlock.of("d0n", 0, periodFs, m)};
    }

    private static void fill(float[] v, double periodFs, double[] tr, double[] step, int k, double tau, double shift, int sign,
                             Random noise, double noiseVolts) {
        int lo = 0;
        double reach = 12 * tau;
        double levelBefore = -0.5; // level relative to the first transitions
        for (int i = 0; i < v.length; i++) {
            double t = i * periodFs - shift;
            while (lo < k && tr[lo] < t - reach) {
                levelBefore += step[lo];
                lo++;
            }
            double s = levelBefore;
            for (int q = lo; q < k && tr[q] <= t + reach; q++) {
                s += step[q] * 0.5 * (1 + Math.tanh((t - tr[q]) / tau));
            }
            // s runs from -0.5 to +0.5
            v[i] = (float) (1.2 + sign * 0.35 * s + noise.nextGaussian() * noiseVolts);
        }
    }
}
