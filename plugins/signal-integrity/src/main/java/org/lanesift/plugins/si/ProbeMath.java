package org.lanesift.plugins.si;

/**
 * The formulas of the probe calculator (all common practice, no single source): a resistive
 * divider probe of series R into a scope input of R_in, rise time from bandwidth, root-sum-of-squares
 * rise-time correction and the series resonance of a ground lead with the probe capacitance.
 * Units: ohms, volts RMS, watts, seconds, hertz, henries, farads.
 */
final class ProbeMath {
    /** Rise time times bandwidth, about 0.35 (common practice; 0.3497 for a single pole). */
    static final double RISE_BW = 0.35;
    /** Inductance of a straight wire, about 1 nH per mm (common practice). */
    static final double HENRY_PER_MM = 1e-9;

    private ProbeMath() {
    }

    /** Series resistor for a division ratio into {@code inputOhms}: R = R_in (n - 1). */
    static double seriesForRatio(double ratio, double inputOhms) {
        return inputOhms * (ratio - 1);
    }

    /** Division ratio of series R into R_in: (R + R_in) / R_in. */
    static double ratio(double seriesOhms, double inputOhms) {
        return (seriesOhms + inputOhms) / inputOhms;
    }

    /** What the probe loads the circuit with at DC: R + R_in. */
    static double loading(double seriesOhms, double inputOhms) {
        return seriesOhms + inputOhms;
    }

    /**
     * Change of the probed voltage caused by connecting the probe to a source of impedance Zs:
     * loaded / unloaded - 1 = -Zs / (R + R_in + Zs), as a fraction (negative).
     */
    static double amplitudeError(double seriesOhms, double inputOhms, double sourceOhms) {
        double load = loading(seriesOhms, inputOhms);
        return load / (load + sourceOhms) - 1;
    }

    /** Current through the probe for {@code tipVrms} at the tip. */
    static double current(double tipVrms, double seriesOhms, double inputOhms) {
        return tipVrms / loading(seriesOhms, inputOhms);
    }

    /** Rise time from bandwidth: 0.35 / BW. */
    static double riseFromBandwidth(double hz) {
        return RISE_BW / hz;
    }

    /** Root-sum-of-squares: the rise time of the signal itself, or NaN if the measurement is not slower than the instrument. */
    static double correctedRise(double measuredS, double... instrumentS) {
        double s = measuredS * measuredS;
        for (double t : instrumentS) {
            s -= t * t;
        }
        return s > 0 ? Math.sqrt(s) : Double.NaN;
    }

    /** Series resonance f = 1 / (2 pi sqrt(L C)). */
    static double resonance(double henries, double farads) {
        return 1 / (2 * Math.PI * Math.sqrt(henries * farads));
    }

    /** Lead inductance at about 1 nH per mm. */
    static double leadInductance(double mm) {
        return mm * HENRY_PER_MM;
    }

    /** The longest lead (mm) whose resonance with {@code farads} stays at or above {@code hz}. */
    static double longestLead(double hz, double farads) {
        double w = 2 * Math.PI * hz;
        return 1 / (w * w * farads) / HENRY_PER_MM;
    }
}
