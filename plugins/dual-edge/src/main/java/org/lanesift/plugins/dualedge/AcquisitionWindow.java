package org.lanesift.plugins.dualedge;

import java.util.Arrays;

/**
 * The measurements clock acquisition takes over a window of consecutive clock transitions: the
 * median same-direction interval (the period, fs) and the median high time (fs). Medians, so that
 * a few glitches or one gap inside the window do not move them.
 */
final class AcquisitionWindow {
    private AcquisitionWindow() {
    }

    /**
     * Median interval between transitions two apart (rising to rising, falling to falling).
     *
     * @param q     the clock transitions
     * @param from  global index of the first transition of the window
     * @param count transitions in the window, at least 3
     * @return femtoseconds; 0 when most intervals are 0
     */
    static double medianPeriodFs(EdgeQueue q, long from, int count) {
        double[] iv = new double[count - 2];
        for (int i = 0; i < count - 2; i++) {
            iv[i] = q.time(from + i + 2) - q.time(from + i);
        }
        return median(iv, iv.length);
    }

    /**
     * Median time from a rising transition to the next transition, over the window.
     *
     * @param q     the clock transitions
     * @param from  global index of the first transition of the window
     * @param count transitions in the window
     * @return femtoseconds, or NaN when the window holds no rising transition followed by another
     */
    static double medianHighFs(EdgeQueue q, long from, int count) {
        double[] hi = new double[count];
        int nh = 0;
        for (int i = 0; i < count - 1; i++) {
            if (q.rising(from + i)) {
                hi[nh++] = q.time(from + i + 1) - q.time(from + i);
            }
        }
        return nh > 0 ? median(hi, nh) : Double.NaN;
    }

    /** Median of {@code v[0, n)}, the mean of the middle two for even {@code n}; {@code v} is not changed. */
    static double median(double[] v, int n) {
        double[] c = Arrays.copyOf(v, n);
        Arrays.sort(c);
        return (n & 1) == 1 ? c[n / 2] : 0.5 * (c[n / 2 - 1] + c[n / 2]);
    }
}
