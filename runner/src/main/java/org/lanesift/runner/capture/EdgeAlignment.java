package org.lanesift.runner.capture;

import java.util.Arrays;

/**
 * The offset between two acquisitions of a capture set, from the transitions of the channel they
 * share: the cross-correlation of the two edge trains (every pair of same-direction transitions
 * within the search range votes for its time difference, in bins of a sample period), its peak,
 * and then the mean difference of the transitions matched around the peak, which places the
 * offset to a fraction of a sample. Confidence: the fraction of reference transitions the peak
 * matches, and how close the best other offset comes.
 */
final class EdgeAlignment {
    /** Reference transitions that vote. */
    static final int VOTERS = 4096;
    /** Fewest reference transitions in the overlap to align at all. */
    static final int MIN_VOTERS = 16;
    /** Fraction of reference transitions the peak must match: below it the content did not repeat. */
    static final double MIN_MATCHED = 0.6;
    /** The best other offset may reach this fraction of the peak's votes: above it the alignment is ambiguous. */
    static final double MAX_RUNNER_UP = 0.8;
    /** Bins either side of the peak that belong to it (quantisation and jitter spread it). */
    static final int PEAK_HALF_WIDTH = 3;

    /**
     * The outcome.
     *
     * @param offsetFs        time of the other acquisition's shared channel minus the reference's, femtoseconds
     * @param matched         fraction of the voting reference transitions that found a partner at the peak, 0 to 1
     * @param runnerUp        votes of the best other offset over the peak's, 0 to 1
     * @param runnerUpFs      that other offset
     * @param residualRmsFs   rms of the matched differences about the offset
     * @param pairs           transitions matched
     * @param voters          reference transitions that voted
     * @param binFs           the bin width: a sample period, or an eighth of the median interval of edge lists
     */
    record Result(double offsetFs, double matched, double runnerUp, double runnerUpFs, double residualRmsFs, int pairs, int voters,
                  double binFs) {
        /**
         * Standard error of the offset: rms / sqrt(pairs). When every matched difference is the same
         * (the unit interval a whole number of sample periods, so the sample grid meets every edge at
         * the same phase and nothing averages out), the offset is known only to a bin, and the error
         * given is that of a uniform quantisation of one bin, bin / sqrt(12).
         */
        double standardErrorFs() {
            if (pairs == 0) {
                return Double.NaN;
            }
            return residualRmsFs > 1e-6 * binFs ? residualRmsFs / Math.sqrt(pairs) : binFs / Math.sqrt(12);
        }
    }

    private EdgeAlignment() {
    }

    /**
     * Aligns {@code other} on {@code ref}.
     *
     * @param ref      the reference acquisition's shared transitions
     * @param other    another acquisition's
     * @param searchFs largest offset searched either way
     * @return the result, or null when the overlap holds fewer than {@link #MIN_VOTERS} transitions
     */
    static Result align(SharedEdges ref, SharedEdges other, long searchFs) {
        double binFs = Math.max(finiteOr(ref.periodFs, 0), finiteOr(other.periodFs, 0));
        if (!(binFs > 0)) {
            binFs = medianInterval(ref) / 8;
        }
        long lo = Math.max(ref.startFs, other.startFs) + searchFs;
        long hi = Math.min(ref.endFs, other.endFs) - searchFs;
        int first = lowerBound(ref.timesFs, ref.count, lo);
        int last = lowerBound(ref.timesFs, ref.count, hi);
        int inRange = last - first;
        if (inRange < MIN_VOTERS) {
            return null;
        }
        int stride = Math.max(1, inRange / VOTERS);
        int bins = (int) Math.ceil(2.0 * searchFs / binFs) + 1;
        int[] votes = new int[bins];
        int voters = 0;
        for (int k = first; k < last; k += stride) {
            voters++;
            long a = ref.timesFs[k];
            boolean up = ref.rises(k);
            for (int j = lowerBound(other.timesFs, other.count, a - searchFs); j < other.count && other.timesFs[j] <= a + searchFs; j++) {
                if (other.rises(j) == up) {
                    votes[(int) ((other.timesFs[j] - a + searchFs) / binFs)]++;
                }
            }
        }
        int[] near = new int[bins];
        for (int i = 0; i < bins; i++) {
            near[i] = votes[i] + (i > 0 ? votes[i - 1] : 0) + (i + 1 < bins ? votes[i + 1] : 0);
        }
        int best = 0;
        for (int i = 1; i < bins; i++) {
            if (near[i] > near[best]) {
                best = i;
            }
        }
        int second = -1;
        for (int i = 0; i < bins; i++) {
            if (Math.abs(i - best) > PEAK_HALF_WIDTH && (second < 0 || near[i] > near[second])) {
                second = i;
            }
        }
        double coarseFs = (best + 0.5) * binFs - searchFs;
        // refine: every reference transition in the overlap against the nearest same-direction one
        double window = 1.5 * binFs; // the three bins the peak was counted in
        double sum = 0;
        double sum2 = 0;
        int pairs = 0;
        for (int k = first; k < last; k++) {
            long a = ref.timesFs[k];
            double want = a + coarseFs;
            int j = lowerBound(other.timesFs, other.count, (long) Math.floor(want - window));
            double bestD = Double.NaN;
            for (; j < other.count && other.timesFs[j] <= want + window; j++) {
                double d = other.timesFs[j] - a;
                if (other.rises(j) == ref.rises(k) && (Double.isNaN(bestD) || Math.abs(d - coarseFs) < Math.abs(bestD - coarseFs))) {
                    bestD = d;
                }
            }
            if (!Double.isNaN(bestD)) {
                double r = bestD - coarseFs;
                sum += r;
                sum2 += r * r;
                pairs++;
            }
        }
        double mean = pairs > 0 ? sum / pairs : 0;
        double rms = pairs > 1 ? Math.sqrt(Math.max(0, sum2 / pairs - mean * mean)) : Double.NaN;
        double runnerUp = second < 0 || near[best] == 0 ? 0 : (double) near[second] / near[best];
        return new Result(coarseFs + mean, Math.min(1, (double) near[best] / voters), runnerUp,
                second < 0 ? Double.NaN : (second + 0.5) * binFs - searchFs, rms, pairs, voters, binFs);
    }

    private static double finiteOr(double v, double or) {
        return Double.isFinite(v) ? v : or;
    }

    private static double medianInterval(SharedEdges e) {
        if (e.count < 2) {
            return 1;
        }
        long[] d = new long[e.count - 1];
        for (int i = 1; i < e.count; i++) {
            d[i - 1] = e.timesFs[i] - e.timesFs[i - 1];
        }
        Arrays.sort(d);
        return Math.max(1, d[d.length / 2]);
    }

    /** First index whose time is at least {@code t}. */
    static int lowerBound(long[] a, int n, long t) {
        int l = 0;
        int h = n;
        while (l < h) {
            int m = (l + h) >>> 1;
            if (a[m] < t) {
                l = m + 1;
            } else {
                h = m;
            }
        }
        return l;
    }
}
