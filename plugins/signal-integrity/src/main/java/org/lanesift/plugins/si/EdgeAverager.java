package org.lanesift.plugins.si;

/**
 * Averages the samples after many edges, aligned on each edge's interpolated 50 % crossing time,
 * so that uncorrelated noise falls as the square root of the number of edges while the step
 * response they share stays. Falling edges are mirrored about the middle of the two levels, so
 * both directions add to one rising step. Each edge's samples are resampled by linear
 * interpolation onto a common grid {@code t50 + delayFs + k * periodFs}; the delay is fixed by the
 * first edge (twice its time from 50 % to the far crossing, plus two samples). Edges that cannot cover the grid's start are
 * left out and counted. Times femtoseconds, voltages volts. Memory: one {@code double} per sample
 * of the first edge's tail.
 */
final class EdgeAverager {
    private final double periodFs;
    private final double mirror;
    private double[] sum;
    private int length;
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
            sum = new double[avail];
            length = avail;
            firstT50Fs = t50Fs;
            firstDepartFs = departFs;
        }
        int m = Math.min(length, avail);
        for (int k = 0; k < m; k++) {
            double v = tail[i0 + k] + frac * (tail[i0 + k + 1] - tail[i0 + k]);
            sum[k] += rising ? v : mirror - v;
        }
        length = m;
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

    /** Samples in the average. */
    int length() {
        return length;
    }

    /** The averaged rising step from {@link #delayFs()} after the 50 % crossing on. */
    float[] average() {
        float[] a = new float[length];
        for (int k = 0; k < length; k++) {
            a[k] = (float) (sum[k] / count);
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
