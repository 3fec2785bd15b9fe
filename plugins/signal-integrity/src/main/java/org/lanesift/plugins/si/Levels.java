package org.lanesift.plugins.si;

import java.util.Arrays;

/**
 * The two logic levels of a signal, found from the first samples of a capture: a 256-bin histogram
 * of the voltages between their minimum and maximum, and the most populated bin in the lower and
 * in the upper half (the usual "base" and "top" of a pulse; common practice). A fixed count of
 * first samples is used, so the result does not depend on how the capture is cut into blocks.
 */
final class Levels {
    /** Low level, volts. */
    final double lowVolts;
    /** High level, volts. */
    final double highVolts;

    Levels(double lowVolts, double highVolts) {
        this.lowVolts = lowVolts;
        this.highVolts = highVolts;
    }

    double swing() {
        return highVolts - lowVolts;
    }

    /** Voltage at a fraction of the swing (0 = low, 1 = high). */
    double at(double fraction) {
        return lowVolts + fraction * (highVolts - lowVolts);
    }

    /**
     * Estimates the levels.
     *
     * @param v samples
     * @param n how many to use
     * @return the levels, or null when the samples do not show two distinct levels
     */
    static Levels estimate(float[] v, int n) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            float x = v[i];
            if (Float.isFinite(x)) {
                lo = Math.min(lo, x);
                hi = Math.max(hi, x);
            }
        }
        if (!(hi > lo) || hi - lo < 1e-6) {
            return null;
        }
        final int bins = 256;
        long[] h = new long[bins];
        double scale = bins / (hi - lo);
        for (int i = 0; i < n; i++) {
            float x = v[i];
            if (Float.isFinite(x)) {
                h[Math.min(bins - 1, (int) ((x - lo) * scale))]++;
            }
        }
        int lowBin = argmax(h, 0, bins / 2);
        int highBin = argmax(h, bins / 2, bins);
        double low = lo + (lowBin + 0.5) / scale;
        double high = lo + (highBin + 0.5) / scale;
        // refine each level by mean shift (the mean of the samples within a window around it, repeated)
        // with a window shrinking from +/-10 % to +/-1 % of the range: the wide window centres a level
        // blurred by noise, the narrow one keeps a slow exponential settling from pulling it inwards
        for (double wf : new double[] {0.1, 0.05, 0.02, 0.01}) {
            for (int it = 0; it < 4; it++) {
                low = refine(v, n, low, wf * (hi - lo));
                high = refine(v, n, high, wf * (hi - lo));
            }
        }
        if (!(high - low > 1e-6)) {
            return null;
        }
        return new Levels(low, high);
    }

    private static int argmax(long[] h, int from, int to) {
        int best = from;
        for (int i = from; i < to; i++) {
            if (h[i] > h[best]) {
                best = i;
            }
        }
        return best;
    }

    private static double refine(float[] v, int n, double centre, double half) {
        double sum = 0;
        long c = 0;
        for (int i = 0; i < n; i++) {
            float x = v[i];
            if (Math.abs(x - centre) <= half) {
                sum += x;
                c++;
            }
        }
        return c == 0 ? centre : sum / c;
    }

    @Override
    public String toString() {
        return "Levels[" + lowVolts + " V, " + highVolts + " V]";
    }

    /** Collects the first {@code limit} valid samples of a capture for {@link #estimate}. */
    static final class Collector {
        private final int limit;
        private float[] buf = new float[1024];
        private int n;

        Collector(int limit) {
            this.limit = limit;
        }

        boolean full() {
            return n >= limit;
        }

        int count() {
            return n;
        }

        /** Takes samples from a block until full; returns how many of the block's samples it took. */
        int take(float[] v, int from, int to, long[] invalid) {
            int i = from;
            while (i < to && n < limit) {
                if (invalid == null || (invalid[i >>> 6] & (1L << i)) == 0) {
                    if (n == buf.length) {
                        buf = Arrays.copyOf(buf, Math.min(limit, buf.length * 2));
                    }
                    buf[n++] = v[i];
                }
                i++;
            }
            return i - from;
        }

        Levels levels() {
            return estimate(buf, n);
        }

        float[] samples() {
            return buf;
        }
    }
}
