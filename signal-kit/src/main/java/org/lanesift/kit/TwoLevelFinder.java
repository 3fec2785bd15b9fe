package org.lanesift.kit;

import java.util.Arrays;

/**
 * Finds the two levels of a two-level signal (a data or clock line, a logic leg) from a set of its
 * samples, the one method every plugin and {@code inspect} use.
 *
 * <p><b>Method.</b> Iterative two-class means on the sorted samples (the "iterative selection"
 * threshold: Ridler and Calvard, Picture thresholding using an iterative selection method, IEEE
 * Trans. SMC-8, 1978): start from the middle of the 0.1 and 99.9 percentiles, split the samples
 * there, move the threshold to the mean of the two class means, repeat until the split no longer
 * moves; then repeat the same with the mean of the central half of each class (the interquartile
 * mean, J. W. Tukey's midmean) in place of its mean. Each level is the midmean of its class, so
 * samples on an edge or in ringing do not pull it in, and the final split sits halfway between
 * the levels, so a sine's two crests come out symmetric. Nothing depends on histogram bins, so ADC code steps cannot make a bin peak out of
 * step with the real level, and every sample given is used (no stride to alias with a period).
 *
 * <p><b>Two levels or one.</b> The result says {@link TwoLevels#twoLevels()} when each class holds
 * at least {@link #MIN_CLASS_FRACTION} of the samples and the medians are more than
 * {@link #MIN_SEPARATION_IQR} times the wider class's interquartile range apart. One noisy level
 * (a Gaussian cut in two gives about 1.6) and a uniform ramp (2.0) fail; a noisy square wave or
 * a sine wave (about 2.6) pass. Units are those of the samples (volts, usually).
 */
public final class TwoLevelFinder {
    /** Least share of the samples in each class. */
    public static final double MIN_CLASS_FRACTION = 0.01;
    /** Least ratio of the level separation to the wider class's interquartile range. */
    public static final double MIN_SEPARATION_IQR = 2.2;
    /** Smallest range, in sample units, that can hold two levels. */
    public static final double MIN_RANGE = 1e-6;
    private static final int MAX_ITERATIONS = 100;

    private TwoLevelFinder() {
    }

    /**
     * Finds the levels of the first {@code n} samples; samples that are not finite are skipped.
     *
     * @param v samples
     * @param n how many of them to use
     * @return the levels; all NaN and not two levels when no sample is finite
     */
    public static TwoLevels find(float[] v, int n) {
        float[] s = new float[n];
        int m = 0;
        for (int i = 0; i < n; i++) {
            if (Float.isFinite(v[i])) {
                s[m++] = v[i];
            }
        }
        return findSorted(sortedPrefix(s, m), m);
    }

    private static float[] sortedPrefix(float[] s, int m) {
        Arrays.sort(s, 0, m);
        return s;
    }

    /**
     * Finds the levels of samples already sorted in ascending order, all finite.
     *
     * @param s sorted samples
     * @param n count
     * @return the levels
     */
    public static TwoLevels findSorted(float[] s, int n) {
        if (n == 0) {
            return new TwoLevels(Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, false);
        }
        double min = s[0];
        double max = s[n - 1];
        double median = median(s, 0, n);
        if (!(max - min > MIN_RANGE)) {
            return new TwoLevels(min, max, min, max, median, median, false);
        }
        double[] prefix = new double[n + 1];
        for (int i = 0; i < n; i++) {
            prefix[i + 1] = prefix[i] + s[i];
        }
        int tail = n / 1000;
        double thr = 0.5 * ((double) s[tail] + s[n - 1 - tail]);
        int split = upperBound(s, n, thr);
        for (int it = 0; it < MAX_ITERATIONS && split > 0 && split < n; it++) {
            double lowMean = prefix[split] / split;
            double highMean = (prefix[n] - prefix[split]) / (n - split);
            thr = 0.5 * (lowMean + highMean);
            int next = upperBound(s, n, thr);
            if (next == split) {
                break;
            }
            split = next;
        }
        if (split == 0 || split == n) {
            return new TwoLevels(min, max, min, max, median, median, false);
        }
        // then the same iteration with the midmeans, which edges and ringing do not pull in
        double low = midmean(prefix, 0, split);
        double high = midmean(prefix, split, n);
        for (int it = 0; it < MAX_ITERATIONS; it++) {
            thr = 0.5 * (low + high);
            int next = upperBound(s, n, thr);
            if (next == split || next == 0 || next == n) {
                break;
            }
            split = next;
            low = midmean(prefix, 0, split);
            high = midmean(prefix, split, n);
        }
        double spread = Math.max(iqr(s, 0, split), iqr(s, split, n));
        boolean enough = split >= MIN_CLASS_FRACTION * n && n - split >= MIN_CLASS_FRACTION * n;
        boolean apart = high - low > MIN_SEPARATION_IQR * spread && high - low > MIN_RANGE;
        if (!enough || !apart) {
            return new TwoLevels(min, max, min, max, median, median, false);
        }
        return new TwoLevels(low, high, min, max, median, thr, true);
    }

    /** First index whose sample is greater than {@code x}. */
    private static int upperBound(float[] s, int n, double x) {
        int lo = 0;
        int hi = n;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (s[mid] <= x) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    private static double median(float[] s, int from, int to) {
        int c = to - from;
        int h = from + c / 2;
        return (c & 1) == 1 ? s[h] : 0.5 * ((double) s[h - 1] + s[h]);
    }

    /** Mean of the central half of a sorted run, from its prefix sums. */
    private static double midmean(double[] prefix, int from, int to) {
        int c = to - from;
        int a = from + c / 4;
        int z = to - c / 4;
        return (prefix[z] - prefix[a]) / (z - a);
    }

    /** Interquartile range of a sorted run, nearest-rank quartiles. */
    private static double iqr(float[] s, int from, int to) {
        int c = to - from;
        return (double) s[from + (3 * (c - 1)) / 4] - s[from + (c - 1) / 4];
    }
}
