package org.lanesift.plugins.dualedge;

import java.util.Arrays;

/**
 * Finds the widest transition-free window around the nominal sample points: every data
 * transition within 1.5 UI of a nominal point gives an offset in UI; the widest gap between
 * sorted offsets whose middle lies within half a UI of the nominal point is the eye, and its
 * middle the phase to sample at.
 */
final class EyeSearch {
    static final double REACH_UI = 1.5;

    /** Result of one search: centre and width in UI, the window's edges, and how many offsets it saw. */
    record Window(double centreUi, double widthUi, double leftUi, double rightUi, int transitions) {
    }

    private EyeSearch() {
    }

    /**
     * Adds the offsets of one lane's transitions around the first {@code m} nominal points.
     *
     * @param q   the lane's transitions
     * @param sb  the planned points
     * @param m   how many
     * @param out offsets so far
     * @param len used length of {@code out}
     * @return the grown array (element 0..newLen-1 used) and new length via {@code lenOut[0]}
     */
    static double[] collect(EdgeQueue q, SampleBuf sb, int m, double[] out, int len, int[] lenOut) {
        long[] t = q.t;
        int head = q.head;
        int tail = q.tail;
        int j = head;
        for (int i = 0; i < m; i++) {
            long nom = sb.nominal[i];
            double ui = sb.ui[i];
            long lo = nom - (long) (REACH_UI * ui);
            long hi = nom + (long) (REACH_UI * ui);
            while (j < tail && t[j] <= lo) {
                j++;
            }
            while (j > head && t[j - 1] > lo) {
                j--;
            }
            for (int k = j; k < tail && t[k] < hi; k++) {
                if (len == out.length) {
                    out = Arrays.copyOf(out, Math.max(64, out.length * 2));
                }
                out[len++] = (t[k] - nom) / ui;
            }
        }
        lenOut[0] = len;
        return out;
    }

    /**
     * The widest gap between sorted offsets whose middle lies in [-0.5, 0.5) UI; ties go to the
     * middle nearest 0.
     *
     * @param off offsets in UI (sorted in place)
     * @param n   how many
     * @return the window
     */
    static Window widest(double[] off, int n) {
        Arrays.sort(off, 0, n);
        double prev = -REACH_UI;
        double best = -1;
        double bestMid = 0;
        double bestL = 0;
        double bestR = 0;
        for (int i = 0; i <= n; i++) {
            double v = i < n ? Math.max(-REACH_UI, Math.min(REACH_UI, off[i])) : REACH_UI;
            double gap = v - prev;
            double mid = 0.5 * (v + prev);
            if (mid >= -0.5 && mid < 0.5) {
                if (gap > best + 1e-12 || (Math.abs(gap - best) <= 1e-12 && Math.abs(mid) < Math.abs(bestMid))) {
                    best = gap;
                    bestMid = mid;
                    bestL = prev;
                    bestR = v;
                }
            }
            prev = v;
        }
        if (best < 0) {
            return new Window(0, 0, 0, 0, n);
        }
        return new Window(bestMid, best, bestL, bestR, n);
    }
}
