package org.lanesift.plugins.si;

import java.io.PrintStream;
import java.util.Locale;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;

/**
 * The command-line probe calculator, {@code lanesift probe}: designs and checks a resistive
 * divider probe for a 50-ohm scope input ({@code divider}), converts bandwidth to rise time and
 * corrects a measured rise time ({@code rise}), and finds the resonance of a ground lead with the
 * probe capacitance ({@code lead}). Every result states its assumptions; results that involve a
 * voltage also print the safety cautions. Worked examples: docs/probe.md.
 */
public final class ProbeTool implements Tool {
    static final double DEFAULT_INPUT_MAX_VRMS = 5.0;
    static final double DEFAULT_INPUT_MAX_WATTS = 0.5;
    static final double DEFAULT_RESISTOR_WATTS = 0.25;
    static final double NEAR = 0.8;
    /**
     * Default maximum working voltage of the series resistor: small film resistors are commonly rated
     * 200 to 250 V (1206 chips about 200 V, 0.25 W leaded parts about 250 V; from memory, check the
     * data sheet). The lower figure is taken.
     */
    static final double DEFAULT_RESISTOR_MAX_VOLTS = 200.0;
    /**
     * Upper end of extra-low voltage for AC, volts RMS: IEC 61140 and the voltage bands of IEC 60449
     * put extra-low voltage at no more than 50 V AC RMS or 120 V ripple-free DC (from memory). The
     * probe does not know AC from DC, so the lower figure is used for both.
     */
    static final double EXTRA_LOW_VOLTAGE_AC_RMS = 50.0;
    /** Upper end of extra-low voltage for ripple-free DC, volts (IEC 61140 / IEC 60449, from memory). */
    static final double EXTRA_LOW_VOLTAGE_DC = 120.0;

    static final String HAZARD = String.join("\n",
            "HAZARDOUS VOLTAGE",
            "  - Above extra-low voltage (50 V AC RMS or 120 V ripple-free DC: IEC 61140 / IEC 60449 voltage bands,",
            "    from memory) the circuit can kill. This calculator does not make a home-made divider safe there.",
            "  - What decides safety is not the ratio: it is each resistor's maximum working voltage, the creepage",
            "    and clearance distances across the divider and its housing, insulation of everything a hand can touch,",
            "    and the measurement category (CAT) of the whole setup (IEC 61010-031 for probes, from memory).",
            "  - The right tool is a probe rated for the voltage and the category (a high-voltage or differential probe),",
            "    used as its maker instructs and as local codes and licensed practice require.");

    static final String CAUTIONS = String.join("\n",
            "Cautions",
            "  - Mains: a scope's ground lead is normally tied to protective earth. Clipping it to a mains-referenced",
            "    circuit shorts that point to earth. Use an isolated supply or a probe rated for the job, and follow",
            "    your local electrical codes and licensed practice; do not work on mains circuits without that training.",
            "  - The 50-ohm input: it takes only a few volts RMS and about half a watt (5 V RMS / 0.5 W are common",
            "    ratings, from memory; check your instrument). Overloading it can damage its termination for good.",
            "  - ESD: display flex cables and panel connectors are easily damaged by static. Discharge yourself and the",
            "    probe to the board's ground before touching them, and never hot-plug a panel.",
            "  - These figures are estimates from rules of thumb, not a safety assessment.");

    /** The command line: one subcommand per subject; every number takes SI prefixes and its unit. */
    static final ToolSpec SPEC = ToolSpec.builder("probe")
            .summary("probe calculator: divider probes for 50-ohm inputs, rise time and bandwidth, ground-lead resonance")
            .description("Designs and checks a resistive divider probe for a 50-ohm scope input, converts bandwidth to rise",
                    "time, and finds the resonance of a ground lead with the probe capacitance. Every result states its",
                    "assumptions; results that involve a voltage also print the safety cautions.")
            .subcommand(ToolSpec.builder("divider")
                    .summary("a resistive divider probe into a 50-ohm scope input")
                    .description("A resistive divider probe into a 50-ohm scope input: give the wanted --ratio (the series",
                            "resistor is computed and snapped to a series value) or a --resistor to check.")
                    .option(OptionSpec.number("ratio", "", null, 1.000001, 1e6, "wanted division ratio N (N:1)"), "N")
                    .option(OptionSpec.number("resistor", "ohm", null, 1e-3, 1e12, "series resistor to check, such as 4.7k"), "OHMS")
                    .option(OptionSpec.text("series", "E96", "IEC 60063 series to snap to: E12, E24 or E96"), "E12|E24|E96")
                    .option(OptionSpec.number("input-ohms", "ohm", 50.0, 1e-3, 1e9, "scope input resistance"), "OHMS")
                    .option(OptionSpec.number("source-ohms", "ohm", 50.0, 0.0, 1e12, "impedance of the probed source"), "OHMS")
                    .option(OptionSpec.number("level", "V", null, 0.0, 1e7, "signal at the tip, volts RMS (DC counts as RMS)"), "VRMS")
                    .option(OptionSpec.number("input-max-vrms", "V", DEFAULT_INPUT_MAX_VRMS, 1e-6, 1e6,
                            "scope input voltage rating (5 V RMS is from memory: check yours)"), "V")
                    .option(OptionSpec.number("input-max-watts", "W", DEFAULT_INPUT_MAX_WATTS, 1e-9, 1e6,
                            "scope input power rating (0.5 W is from memory: check yours)"), "W")
                    .option(OptionSpec.number("resistor-watts", "W", DEFAULT_RESISTOR_WATTS, 1e-6, 1e6,
                            "the series resistor's power rating"), "W")
                    .option(OptionSpec.number("resistor-max-volts", "V", DEFAULT_RESISTOR_MAX_VOLTS, 1e-3, 1e6,
                            "the series resistor's maximum working voltage (200 V is from memory for small film parts: "
                                    + "check the data sheet)"), "V")
                    .build())
            .subcommand(ToolSpec.builder("rise")
                    .summary("rise time from bandwidth and the correction of a measured rise time")
                    .required(OptionSpec.number("bandwidth", "Hz", null, 1.0, 1e13, "scope bandwidth, such as 500MHz"), "HZ")
                    .option(OptionSpec.number("probe-bandwidth", "Hz", null, 1.0, 1e13, "probe bandwidth"), "HZ")
                    .option(OptionSpec.number("measured", "s", null, 1e-15, 1e3, "measured 10-90 % rise time, such as 800ps"), "S")
                    .build())
            .subcommand(ToolSpec.builder("lead")
                    .summary("resonance of a ground lead with the probe capacitance")
                    .required(OptionSpec.number("length", "mm", null, 1e-3, 1e5, "lead length (mm, cm or m; a bare number is mm)"), "MM")
                    .option(OptionSpec.number("capacitance", "F", 10e-12, 1e-16, 1e-6, "probe input capacitance, such as 10pF"), "F")
                    .option(OptionSpec.number("bandwidth", "Hz", null, 1.0, 1e13,
                            "bandwidth you need: the longest lead that keeps clear of it"), "HZ")
                    .build())
            .footer("Numbers take SI prefixes and units: 4.7k, 450ohm, 1GHz, 800ps, 10pF, 100mm, 500mV.",
                    "Examples: docs/probe.md")
            .build();

    /** Creates the tool. */
    public ProbeTool() {
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        switch (args.command()) {
            case "divider" -> divider(args, console.out());
            case "rise" -> rise(args, console.out());
            case "lead" -> lead(args, console.out());
            default -> throw new OptionException("subject", "missing subject: expected divider, rise or lead");
        }
        return 0;
    }

    // ---------------------------------------------------------------------------------------- divider

    private static void divider(ToolArgs o, PrintStream out) {
        if (o.given("ratio") == o.given("resistor")) {
            throw new OptionException("ratio", "divider: give exactly one of --ratio N or --resistor OHMS");
        }
        double rin = o.number("input-ohms");
        double zs = o.number("source-ohms");
        double vmax = o.number("input-max-vrms");
        double pmax = o.number("input-max-watts");
        double prated = o.number("resistor-watts");
        double rmaxVolts = o.number("resistor-max-volts");
        double level = o.number("level");
        ESeries series;
        try {
            series = ESeries.parse(o.text("series"));
        } catch (IllegalArgumentException e) {
            throw new OptionException("series", "divider: option --series: " + e.getMessage());
        }
        double n = o.number("ratio");
        double given = o.number("resistor");
        out.println("Resistive divider probe into a " + ohms(rin) + " scope input");
        double r;
        if (o.given("ratio")) {
            double ideal = ProbeMath.seriesForRatio(n, rin);
            double[] s = series.snap(ideal);
            r = s[2];
            line(out, "wanted ratio", fmt(n) + ":1 -> ideal series resistor (n - 1) x " + ohms(rin) + " = " + ohms(ideal));
            if (s[0] == s[1]) {
                line(out, series + " (IEC 60063)", ohms(s[0]) + " is a series value");
            } else {
                line(out, series + " (IEC 60063)", ohms(s[0]) + " gives " + fmt(ProbeMath.ratio(s[0], rin)) + ":1, "
                        + ohms(s[1]) + " gives " + fmt(ProbeMath.ratio(s[1], rin)) + ":1; nearest: " + ohms(r));
            }
            double got = ProbeMath.ratio(r, rin);
            line(out, "division ratio", "(" + fmt(r) + " + " + fmt(rin) + ") / " + fmt(rin) + " = " + fmt(got) + ":1  ("
                    + signed((got / n - 1) * 100) + " % from " + fmt(n) + ":1)");
        } else {
            r = given;
            double[] s = series.snap(r);
            line(out, "series resistor", ohms(r) + (s[0] == s[1] ? " (an " + series + " value)" : " (not an " + series
                    + " value; neighbours " + ohms(s[0]) + " and " + ohms(s[1]) + ")"));
            line(out, "division ratio", "(" + fmt(r) + " + " + fmt(rin) + ") / " + fmt(rin) + " = " + fmt(ProbeMath.ratio(r, rin)) + ":1");
        }
        double load = ProbeMath.loading(r, rin);
        line(out, "DC loading", ohms(load) + "  (the circuit sees R + " + ohms(rin) + ")");
        double errFrac = ProbeMath.amplitudeError(r, rin, zs);
        line(out, "amplitude error", signed(errFrac * 100) + " % on a " + ohms(zs) + " source  (" + fmt(load) + " / ("
                + fmt(load) + " + " + fmt(zs) + ") = " + fmt(1 + errFrac) + ")");
        double ratio = ProbeMath.ratio(r, rin);
        double tipForV = vmax * ratio;
        double tipForP = Math.sqrt(pmax * rin) * ratio;
        double tipForR = load * Math.sqrt(0.5 * prated / r);
        double tipForRVolts = rmaxVolts * load / r;
        double tipLimit = Math.min(Math.min(tipForV, tipForP), Math.min(tipForR, tipForRVolts));
        line(out, "tip limits", "scope input reaches " + fmt(vmax) + " V RMS at " + fmt(tipForV) + " V RMS and " + fmt(pmax)
                + " W at " + fmt(tipForP) + " V RMS at the tip; the resistor reaches half its " + fmt(prated) + " W at "
                + fmt(tipForR) + " V RMS and its " + fmt(rmaxVolts) + " V working voltage at " + fmt(tipForRVolts) + " V RMS");
        line(out, "highest tip level", fmt(tipLimit) + " V RMS, the lowest of the limits above"
                + (tipLimit > EXTRA_LOW_VOLTAGE_AC_RMS ? "; above " + fmt(EXTRA_LOW_VOLTAGE_AC_RMS)
                + " V RMS it is not a safe level: see HAZARDOUS VOLTAGE" : ""));
        boolean hazardous = tipLimit > EXTRA_LOW_VOLTAGE_AC_RMS;
        if (!Double.isNaN(level)) {
            double i = ProbeMath.current(level, r, rin);
            double pr = i * i * r;
            double pin = i * i * rin;
            double vin = i * rin;
            double vr = i * r;
            line(out, "at " + fmt(level) + " V RMS", "current " + si(i, "A") + "; resistor " + si(pr, "W") + " and "
                    + si(vr, "V") + " RMS; scope input " + si(vin, "V") + " RMS and " + si(pin, "W"));
            String bigger = "use a larger ratio or an attenuator rated for the power";
            check(out, "scope input voltage", vin, vmax, "V RMS", bigger);
            check(out, "scope input power", pin, pmax, "W", bigger);
            check(out, "resistor power (derated to half)", pr, 0.5 * prated, "W", "use a resistor (or several in series) rated for it");
            check(out, "resistor working voltage", vr, rmaxVolts, "V RMS", "use resistors in series, each within its rating");
            if (level > EXTRA_LOW_VOLTAGE_AC_RMS) {
                hazardous = true;
                out.println("  HAZARDOUS: " + fmt(level) + " V RMS is above extra-low voltage (" + fmt(EXTRA_LOW_VOLTAGE_AC_RMS)
                        + " V AC RMS, " + fmt(EXTRA_LOW_VOLTAGE_DC) + " V DC); do not use a home-made divider: use a probe rated"
                        + " for the voltage and measurement category");
            }
        }
        out.println("Assumptions");
        out.println("  - ratio (R + R_in) / R_in and loading R + R_in (common practice); the scope input is a pure "
                + ohms(rin) + " to ground");
        out.println("  - DC and low frequency: the resistor's own capacitance and the tip capacitance lower the loading at high"
                + " frequency, and the resistor's tolerance adds to the ratio error");
        out.println("  - the source is linear with " + ohms(zs) + " output impedance" + (o.given("source-ohms") ? " (given)" : " (default)"));
        out.println("  - scope input limits " + fmt(vmax) + " V RMS and " + fmt(pmax) + " W" + (o.given("input-max-vrms")
                || o.given("input-max-watts") ? " (given)" : " (common 50-ohm input ratings, from memory: check your instrument)"));
        out.println("  - resistor rated " + fmt(prated) + " W and derated to half (common practice), working voltage "
                + fmt(rmaxVolts) + " V" + (o.given("resistor-max-volts") ? " (given)" : " (a common rating of small film resistors,"
                + " from memory: check the data sheet)"));
        out.println("  - series values from IEC 60063 (" + series + ")");
        if (hazardous) {
            out.println(HAZARD);
        }
        out.println(CAUTIONS);
    }

    private static void check(PrintStream out, String what, double value, double limit, String unit, String remedy) {
        if (value > limit) {
            out.println("  OVER LIMIT: " + what + " " + fmt(value) + " " + unit + " exceeds " + fmt(limit) + " " + unit
                    + ": do not connect; " + remedy);
        } else if (value >= NEAR * limit) {
            out.println("  WARNING: " + what + " " + fmt(value) + " " + unit + " is " + fmt(100 * value / limit)
                    + " % of its " + fmt(limit) + " " + unit + " rating");
        }
    }

    // ---------------------------------------------------------------------------------------- rise

    private static void rise(ToolArgs o, PrintStream out) {
        double bw = o.number("bandwidth");
        double pbw = o.number("probe-bandwidth");
        double meas = o.number("measured");
        out.println("Rise time from bandwidth");
        double ts = ProbeMath.riseFromBandwidth(bw);
        line(out, "scope " + si(bw, "Hz"), "10-90 % rise time about 0.35 / BW = " + si(ts, "s"));
        double sys = ts;
        if (!Double.isNaN(pbw)) {
            double tp = ProbeMath.riseFromBandwidth(pbw);
            sys = Math.hypot(ts, tp);
            line(out, "probe " + si(pbw, "Hz"), "about " + si(tp, "s"));
            line(out, "scope and probe", "sqrt(" + si(ts, "s") + "^2 + " + si(tp, "s") + "^2) = " + si(sys, "s"));
        }
        if (!Double.isNaN(meas)) {
            double c = Double.isNaN(pbw) ? ProbeMath.correctedRise(meas, ts) : ProbeMath.correctedRise(meas, ts, ProbeMath.riseFromBandwidth(pbw));
            if (Double.isNaN(c)) {
                line(out, "measured " + si(meas, "s"), "not slower than the instrument's own " + si(sys, "s")
                        + ": the signal may be faster than the instrument can show; no correction possible");
            } else {
                line(out, "measured " + si(meas, "s"), "the signal itself is about sqrt(" + si(meas, "s") + "^2 - "
                        + si(sys, "s") + "^2) = " + si(c, "s"));
                if (meas < 3 * sys) {
                    out.println("  note: the measurement is less than 3 x the instrument's rise time, so the result leans on the"
                            + " 0.35 rule; treat it as an estimate (common practice)");
                }
            }
        }
        out.println("Assumptions");
        out.println("  - rise time x bandwidth = 0.35 (common practice; ln(9)/(2 pi) = 0.3497 exactly for a single-pole response,"
                + " up to about 0.45 for instruments with a sharper roll-off, from memory)");
        out.println("  - rise times of parts in a chain add as the root of the sum of squares (common practice, for"
                + " Gaussian-like responses without overshoot)");
    }

    // ---------------------------------------------------------------------------------------- lead

    private static void lead(ToolArgs o, PrintStream out) {
        double mm = o.number("length");
        double c = o.number("capacitance");
        double bw = o.number("bandwidth");
        double l = ProbeMath.leadInductance(mm);
        double f = ProbeMath.resonance(l, c);
        out.println("Ground-lead resonance");
        line(out, "lead " + fmt(mm) + " mm", "about " + si(l, "H") + " at 1 nH/mm");
        line(out, "with " + si(c, "F"), "f = 1 / (2 pi sqrt(L C)) = " + si(f, "Hz"));
        line(out, "edges", "faster than about " + si(0.35 / f, "s") + " (0.35 / f) reach the resonance and will ring");
        if (!Double.isNaN(bw)) {
            double maxMm = ProbeMath.longestLead(2 * bw, c);
            line(out, "for " + si(bw, "Hz"), "keeping the resonance above " + si(2 * bw, "Hz") + " (twice the bandwidth) allows a lead of"
                    + " at most " + fmt(maxMm) + " mm" + (mm > maxMm ? "; this lead is too long" : "; this lead is short enough"));
        }
        out.println("Assumptions");
        out.println("  - a straight lead has about 1 nH per mm (common practice); a wide loop has more, a tight spring less");
        out.println("  - the lead and the probe capacitance form a series resonance f = 1 / (2 pi sqrt(L C)) (common practice)");
        out.println("  - probe capacitance " + si(c, "F") + (o.given("capacitance") ? " (given)"
                : " (default: a typical 10:1 passive probe, common practice, from memory)"));
        if (!Double.isNaN(bw)) {
            out.println("  - the factor of two between resonance and bandwidth is a working margin of this tool, not a standard");
        }
    }

    // ---------------------------------------------------------------------------------------- formatting

    private static void line(PrintStream out, String label, String text) {
        out.println(String.format(Locale.ROOT, "  %-20s %s", label, text));
    }

    static String fmt(double v) {
        if (v == 0) {
            return "0";
        }
        String s = String.format(Locale.ROOT, "%.4g", v);
        if (s.contains("e")) {
            return s;
        }
        if (s.contains(".")) {
            s = s.replaceFirst("0+$", "");
            if (s.endsWith(".")) {
                s = s.substring(0, s.length() - 1);
            }
        }
        return s;
    }

    private static String signed(double v) {
        return (v >= 0 ? "+" : "") + String.format(Locale.ROOT, "%.2f", v);
    }

    static String ohms(double v) {
        if (v >= 1e6) {
            return fmt(v / 1e6) + " Mohm";
        } else if (v >= 1e3) {
            return fmt(v / 1e3) + " kohm";
        }
        return fmt(v) + " ohm";
    }

    /** A value with an SI prefix, such as "159.2 MHz" or "700 ps". */
    static String si(double v, String unit) {
        if (v == 0 || !Double.isFinite(v)) {
            return fmt(v) + " " + unit;
        }
        String[] p = {"f", "p", "n", "u", "m", "", "k", "M", "G", "T"};
        int e = (int) Math.floor(Math.log10(Math.abs(v)) / 3);
        e = Math.max(-5, Math.min(4, e));
        return fmt(v / Math.pow(10, 3 * e)) + " " + p[e + 5] + unit;
    }
}
