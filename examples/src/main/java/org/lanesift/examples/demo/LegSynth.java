package org.lanesift.examples.demo;

import java.util.Arrays;
import java.util.Random;

/**
 * Renders one probed leg from its ideal transitions, as an instrument would record it: each
 * transition follows the step response of the probe's ground-lead resonance (a second-order
 * underdamped system), low-power transitions are additionally slew-limited (first-order), the
 * instrument's bandwidth is a first-order low-pass, and Gaussian noise is added.
 *
 * <p>The second-order step response is the textbook one,
 * {@code s(t) = 1 - e^(-zeta wn t) (cos(wd t) + zeta / sqrt(1 - zeta^2) sin(wd t))}, with
 * {@code wd = wn sqrt(1 - zeta^2)}. It is tabulated once at 0.5 ps resolution.
 */
final class LegSynth {
    /** Transition kinds. */
    static final byte FAST = 0;
    static final byte SLOW = 1;

    private final double[] fastTable;
    private final double[] slowTable;
    private final double tableStepFs = 500;
    private final double fastWindowFs;
    private final double slowWindowFs;

    LegSynth(double ringHz, double damping, double slowTauFs) {
        double wn = 2 * Math.PI * ringHz;
        double z = damping;
        double wd = wn * Math.sqrt(1 - z * z);
        // settle to 1e-4: e^(-z wn t) < 1e-4
        fastWindowFs = Math.log(1e4) / (z * wn) * 1e15;
        slowWindowFs = Math.max(fastWindowFs, slowTauFs * Math.log(1e4)) + fastWindowFs;
        fastTable = new double[(int) Math.ceil(fastWindowFs / tableStepFs) + 2];
        for (int i = 0; i < fastTable.length; i++) {
            double t = i * tableStepFs * 1e-15;
            fastTable[i] = 1 - Math.exp(-z * wn * t) * (Math.cos(wd * t) + z / Math.sqrt(1 - z * z) * Math.sin(wd * t));
        }
        slowTable = new double[(int) Math.ceil(slowWindowFs / tableStepFs) + 2];
        // slow = the probe's step response through a first-order slew limiter (time constant slowTauFs);
        // the two linear systems commute, so filter the tabulated step response recursively
        double a = Math.exp(-tableStepFs / slowTauFs);
        double y = 0;
        for (int i = 0; i < slowTable.length; i++) {
            double x = i < fastTable.length ? fastTable[i] : 1.0;
            y = a * y + (1 - a) * x;
            slowTable[i] = y;
        }
    }

    private double step(double[] table, double dtFs) {
        double x = dtFs / tableStepFs;
        int i = (int) x;
        if (i >= table.length - 1) {
            return 1;
        }
        double f = x - i;
        return table[i] + (table[i + 1] - table[i]) * f;
    }

    /**
     * Renders samples.
     *
     * @param timesFs   transition times (sorted), femtoseconds
     * @param levels    level after each transition, volts
     * @param kinds     {@link #FAST} or {@link #SLOW} per transition
     * @param count     number of transitions
     * @param initial   level before the first transition
     * @param startFs   time of sample 0
     * @param periodFs  sample period
     * @param n         samples
     * @param bandwidthHz instrument bandwidth
     * @param noiseRms  noise RMS volts
     * @param offset    volts added to every sample
     * @param rnd       noise source
     * @return the samples in volts
     */
    float[] render(long[] timesFs, float[] levels, byte[] kinds, int count, double initial, long startFs, double periodFs,
                   int n, double bandwidthHz, double noiseRms, double offset, Random rnd) {
        float[] out = new float[n];
        double settled = initial;
        int first = 0;   // first transition still settling
        int next = 0;    // first transition in the future
        double alpha = 1 - Math.exp(-2 * Math.PI * bandwidthHz * periodFs * 1e-15);
        double y = initial + offset;
        for (int i = 0; i < n; i++) {
            double t = startFs + i * periodFs;
            while (next < count && timesFs[next] <= t) {
                next++;
            }
            while (first < next && t - timesFs[first] > (kinds[first] == SLOW ? slowWindowFs : fastWindowFs)) {
                settled = levels[first];
                first++;
            }
            double v = settled;
            double prev = settled;
            for (int k = first; k < next; k++) {
                double d = levels[k] - prev;
                v += d * step(kinds[k] == SLOW ? slowTable : fastTable, t - timesFs[k]);
                prev = levels[k];
            }
            y += alpha * (v + offset - y);
            out[i] = (float) (y + rnd.nextGaussian() * noiseRms);
        }
        return out;
    }

    /** Growable list of transitions for one leg. */
    static final class Track {
        long[] t = new long[1024];
        float[] v = new float[1024];
        byte[] k = new byte[1024];
        int n;
        final double initial;
        double level;

        Track(double initial) {
            this.initial = initial;
            this.level = initial;
        }

        void to(long timeFs, double volts, byte kind) {
            if (volts == level) {
                return;
            }
            if (n > 0 && timeFs < t[n - 1]) {
                timeFs = t[n - 1];
            }
            if (n == t.length) {
                t = Arrays.copyOf(t, n * 2);
                v = Arrays.copyOf(v, n * 2);
                k = Arrays.copyOf(k, n * 2);
            }
            t[n] = timeFs;
            v[n] = (float) volts;
            k[n] = kind;
            n++;
            level = volts;
        }
    }
}
