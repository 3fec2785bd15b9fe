package org.lanesift.plugins.si;

/**
 * Averages the samples after many edges, aligned on each edge's interpolated 50 % crossing time,
 * so that uncorrelated noise falls as the square root of the number of edges while the step
 * response they share stays. Falling edges are mirrored about the middle of the two levels, so
 * both directions add to one rising step. Each edge's samples are resampled by linear
 * interpolation onto a common grid {@code t50 + delayFs + k * periodFs}; the delay is fixed by the
 * first edge (twice its time from 50 % to the far crossing, plus two samples). Edges that cannot
 * cover the grid's start are left out and counted. Times femtoseconds, voltages volts. Memory: a {@code double} and an {@code int} per
 * sample of the longest tail.
 */
final class EdgeAverager {
    private final double periodFs;
    private final double mirror;
    /** Samples of the average at which at least this share of the edges still contribute. */
    static final double MIN_SHARE = 0.1;

    private double[] sum = new double[0];
    private int[] cover = new int[0];
    private int count;
    private long leftOut;
    private double delayFs = Double.NaN;
    private double firstT50Fs = Double.NaN;
    private double firstDepartFs = Double.NaN;

    /**
     * @param periodFs  sample period
     * @param lowVolts  low level
     * @param highVolts high level
     */
    EdgeAverager(double periodFs, double lowVolts, double highVolts) {
        this.periodFs = periodFs;
        this.mirror = lowVolts + highVolts;
    }

    /**
     * Adds one edge.
     *
     * @param tail        samples from the far crossing on
     * @param n           samples of {@code tail} to use (up to the next edge)
     * @param tailStartFs time of {@code tail[0]}
     * @param t50Fs       interpolated 50 % crossing time
     * @param rising      direction
     * @param departFs    when the signal left for the next edge (for the span of the first edge)
     */
    void add(float[] tail, int n, double tailStartFs, double t50Fs, boolean rising, double departFs) {
        if (count == 0) {
            // twice the first edge's 50-to-far-crossing time plus two samples: room for noisier edges
            // whose far crossing comes later (the ring fit starts at the first peak, later still)
            delayFs = 2 * (tailStartFs - t50Fs) + 2 * periodFs;
        }
        double u = (t50Fs + delayFs - tailStartFs) / periodFs;
        if (!(u >= 0)) {
            leftOut++;
            return;
        }
        int i0 = (int) Math.floor(u);
        double frac = u - i0;
        int avail = n - i0 - 1;
        if (avail < 16) {
            leftOut++;
            return;
        }
        if (count == 0) {
            firstT50Fs = t50Fs;
            firstDepartFs = departFs;
        }
        if (avail > sum.length) {
            sum = java.util.Arrays.copyOf(sum, Math.max(avail, 2 * sum.length));
            cover = java.util.Arrays.copyOf(cover, sum.length);
        }
        for (int k = 0; k < avail; k++) {
            double v = tail[i0 + k] + frac * (tail[i0 + k + 1] - tail[i0 + k]);
            sum[k] += rising ? v : mirror - v;
            cover[k]++;
        }
        count++;
    }

    /** Edges averaged. */
    int count() {
        return count;
    }

    /** Edges left out (could not cover the common grid). */
    long leftOut() {
        return leftOut;
    }

    /**
     * Samples in the average: as far as at least {@link #MIN_SHARE} of the edges (and at least one)
     * still had samples before their next transition. Later samples average fewer edges (those
     * followed by a longer run); each covered sample is the mean of the edges that cover it.
     */
    int length() {
        int need = Math.max(1, (int) Math.ceil(MIN_SHARE * count));
        int k = 0;
        while (k < cover.length && cover[k] >= need) {
            k++;
        }
        return k;
    }

    /** The averaged rising step from {@link #delayFs()} after the 50 % crossing on, {@link #length()} samples. */
    float[] average() {
        int length = length();
        float[] a = new float[length];
        for (int k = 0; k < length; k++) {
            a[k] = (float) (sum[k] / cover[k]);
        }
        return a;
    }

    /** Time from the 50 % crossing to sample 0 of the average. */
    double delayFs() {
        return delayFs;
    }

    /** 50 % crossing of the first edge averaged. */
    double firstT50Fs() {
        return firstT50Fs;
    }

    /** When the first edge averaged gave way to the next transition. */
    double firstDepartFs() {
        return firstDepartFs;
    }
}
