package org.lanesift.plugins.differential;

/**
 * Level statistics over a span of samples, split by the comparator's state: for the low (0) and
 * high (1) state the count, sum, sum of squares, minimum and maximum of the difference (volts), and
 * the same sums for the common mode {@code (p + n) / 2} when both legs are known. Samples inside
 * the hysteresis band (in transition) are left out, so the means are the settled levels.
 */
final class LevelAcc {
    final long[] n = new long[2];
    final double[] sum = new double[2];
    final double[] sq = new double[2];
    final double[] min = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY};
    final double[] max = {Double.NEGATIVE_INFINITY, Double.NEGATIVE_INFINITY};
    final double[] cmSum = new double[2];
    final double[] cmSq = new double[2];
    long samples;
    long invalid;
    long startIndex;
    long endIndex;

    LevelAcc(long startIndex) {
        this.startIndex = startIndex;
        this.endIndex = startIndex;
    }

    /**
     * Adds every {@code stride}-th sample (by index from the stream start) of a segment.
     *
     * @param a      first leg or the only channel
     * @param ao     offset of chunk sample 0 in {@code a}
     * @param b      second leg, or null
     * @param bo     offset in {@code b}
     * @param base   stream index of chunk sample 0
     * @param s0     first chunk-relative sample
     * @param s1     end (exclusive)
     * @param bits   comparator state per chunk sample
     * @param inv    invalid samples of the chunk, or null
     * @param thr    threshold
     * @param half   half the hysteresis band
     * @param stride take every stride-th sample
     */
    void add(float[] a, int ao, float[] b, int bo, long base, int s0, int s1, long[] bits, long[] inv, float thr,
             float half, int stride) {
        samples += s1 - s0;
        long k0 = base + s0;
        long first = ((k0 + stride - 1) / stride) * stride;
        for (long k = first; k < base + s1; k += stride) {
            int i = (int) (k - base);
            if (inv != null && (inv[i >>> 6] & (1L << i)) != 0) {
                continue;
            }
            float d = b == null ? a[ao + i] : a[ao + i] - b[bo + i];
            if (Math.abs(d - thr) < half) {
                continue;
            }
            int c = (bits[i >>> 6] & (1L << i)) != 0 ? 1 : 0;
            n[c]++;
            sum[c] += d;
            sq[c] += (double) d * d;
            if (d < min[c]) {
                min[c] = d;
            }
            if (d > max[c]) {
                max[c] = d;
            }
            if (b != null) {
                double cm = 0.5 * ((double) a[ao + i] + b[bo + i]);
                cmSum[c] += cm;
                cmSq[c] += cm * cm;
            }
        }
        if (inv != null) {
            for (int i = s0; i < s1; i++) {
                if ((inv[i >>> 6] & (1L << i)) != 0) {
                    invalid++;
                }
            }
        }
        endIndex = base + s1;
    }

    /** Adds another accumulator's counts (a later span). */
    void merge(LevelAcc o) {
        for (int c = 0; c < 2; c++) {
            n[c] += o.n[c];
            sum[c] += o.sum[c];
            sq[c] += o.sq[c];
            min[c] = Math.min(min[c], o.min[c]);
            max[c] = Math.max(max[c], o.max[c]);
            cmSum[c] += o.cmSum[c];
            cmSq[c] += o.cmSq[c];
        }
        samples += o.samples;
        invalid += o.invalid;
        endIndex = Math.max(endIndex, o.endIndex);
        startIndex = Math.min(startIndex, o.startIndex);
    }

    double mean(int c) {
        return n[c] == 0 ? Double.NaN : sum[c] / n[c];
    }

    double spread(int c) {
        if (n[c] < 2) {
            return Double.NaN;
        }
        double m = sum[c] / n[c];
        return Math.sqrt(Math.max(0, sq[c] / n[c] - m * m));
    }

    double cmMean(int c) {
        return n[c] == 0 ? Double.NaN : cmSum[c] / n[c];
    }

    double cmMean() {
        long t = n[0] + n[1];
        return t == 0 ? Double.NaN : (cmSum[0] + cmSum[1]) / t;
    }

    double cmSpread() {
        long t = n[0] + n[1];
        if (t < 2) {
            return Double.NaN;
        }
        double m = (cmSum[0] + cmSum[1]) / t;
        return Math.sqrt(Math.max(0, (cmSq[0] + cmSq[1]) / t - m * m));
    }

    boolean hasBothLevels(long minCount) {
        return n[0] >= minCount && n[1] >= minCount;
    }
}
