package org.lanesift.plugins.discovery;

/**
 * How a link is clocked, as found from where the data transitions sit in the clock period.
 *
 * @param slotsPerPeriod  bits per clock period on one lane (1: single edge, 2: double edge, more: multiplied)
 * @param samplePhases    sample points as fractions of the period after the rising clock edge, ascending
 * @param transitionPhases centres of the data-transition clusters, fractions of the period
 * @param eyeUi           narrowest gap between transition clusters, in unit intervals (1.0 is a perfectly open eye)
 * @param periodFs        median clock period, femtoseconds
 * @param dutyCycle       median high time over the period
 * @param clockStops      pauses of the clock longer than 1.5 periods seen
 * @param clusteredShare  share of the data transitions that fall inside the clusters (evidence)
 * @param transitions     data transitions examined
 */
public record Clocking(int slotsPerPeriod, double[] samplePhases, double[] transitionPhases, double eyeUi, double periodFs,
                       double dutyCycle, int clockStops, double clusteredShare, long transitions) {

    /** Name of the clocking in reports: {@code single-edge-rising}, {@code single-edge-falling}, {@code double-edge} or {@code multiplied-N}. */
    public String name() {
        if (slotsPerPeriod == 1) {
            double p = samplePhases[0];
            double dRise = Math.min(p, 1 - p);
            return dRise <= Math.abs(p - dutyCycle) ? "single-edge-rising" : "single-edge-falling";
        }
        return slotsPerPeriod == 2 ? "double-edge" : "multiplied-" + slotsPerPeriod;
    }

    /** The {@code dual-edge} sampler mode that takes these bits: {@code ddr}, {@code rising}, {@code falling} or {@code multiplied}. */
    public String samplerMode() {
        if (slotsPerPeriod == 1) {
            return name().endsWith("rising") ? "rising" : "falling";
        }
        return slotsPerPeriod == 2 ? "ddr" : "multiplied";
    }
}
