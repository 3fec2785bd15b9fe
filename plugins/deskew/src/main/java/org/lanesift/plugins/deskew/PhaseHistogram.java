package org.lanesift.plugins.deskew;

/**
 * Histogram of phases in {@code [0, 1)} (fractions of a clock interval or unit interval) with the
 * circular statistics the estimators need: the mean direction, its concentration, a trimmed
 * linear mean around it for a precise centre, and a test for more than one cluster.
 *
 * <p>Each of 1024 bins keeps its count and the sum of its phases, so the centre is computed from
 * the exact phases, not from bin centres. Adding a phase costs a multiply, a conversion and two
 * array updates; memory is fixed.
 */
final class PhaseHistogram {
    static final int BINS = 1024;
    /** Coarse bins for the cluster count. */
    static final int COARSE = 32;
    /** Half-width of the trimmed mean window, in phase. */
    static final double TRIM = 0.25;

    private final long[] count = new long[BINS];
    private final double[] sum = new double[BINS];
    private long total;

    /**
     * Adds a phase; values outside [0, 1) are wrapped.
     *
     * @param phi the phase
     */
    void add(double phi) {
        double p = phi - Math.floor(phi);
        int b = (int) (p * BINS);
        if (b >= BINS) {
            b = BINS - 1;
        }
        count[b]++;
        sum[b] += p;
        total++;
    }

    long total() {
        return total;
    }

    /** Mean resultant length, 0 (spread evenly) to 1 (all at one phase). */
    double concentration() {
        if (total == 0) {
            return 0;
        }
        double c = 0;
        double s = 0;
        for (int b = 0; b < BINS; b++) {
            if (count[b] > 0) {
                double a = 2 * Math.PI * sum[b] / count[b];
                c += count[b] * Math.cos(a);
                s += count[b] * Math.sin(a);
            }
        }
        return Math.hypot(c, s) / total;
    }

    /** Circular mean direction as a phase in [0, 1), or NaN when empty. */
    double circularMean() {
        double c = 0;
        double s = 0;
        for (int b = 0; b < BINS; b++) {
            if (count[b] > 0) {
                double a = 2 * Math.PI * sum[b] / count[b];
                c += count[b] * Math.cos(a);
                s += count[b] * Math.sin(a);
            }
        }
        if (total == 0) {
            return Double.NaN;
        }
        double p = Math.atan2(s, c) / (2 * Math.PI);
        return p - Math.floor(p);
    }

    /**
     * The cluster centre: start at the circular mean, then three times take the plain mean of the
     * phases within {@link #TRIM} of the current centre (which rejects a uniform background and
     * stray transitions without a bias for a symmetric cluster).
     *
     * @return the centre in [0, 1), or NaN when empty
     */
    double centre() {
        double c = circularMean();
        if (Double.isNaN(c)) {
            return c;
        }
        for (int it = 0; it < 3; it++) {
            double acc = 0;
            long n = 0;
            for (int b = 0; b < BINS; b++) {
                if (count[b] == 0) {
                    continue;
                }
                double d = wrap(sum[b] / count[b] - c);
                if (Math.abs(d) <= TRIM) {
                    acc += count[b] * d;
                    n += count[b];
                }
            }
            if (n == 0) {
                break;
            }
            c += acc / n;
            c -= Math.floor(c);
        }
        return c;
    }

    /**
     * Counts separate clusters: runs of coarse bins (32 around the circle) holding at least a
     * quarter of the fullest coarse bin, each run holding at least 5 % of all phases.
     *
     * @return number of clusters, 0 when empty
     */
    int clusters() {
        if (total == 0) {
            return 0;
        }
        long[] c = coarse();
        long max = 0;
        for (long v : c) {
            max = Math.max(max, v);
        }
        long thr = Math.max(1, max / 4);
        // start scanning just after a bin below the threshold so runs do not wrap
        int start = -1;
        for (int i = 0; i < COARSE; i++) {
            if (c[i] < thr) {
                start = i;
                break;
            }
        }
        if (start < 0) {
            return 1;
        }
        int runs = 0;
        long runSum = 0;
        boolean in = false;
        for (int k = 1; k <= COARSE; k++) {
            int i = (start + k) % COARSE;
            if (c[i] >= thr) {
                in = true;
                runSum += c[i];
            } else if (in) {
                if (runSum >= total / 20) {
                    runs++;
                }
                in = false;
                runSum = 0;
            }
        }
        if (in && runSum >= total / 20) {
            runs++;
        }
        return runs;
    }

    private long[] coarse() {
        long[] c = new long[COARSE];
        int per = BINS / COARSE;
        for (int b = 0; b < BINS; b++) {
            c[b / per] += count[b];
        }
        return c;
    }

    /** Wraps to [-0.5, 0.5). */
    static double wrap(double d) {
        return d - Math.floor(d + 0.5);
    }
}
