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
    /** Samples gathered per state before their sums are taken. */
    private static final int BATCH = 256;
    /** Chunk indices of the samples that count, state 0 from 0 and state 1 from {@link #BATCH}. */
    private final int[] taken = new int[2 * BATCH];
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
        int[] ix = taken;
        // one sample per run of stride samples, at the run's hashed offset (runs counted from the stream start)
        long from = base + s0;
        long to = base + s1;
        long run = Math.floorDiv(from, stride);
        boolean more = true;
        while (more) {
            // pass 1: the chunk indices of the samples that count, split by comparator state without a branch
            // on it (random data makes it a coin toss), each state's in stream order
            int c0 = 0;
            int c1 = 0;
            while (c0 < BATCH && c1 < BATCH) {
                long k = run * stride + DitheredStride.offset(run, stride);
                run++;
                if (k < from) {
                    continue;
                }
                if (k >= to) {
                    more = false;
                    break;
                }
                int i = (int) (k - base);
                if (inv != null && (inv[i >>> 6] & (1L << i)) != 0) {
                    continue;
                }
                float d = b == null ? a[ao + i] : a[ao + i] - b[bo + i];
                if (Math.abs(d - thr) < half || Math.abs(d) > maxAbsVolts) {
                    continue;
                }
                int high = (int) (bits[i >>> 6] >>> i) & 1;
                ix[c0] = i;
                ix[BATCH + c1] = i;
                c0 += 1 - high;
                c1 += high;
            }
            // pass 2: each state's sums in the same order as one sample at a time, so they are the same
            // whichever way the samples were cut into segments and batches
            accumulate(0, ix, 0, c0, a, ao, b, bo, thr, settled);
            accumulate(1, ix, BATCH, c1, a, ao, b, bo, thr, settled);
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

    /** Adds {@code count} samples of state {@code c} at chunk indices {@code ix[at..]}, in order, to the sums (locals in the loop). */
    private void accumulate(int c, int[] ix, int at, int count, float[] a, int ao, float[] b, int bo, float thr, float settled) {
        if (count == 0) {
            return;
        }
        long nc = n[c];
        double sumc = sum[c];
        double sqc = sq[c];
        double cmc = cmSum[c];
        double cqc = cmSq[c];
        double minc = min[c];
        double maxc = max[c];
        long rc = nRaw[c];
        double rsc = sumRaw[c];
        double rcc = cmRaw[c];
        double rqc = sqRaw[c];
        double rcqc = cqRaw[c];
        for (int t = at, end = at + count; t < end; t++) {
            int i = ix[t];
            float x = a[ao + i];
            float y = b == null ? 0f : b[bo + i];
            float d = b == null ? x : x - y;
            double cm = 0.5 * ((double) x + y);
            rc++;
            rsc += d;
            rcc += cm;
            rqc += (double) d * d;
            rcqc += cm * cm;
            minc = d < minc ? d : minc;
            maxc = d > maxc ? d : maxc;
            if (Math.abs(d - thr) >= settled) {
                nc++;
                sumc += d;
                sqc += (double) d * d;
                cmc += cm;
                cqc += cm * cm;
            }
        }
        n[c] = nc;
        sum[c] = sumc;
        sq[c] = sqc;
        min[c] = minc;
        max[c] = maxc;
        nRaw[c] = rc;
        sumRaw[c] = rsc;
        cmRaw[c] = rcc;
        sqRaw[c] = rqc;
        cqRaw[c] = rcqc;
        if (b != null) {
            cmSum[c] = cmc;
            cmSq[c] = cqc;
        }
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
