package org.lanesift.plugins.differential;

import org.lanesift.kit.DitheredStride;

/**
 * Level statistics over a span of samples, split by the comparator's state: for the low (0) and
 * high (1) state the count, sum, sum of squares, minimum and maximum of the difference (volts), and
 * the same sums for the common mode {@code (p + n) / 2} when both legs are known. Samples inside
 * the hysteresis band (in transition) are left out, so the means are the settled levels. Samples
 * whose difference is beyond {@code maxAbsVolts} are left out too: on a D-PHY lane those are
 * low-power states (LP-01 reads -1.2 V differential), which are no high-speed levels.
 */
final class LevelAcc {
    final long[] n = new long[2];
    final double[] sum = new double[2];
    final double[] sq = new double[2];
    final double[] min = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY};
    final double[] max = {Double.NEGATIVE_INFINITY, Double.NEGATIVE_INFINITY};
    final double[] cmSum = new double[2];
    final double[] cmSq = new double[2];
    /** Counts and sums of every sample outside the hysteresis band, used when too few are settled. */
    final long[] nRaw = new long[2];
    final double[] sumRaw = new double[2];
    final double[] cmRaw = new double[2];
    final double[] sqRaw = new double[2];
    final double[] cqRaw = new double[2];
    long samples;
    long invalid;
    long startIndex;
    long endIndex;

    LevelAcc(long startIndex) {
        this.startIndex = startIndex;
        this.endIndex = startIndex;
    }

    /**
     * Adds one sample in each run of {@code stride} (by index from the stream start), at a position in
     * the run chosen by {@link DitheredStride}, so the choice neither aliases with a signal period nor
     * depends on where the segments start.
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
     * @param half   half the hysteresis band: samples closer to the threshold are on an edge
     * @param settled half the band outside which samples count as settled on a level (at least {@code half})
     * @param stride one sample is taken in each run of this many, 1 for every sample
     * @param maxAbsVolts samples whose difference is larger in magnitude are left out (infinity: none)
     */
    void add(float[] a, int ao, float[] b, int bo, long base, int s0, int s1, long[] bits, long[] inv, float thr,
             float half, float settled, int stride, float maxAbsVolts) {
        samples += s1 - s0;
        // accumulate in locals (registers), in the same order as one sample at a time, and write back once, so the
        // sums do not depend on where the segments start
        long n0 = n[0];
        long n1 = n[1];
        double sum0 = sum[0];
        double sum1 = sum[1];
        double sq0 = sq[0];
        double sq1 = sq[1];
        double cm0 = cmSum[0];
        double cm1 = cmSum[1];
        double cq0 = cmSq[0];
        double cq1 = cmSq[1];
        double min0 = min[0];
        double min1 = min[1];
        double max0 = max[0];
        double max1 = max[1];
        long r0 = nRaw[0];
        long r1 = nRaw[1];
        double rs0 = sumRaw[0];
        double rs1 = sumRaw[1];
        double rc0 = cmRaw[0];
        double rc1 = cmRaw[1];
        double rq0 = sqRaw[0];
        double rq1 = sqRaw[1];
        double rcq0 = cqRaw[0];
        double rcq1 = cqRaw[1];
        // one sample per run of stride samples, at the run's hashed offset (runs counted from the stream start)
        long from = base + s0;
        long to = base + s1;
        for (long run = Math.floorDiv(from, stride); ; run++) {
            long k = run * stride + DitheredStride.offset(run, stride);
            if (k < from) {
                continue;
            }
            if (k >= to) {
                break;
            }
            int i = (int) (k - base);
            if (inv != null && (inv[i >>> 6] & (1L << i)) != 0) {
                continue;
            }
            float x = a[ao + i];
            float y = b == null ? 0f : b[bo + i];
            float d = b == null ? x : x - y;
            float dist = Math.abs(d - thr);
            if (dist < half || Math.abs(d) > maxAbsVolts) {
                continue;
            }
            double cm = 0.5 * ((double) x + y);
            boolean isSettled = dist >= settled;
            if ((bits[i >>> 6] & (1L << i)) != 0) {
                r1++;
                rs1 += d;
                rc1 += cm;
                rq1 += (double) d * d;
                rcq1 += cm * cm;
                min1 = d < min1 ? d : min1;
                max1 = d > max1 ? d : max1;
                if (isSettled) {
                    n1++;
                    sum1 += d;
                    sq1 += (double) d * d;
                    cm1 += cm;
                    cq1 += cm * cm;
                }
            } else {
                r0++;
                rs0 += d;
                rc0 += cm;
                rq0 += (double) d * d;
                rcq0 += cm * cm;
                min0 = d < min0 ? d : min0;
                max0 = d > max0 ? d : max0;
                if (isSettled) {
                    n0++;
                    sum0 += d;
                    sq0 += (double) d * d;
                    cm0 += cm;
                    cq0 += cm * cm;
                }
            }
        }
        nRaw[0] = r0;
        nRaw[1] = r1;
        sumRaw[0] = rs0;
        sumRaw[1] = rs1;
        cmRaw[0] = rc0;
        cmRaw[1] = rc1;
        sqRaw[0] = rq0;
        sqRaw[1] = rq1;
        cqRaw[0] = rcq0;
        cqRaw[1] = rcq1;
        n[0] = n0;
        n[1] = n1;
        sum[0] = sum0;
        sum[1] = sum1;
        sq[0] = sq0;
        sq[1] = sq1;
        min[0] = min0;
        min[1] = min1;
        max[0] = max0;
        max[1] = max1;
        if (b != null) {
            cmSum[0] = cm0;
            cmSum[1] = cm1;
            cmSq[0] = cq0;
            cmSq[1] = cq1;
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

    /**
     * Adds a later span's counts. For a level the other span had too few settled samples of, its
     * samples off the edge stand in for settled ones, as they did for that span's own levels.
     */
    void merge(LevelAcc o) {
        for (int c = 0; c < 2; c++) {
            boolean use = o.settled(c);
            n[c] += use ? o.n[c] : o.nRaw[c];
            sum[c] += use ? o.sum[c] : o.sumRaw[c];
            sq[c] += use ? o.sq[c] : o.sqRaw[c];
            cmSum[c] += use ? o.cmSum[c] : o.cmRaw[c];
            cmSq[c] += use ? o.cmSq[c] : o.cqRaw[c];
            min[c] = Math.min(min[c], o.min[c]);
            max[c] = Math.max(max[c], o.max[c]);
            nRaw[c] += o.nRaw[c];
            sumRaw[c] += o.sumRaw[c];
            cmRaw[c] += o.cmRaw[c];
            sqRaw[c] += o.sqRaw[c];
            cqRaw[c] += o.cqRaw[c];
        }
        samples += o.samples;
        invalid += o.invalid;
        endIndex = Math.max(endIndex, o.endIndex);
        startIndex = Math.min(startIndex, o.startIndex);
    }

    /** Whether class {@code c} has enough settled samples; otherwise its level comes from every sample off the edge. */
    boolean settled(int c) {
        return n[c] >= MIN_SETTLED;
    }

    double mean(int c) {
        if (settled(c)) {
            return sum[c] / n[c];
        }
        return nRaw[c] == 0 ? Double.NaN : sumRaw[c] / nRaw[c];
    }

    double spread(int c) {
        if (n[c] < 2) {
            return Double.NaN;
        }
        double m = sum[c] / n[c];
        return Math.sqrt(Math.max(0, sq[c] / n[c] - m * m));
    }

    double cmMean(int c) {
        if (settled(c)) {
            return cmSum[c] / n[c];
        }
        return nRaw[c] == 0 ? Double.NaN : cmRaw[c] / nRaw[c];
    }

    double cmMean() {
        long t = 0;
        double s = 0;
        for (int c = 0; c < 2; c++) {
            if (settled(c)) {
                t += n[c];
                s += cmSum[c];
            } else {
                t += nRaw[c];
                s += cmRaw[c];
            }
        }
        return t == 0 ? Double.NaN : s / t;
    }

    double cmSpread() {
        long t = n[0] + n[1];
        if (t < 2) {
            return Double.NaN;
        }
        double m = (cmSum[0] + cmSum[1]) / t;
        return Math.sqrt(Math.max(0, (cmSq[0] + cmSq[1]) / t - m * m));
    }

    long count(int c) {
        return Math.max(n[c], nRaw[c]);
    }

    boolean hasBothLevels(long minCount) {
        return count(0) >= minCount && count(1) >= minCount;
    }

    /** Fewest settled samples for a class's settled statistics to be used. */
    static final long MIN_SETTLED = 8;
}
