package org.lanesift.plugins.deskew;

import java.util.Arrays;
import java.util.Locale;

/**
 * Finds the unit interval of a {@code skew-estimate} lanes-mode reference (lane 0) when that
 * reference is a clock rather than data, so a clock on lane 0 is never mistaken for data.
 *
 * <p>Lane 0 counts as a clock when every full period (two consecutive transition intervals, in
 * femtoseconds) lies within {@link #PERIOD_SPREAD} of their median. The unit interval is then the
 * clock period divided by the bits per clock: given ({@code bitsPerClock}), or derived from the
 * clock's shape when its high and low times are unequal: the smallest whole numbers {@code h:l}
 * matching the high:low ratio give {@code h + l} bits per clock (a 7:1 pixel-link clock is high
 * for 4 and low for 3 slots: docs/reference-facts.md#pixel-link-clock-and-slot-mappings). An even
 * clock (1:1) fits 1 bit per period, 2 (both edges) or more equally well, so it is refused.
 */
final class UnitIntervalSource {
    /** Largest relative distance of the 10th and 90th percentile periods from the median for a clock. */
    static final double PERIOD_SPREAD = 0.08;
    /** Largest bits per clock tried when deriving them from the shape. */
    static final int MAX_DERIVED_BITS = 16;
    /** Relative tolerance of the high:low ratio fit. */
    static final double RATIO_TOLERANCE = 0.03;

    private UnitIntervalSource() {
    }

    /**
     * What was found.
     *
     * @param unitIntervalFs the unit interval in femtoseconds, 0 when it cannot be derived
     * @param clockPeriodFs  the measured clock period, femtoseconds, 0 when lane 0 is no clock
     * @param bitsPerClock   bits per clock period used, 0 when lane 0 is no clock or they are unknown
     * @param how            one sentence: how the unit interval was found, or why it cannot be
     */
    record Finding(double unitIntervalFs, double clockPeriodFs, int bitsPerClock, String how) {
        /** @return true when the unit interval could not be derived */
        boolean refused() {
            return !(unitIntervalFs > 0);
        }
    }

    /**
     * Looks at lane 0's transition intervals in time order.
     *
     * @param intervalsFs  consecutive intervals between lane-0 transitions, femtoseconds, at least 20
     * @param bitsPerClock bits per clock period if known, else 0
     * @return the finding when lane 0 is a clock, null when it is not (the caller estimates from data)
     */
    static Finding fromReference(long[] intervalsFs, int bitsPerClock) {
        int m = intervalsFs.length;
        if (m < 20) {
            return null;
        }
        long[] full = new long[m - 1];
        long[] even = new long[(m + 1) / 2];
        long[] odd = new long[m / 2];
        for (int i = 0; i < m; i++) {
            if (i + 1 < m) {
                full[i] = intervalsFs[i] + intervalsFs[i + 1];
            }
            if ((i & 1) == 0) {
                even[i / 2] = intervalsFs[i];
            } else {
                odd[i / 2] = intervalsFs[i];
            }
        }
        Arrays.sort(full);
        double period = full[full.length / 2];
        double lo = full[full.length / 10];
        double hi = full[full.length - 1 - full.length / 10];
        if (!(period > 0) || lo < period * (1 - PERIOD_SPREAD) || hi > period * (1 + PERIOD_SPREAD)) {
            return null;
        }
        String clock = String.format(Locale.ROOT, "lane0 is a clock (period %.1f ps", period / 1000.0);
        if (bitsPerClock > 0) {
            return new Finding(period / bitsPerClock, period, bitsPerClock,
                    clock + ", " + bitsPerClock + " bits per clock from option 'bitsPerClock')");
        }
        double a = median(even);
        double b = median(odd);
        double ratio = Math.max(a, b) / Math.min(a, b);
        String shape = String.format(Locale.ROOT, ", high:low %.3f", ratio);
        for (int n = 3; n <= MAX_DERIVED_BITS; n++) {
            for (int h = n / 2 + 1; h < n; h++) {
                double r = h / (double) (n - h);
                if (Math.abs(ratio - r) <= RATIO_TOLERANCE * r) {
                    return new Finding(period / n, period, n, clock + shape + " fits " + h + ":" + (n - h) + ", so " + n
                            + " bits per clock)");
                }
            }
        }
        return new Finding(0, period, 0, clock + shape + "): its shape does not tell the bits per clock, so the unit interval"
                + " cannot be derived; give option 'unitInterval' or option 'bitsPerClock' (7 on a 7:1 pixel link, 2 for a clock"
                + " with data on both edges)");
    }

    private static double median(long[] v) {
        long[] c = v.clone();
        Arrays.sort(c);
        return c[c.length / 2];
    }
}
