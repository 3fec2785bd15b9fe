package org.lanesift.plugins.differential;

import java.util.Arrays;

/**
 * Finds the two dominant levels of a two-level signal from the histogram of its samples: the
 * tallest bin, then the bin that maximises height times squared distance from the first (so a
 * second peak far away beats a shoulder of the first), each refined to the mean of the samples
 * within one sixteenth of the range around it.
 */
final class LevelFinder {
    static final int BINS = 256;

    /**
     * The result.
     *
     * @param low    lower level, volts
     * @param high   upper level, volts
     * @param min    smallest sample
     * @param max    largest sample
     * @param median median sample
     * @param twoLevels whether two separate levels were found
     */
    record Levels(double low, double high, double min, double max, double median, boolean twoLevels) {
        double mid() {
            return 0.5 * (low + high);
        }

        double swing() {
            return high - low;
        }
    }

    private LevelFinder() {
    }

    /**
     * Finds the levels of {@code n} samples.
     *
     * @param v samples, volts, all valid and finite
     * @param n count, at least 1
     * @return the levels
     */
    static Levels find(float[] v, int n) {
        float[] sorted = Arrays.copyOf(v, n);
        Arrays.sort(sorted);
        double min = sorted[0];
        double max = sorted[n - 1];
        double median = (n & 1) == 1 ? sorted[n / 2] : 0.5 * ((double) sorted[n / 2 - 1] + sorted[n / 2]);
        double range = max - min;
        if (!(range > 1e-6)) {
            return new Levels(min, max, min, max, median, false);
        }
        int[] h = new int[BINS];
        double scale = BINS / range;
        for (int i = 0; i < n; i++) {
            int b = (int) ((v[i] - min) * scale);
            h[b < 0 ? 0 : (b >= BINS ? BINS - 1 : b)]++;
        }
        // three-tap smoothing so a level split over two bins still forms one peak
        double[] s = new double[BINS];
        for (int b = 0; b < BINS; b++) {
            s[b] = h[b] + 0.5 * ((b > 0 ? h[b - 1] : 0) + (b < BINS - 1 ? h[b + 1] : 0));
        }
        int p1 = 0;
        for (int b = 1; b < BINS; b++) {
            if (s[b] > s[p1]) {
                p1 = b;
            }
        }
        int p2 = -1;
        double best = 0;
        for (int b = 0; b < BINS; b++) {
            double dd = b - p1;
            double score = s[b] * dd * dd;
            if (score > best) {
                best = score;
                p2 = b;
            }
        }
        if (p2 < 0 || Math.abs(p2 - p1) < BINS / 8 || s[p2] < 0.02 * s[p1]) {
            return new Levels(min, max, min, max, median, false);
        }
        double l1 = refine(v, n, min + (p1 + 0.5) / scale, range / 16);
        double l2 = refine(v, n, min + (p2 + 0.5) / scale, range / 16);
        return new Levels(Math.min(l1, l2), Math.max(l1, l2), min, max, median, true);
    }

    private static double refine(float[] v, int n, double centre, double halfWidth) {
        double sum = 0;
        int c = 0;
        for (int i = 0; i < n; i++) {
            if (Math.abs(v[i] - centre) <= halfWidth) {
                sum += v[i];
                c++;
            }
        }
        return c == 0 ? centre : sum / c;
    }
}
