package org.lanesift.plugins.discovery;

import java.util.Arrays;
import org.lanesift.plugin.InputFormatException;

/**
 * Finds the clocking of a link from edge lists: the phase of every data transition inside its
 * clock period goes into a circular histogram; each cluster of transitions is the boundary
 * between two bit slots, so the number of clusters is the number of bits per clock period and the
 * middle of each gap between clusters is a sample point (the widest eye). Common practice: data
 * launched on one clock edge changes there and is sampled half a unit interval later.
 */
final class ClockFinder {
    static final int BINS = 96;
    /** A clock period counts as steady within this fraction of the median period. */
    static final double STEADY_TOLERANCE = 0.1;
    /** Share of steady periods (pauses aside) below which the signal is refused as a clock. */
    static final double MIN_STEADY_SHARE = 0.9;
    /** Transitions whose offsets from the clock are examined for a sample grid. */
    static final int GRID_SAMPLE = 8192;
    /** Offsets closer than this are one grid value (grids of a fractional number of fs round). */
    static final long GRID_TOLERANCE_FS = 2;

    private ClockFinder() {
    }

    /**
     * @param risingFs    rising clock edges, ascending
     * @param nRising     how many
     * @param fallingFs   falling clock edges, ascending
     * @param nFalling    how many
     * @param laneEdgesFs transitions of each data lane, ascending
     * @param laneCounts  transitions per lane
     * @return the clocking
     */
    static Clocking find(long[] risingFs, int nRising, long[] fallingFs, int nFalling, long[][] laneEdgesFs, int[] laneCounts) {
        if (nRising < 16) {
            throw new InputFormatException("clock: " + nRising + " rising edges; at least 16 expected to tell the clocking");
        }
        double period = medianDiff(risingFs, nRising);
        if (!(period > 0)) {
            throw new InputFormatException("clock: rising edges do not advance (median period " + period + " fs)");
        }
        int stops = 0;
        int steady = 0;
        for (int i = 1; i < nRising; i++) {
            long d = risingFs[i] - risingFs[i - 1];
            if (d > 1.5 * period) {
                stops++;
            } else if (Math.abs(d - period) <= STEADY_TOLERANCE * period) {
                steady++;
            }
        }
        double steadyShare = steady / (double) Math.max(1, nRising - 1 - stops);
        if (steadyShare < MIN_STEADY_SHARE) {
            throw new InputFormatException("clock: only " + Math.round(100 * steadyShare) + " % of the periods between rising edges are within "
                    + Math.round(100 * STEADY_TOLERANCE) + " % of the median (" + Math.round(period / 1000) + " ps); at least "
                    + Math.round(100 * MIN_STEADY_SHARE) + " % expected of a clock (is the signal given as the clock the link's clock?)");
        }
        double duty = duty(risingFs, nRising, fallingFs, nFalling, period);
        long[] hist = new long[BINS];
        long total = 0;
        long[] offsets = new long[GRID_SAMPLE];
        int nOffsets = 0;
        for (int k = 0; k < laneEdgesFs.length; k++) {
            long[] t = laneEdgesFs[k];
            int r = 0;
            for (int i = 0; i < laneCounts[k]; i++) {
                while (r + 1 < nRising && risingFs[r + 1] <= t[i]) {
                    r++;
                }
                if (t[i] < risingFs[r]) {
                    continue;
                }
                double p = r + 1 < nRising ? risingFs[r + 1] - risingFs[r] : period;
                if (p > 1.5 * period) {
                    p = period;
                }
                double ph = (t[i] - risingFs[r]) / p;
                if (ph >= 1.0) {
                    continue; // outside a running clock period (the clock stopped)
                }
                hist[(int) (ph * BINS) % BINS]++;
                total++;
                if (nOffsets < GRID_SAMPLE) {
                    offsets[nOffsets++] = t[i] - risingFs[r];
                }
            }
        }
        if (total < 32) {
            throw new InputFormatException("data lanes: " + total + " transitions inside running clock periods; at least 32 expected "
                    + "(are the lanes and the clock from the same link?)");
        }
        double gridFs = grid(offsets, nOffsets, period);
        int reach = Math.max(1, (int) Math.ceil(gridFs / period * BINS / 2));
        return clusters(hist, total, period, duty, stops, reach);
    }

    /**
     * The sample grid the edge times lie on, as seen in the offsets of data transitions from their
     * clock edge: a logic capture (or a VCD with a coarse timescale) gives offsets that are whole
     * multiples of one step, so the phases of one slot boundary fall on a few values one step
     * apart, with empty histogram bins between them when the step is wider than a bin. Offsets on
     * a grid repeat (at most a quarter of them distinct, or there is no grid to speak of). The step
     * is the smallest difference between distinct offsets, taken as a grid only when nearly every
     * difference is a whole multiple of it (within {@link #GRID_TOLERANCE_FS}, for grids that are
     * not a whole number of femtoseconds) and it is at most 1/8 of the clock period; otherwise 0.
     *
     * @param offsets  offsets of data transitions from the rising clock edge before them, fs
     * @param n        how many
     * @param periodFs the clock period, fs
     * @return the grid step in fs, or 0 when the times show none worth widening the clusters for
     */
    static double grid(long[] offsets, int n, double periodFs) {
        long[] v = Arrays.copyOf(offsets, n);
        Arrays.sort(v);
        long[] d = new long[n];
        int m = 0;
        long last = n > 0 ? v[0] : 0;
        for (int i = 1; i < n; i++) {
            if (v[i] - last > GRID_TOLERANCE_FS) {
                d[m++] = v[i] - last;
                last = v[i];
            }
        }
        if (m < 1 || 4L * (m + 1) > n) {
            return 0; // one offset value, or offsets that seldom repeat: times off any grid
        }
        long step = Long.MAX_VALUE;
        for (int i = 0; i < m; i++) {
            step = Math.min(step, d[i]);
        }
        if (step > periodFs / 8) {
            return 0;
        }
        int onGrid = 0;
        for (int i = 0; i < m; i++) {
            long k = Math.round(d[i] / (double) step);
            if (Math.abs(d[i] - k * step) <= GRID_TOLERANCE_FS * k) {
                onGrid++;
            }
        }
        return onGrid >= 0.9 * m ? step : 0;
    }

    /**
     * @param reach half-width of the smoothing window in bins: 1, or half the sample grid's step
     *              where the edges lie on a grid coarser than a bin, so that the spikes one step
     *              apart of one slot boundary make one cluster
     */
    private static Clocking clusters(long[] hist, long total, double period, double duty, int stops, int reach) {
        long[] smooth = new long[BINS];
        long max = 0;
        for (int b = 0; b < BINS; b++) {
            for (int j = -reach; j <= reach; j++) {
                smooth[b] += hist[(b + j + BINS) % BINS];
            }
            max = Math.max(max, smooth[b]);
        }
        long thr = Math.max(1, max / 8);
        int firstLow = -1;
        for (int b = 0; b < BINS; b++) {
            if (smooth[b] < thr) {
                firstLow = b;
                break;
            }
        }
        if (firstLow < 0) {
            throw new InputFormatException("data lanes: transitions spread over the whole clock period; no eye opening found "
                    + "(is the clock the link's bit clock?)");
        }
        double[] centres = new double[BINS];
        double[] widths = new double[BINS];
        int n = 0;
        long inside = 0;
        int b = firstLow;
        for (int step = 0; step < BINS; step++, b = (b + 1) % BINS) {
            if (smooth[b] >= thr) {
                double sw = 0;
                double s = 0;
                int len = 0;
                int c = b;
                while (smooth[c] >= thr && len < BINS) {
                    int unwrapped = c < b ? c + BINS : c;
                    sw += hist[c] * (unwrapped + 0.5);
                    s += hist[c];
                    inside += hist[c];
                    len++;
                    c = (c + 1) % BINS;
                }
                centres[n] = (s > 0 ? sw / s : b + len / 2.0) / BINS % 1.0;
                widths[n] = Math.max(1, len - 2 * (reach - 1)) / (double) BINS;
                n++;
                step += len - 1;
                b = (c + BINS - 1) % BINS;
            }
        }
        double[] ctr = Arrays.copyOf(centres, n);
        double[] wid = Arrays.copyOf(widths, n);
        Integer[] order = new Integer[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (x, y) -> Double.compare(ctr[x], ctr[y]));
        double[] c = new double[n];
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            c[i] = ctr[order[i]];
            w[i] = wid[order[i]];
        }
        double[] samples = new double[n];
        double eye = Double.MAX_VALUE;
        for (int i = 0; i < n; i++) {
            double next = i + 1 < n ? c[i + 1] : c[0] + 1.0;
            samples[i] = ((c[i] + next) / 2) % 1.0;
            double gap = (next - w[(i + 1) % n] / 2) - (c[i] + w[i] / 2);
            eye = Math.min(eye, gap * n);
        }
        for (int i = 0; i < n; i++) {
            // a sample point just before the rising edge belongs to the period it starts, not the one before
            if (samples[i] > 1.0 - 0.25 / n) {
                samples[i] -= 1.0;
            }
        }
        Arrays.sort(samples);
        return new Clocking(n, samples, c, Math.max(0, eye), period, duty, stops, inside / (double) total, total);
    }

    private static double duty(long[] rise, int nr, long[] fall, int nf, double period) {
        if (nf == 0) {
            return 0.5;
        }
        double[] d = new double[Math.min(nr, 4096)];
        int m = 0;
        int f = 0;
        for (int i = 0; i < nr && m < d.length; i++) {
            while (f < nf && fall[f] <= rise[i]) {
                f++;
            }
            if (f < nf && fall[f] - rise[i] < period) {
                d[m++] = (fall[f] - rise[i]) / period;
            }
        }
        if (m == 0) {
            return 0.5;
        }
        Arrays.sort(d, 0, m);
        return d[m / 2];
    }

    static double medianDiff(long[] t, int n) {
        int m = Math.min(n - 1, 8192);
        double[] d = new double[m];
        for (int i = 0; i < m; i++) {
            d[i] = t[i + 1] - t[i];
        }
        Arrays.sort(d);
        return d[m / 2];
    }
}
