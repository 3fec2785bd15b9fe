package org.lanesift.plugins.dualedge;

/**
 * Finds the sample grid that a logic capture leaves on its edge times, so the sampler can refuse a
 * capture taken too slowly to place each bit.
 *
 * <p>Edges that come from a logic capture (the instrument's own comparator, converted by
 * {@code logic-edges}) all lie on the capture's sample grid {@code t0 + k * Ts}; edges interpolated
 * from analog samples do not. The grid is the largest {@code Ts = d / m} (d the shortest interval
 * between two edges, m = 1..{@value #MAX_DIVISOR}) on which every edge lies within
 * {@value #TOLERANCE_FS} fs plus one part in 10^9 of its distance from the first edge (times are
 * whole femtoseconds, so a grid of a non-integer period is rounded by up to half a femtosecond per
 * edge).
 *
 * <p>The rule it serves (derivation in docs/sampling-rate.md): an edge seen in a logic capture is
 * late by anything from 0 to one sample period Ts, on the clock and on the data alike, so the
 * sample point placed from the clock may sit up to Ts away from the true bit centre relative to
 * the data. Every bit is read right only while that error stays under half a unit interval:
 * {@code Ts <= UI / 2} (the lateness is below Ts), at least 2 samples per unit interval.
 */
final class SampleGrid {
    static final int MAX_DIVISOR = 8;
    static final long TOLERANCE_FS = 2;
    /** Fewest edges the grid is judged on. */
    static final int MIN_EDGES = 16;
    /** Least samples per unit interval a logic capture needs: {@code Ts <= UI / 2}. */
    static final double MIN_SAMPLES_PER_UI = 2.0;

    private SampleGrid() {
    }

    /**
     * The grid period of edge times {@code t[from..to)}, femtoseconds, or NaN when they do not lie
     * on one (analog, interpolated edges) or there are fewer than {@link #MIN_EDGES}.
     */
    static double periodFs(long[] t, int from, int to) {
        if (to - from < MIN_EDGES) {
            return Double.NaN;
        }
        long shortest = Long.MAX_VALUE;
        for (int i = from + 1; i < to; i++) {
            long d = t[i] - t[i - 1];
            if (d > 0 && d < shortest) {
                shortest = d;
            }
        }
        if (shortest == Long.MAX_VALUE) {
            return Double.NaN;
        }
        for (int m = 1; m <= MAX_DIVISOR; m++) {
            double g = (double) shortest / m;
            if (g < 4 * TOLERANCE_FS) {
                break;
            }
            // refine the period on the farthest edge, then check every edge against it
            long span = t[to - 1] - t[from];
            double refined = span == 0 ? g : span / Math.rint(span / g);
            if (fits(t, from, to, refined)) {
                return refined;
            }
        }
        return Double.NaN;
    }

    private static boolean fits(long[] t, int from, int to, double g) {
        long t0 = t[from];
        for (int i = from + 1; i < to; i++) {
            double d = t[i] - t0;
            double r = d - Math.rint(d / g) * g;
            if (Math.abs(r) > TOLERANCE_FS + 1e-9 * d) {
                return false;
            }
        }
        return true;
    }
}
