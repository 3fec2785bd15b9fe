package org.lanesift.plugins.si;

import java.io.PrintStream;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.lanesift.plugin.Tool;

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

    private static final String USAGE = String.join("\n",
            "usage: lanesift probe SUBJECT [options]",
            "",
            "subjects:",
            "  divider   a resistive divider probe into a 50-ohm scope input",
            "            --ratio N | --resistor OHMS   wanted ratio (series R computed and snapped) or a resistor to check",
            "            --series E12|E24|E96          IEC 60063 series to snap to (default E96)",
            "            --input-ohms OHMS             scope input resistance (default 50)",
            "            --source-ohms OHMS            impedance of the probed source (default 50)",
            "            --level VRMS                  signal at the tip, volts RMS (DC counts as RMS)",
            "            --input-max-vrms V            scope input voltage rating (default 5, from memory: check yours)",
            "            --input-max-watts W           scope input power rating (default 0.5, from memory: check yours)",
            "            --resistor-watts W            the series resistor's rating (default 0.25)",
            "  rise      rise time from bandwidth and the correction of a measured rise time",
            "            --bandwidth HZ                scope bandwidth (required)",
            "            --probe-bandwidth HZ          probe bandwidth (optional)",
            "            --measured S                  measured 10-90 % rise time (optional)",
            "  lead      resonance of a ground lead with the probe capacitance",
            "            --length MM                   lead length (mm, cm or m; a bare number is mm)",
            "            --capacitance F               probe input capacitance (default 10pF)",
            "            --bandwidth HZ                bandwidth you need (optional): longest lead that keeps clear of it",
            "",
            "Numbers take SI prefixes and units: 4.7k, 450ohm, 1GHz, 800ps, 10pF, 100mm, 500mV.",
            "Examples: docs/probe.md");

    /** Creates the tool. */
    public ProbeTool() {
    }

    @Override
    public String name() {
        return "probe";
    }

    @Override
    public String summary() {
        return "probe calculator: divider probes for 50-ohm inputs, rise time and bandwidth, ground-lead resonance";
    }

    /** Bad command-line input; the message is the one line printed. */
    static final class UsageException extends Exception {
        private static final long serialVersionUID = 1L;

        UsageException(String message) {
            super(message);
        }
    }

    @Override
    public int run(String[] args, PrintStream out, PrintStream err) {
        try {
            if (args.length == 0) {
                throw new UsageException("missing subject: expected divider, rise or lead (see lanesift probe --help)");
            }
            if (args[0].equals("--help") || args[0].equals("-h") || args[0].equals("help")) {
                out.println(USAGE);
                return 0;
            }
            String subject = args[0];
            List<String> allowed = switch (subject) {
                case "divider" -> List.of("ratio", "resistor", "series", "input-ohms", "source-ohms", "level", "input-max-vrms",
                        "input-max-watts", "resistor-watts");
                case "rise" -> List.of("bandwidth", "probe-bandwidth", "measured");
                case "lead" -> List.of("length", "capacitance", "bandwidth");
                default -> throw new UsageException("unknown subject '" + subject + "': expected divider, rise or lead");
            };
            Map<String, String> o = new LinkedHashMap<>();
            for (int i = 1; i < args.length; i++) {
                String a = args[i];
                if (a.equals("--help") || a.equals("-h")) {
                    out.println(USAGE);
                    return 0;
                }
                if (!a.startsWith("--") || a.length() == 2) {
                    throw new UsageException(subject + ": unexpected argument '" + a + "': options start with --");
                }
                String name = a.substring(2);
                String value;
                int eq = name.indexOf('=');
                if (eq >= 0) {
                    value = name.substring(eq + 1);
                    name = name.substring(0, eq);
                } else {
                    if (i + 1 >= args.length) {
                        throw new UsageException(subject + ": option --" + name + " needs a value");
                    }
                    value = args[++i];
                }
                if (!allowed.contains(name)) {
                    throw new UsageException(subject + ": unknown option --" + name + "; options: --" + String.join(", --", allowed));
                }
                if (o.put(name, value) != null) {
                    throw new UsageException(subject + ": option --" + name + " given twice");
                }
            }
            switch (subject) {
                case "divider" -> divider(o, out);
                case "rise" -> rise(o, out);
                default -> lead(o, out);
            }
            return 0;
        } catch (UsageException e) {
            err.println("lanesift probe: " + e.getMessage());
            return 2;
        }
    }

    // ---------------------------------------------------------------------------------------- divider

    private static void divider(Map<String, String> o, PrintStream out) throws UsageException {
        if (o.containsKey("ratio") == o.containsKey("resistor")) {
            throw new UsageException("divider: give exactly one of --ratio N or --resistor OHMS");
        }
        double rin = qty(o, "input-ohms", "ohm", 50.0, 1e-3, 1e9);
        double zs = qty(o, "source-ohms", "ohm", 50.0, 0, 1e12);
        double vmax = qty(o, "input-max-vrms", "V", DEFAULT_INPUT_MAX_VRMS, 1e-6, 1e6);
        double pmax = qty(o, "input-max-watts", "W", DEFAULT_INPUT_MAX_WATTS, 1e-9, 1e6);
        double prated = qty(o, "resistor-watts", "W", DEFAULT_RESISTOR_WATTS, 1e-6, 1e6);
        double level = qty(o, "level", "V", Double.NaN, 0, 1e7);
        ESeries series;
        try {
            series = ESeries.parse(o.getOrDefault("series", "E96"));
        } catch (IllegalArgumentException e) {
            throw new UsageException("divider: option --series: " + e.getMessage());
        }
        double n = qty(o, "ratio", "", Double.NaN, 1.000001, 1e6);
        double given = qty(o, "resistor", "ohm", Double.NaN, 1e-3, 1e12);
        out.println("Resistive divider probe into a " + ohms(rin) + " scope input");
        double r;
        if (o.containsKey("ratio")) {
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
        line(out, "tip limits", "scope input reaches " + fmt(vmax) + " V RMS at " + fmt(tipForV) + " V RMS and " + fmt(pmax)
                + " W at " + fmt(tipForP) + " V RMS at the tip; the resistor reaches half its " + fmt(prated) + " W at "
                + fmt(tipForR) + " V RMS");
        if (!Double.isNaN(level)) {
            double i = ProbeMath.current(level, r, rin);
            double pr = i * i * r;
            double pin = i * i * rin;
            double vin = i * rin;
            line(out, "at " + fmt(level) + " V RMS", "current " + si(i, "A") + "; resistor " + si(pr, "W") + "; scope input "
                    + si(vin, "V") + " RMS and " + si(pin, "W"));
            String bigger = "use a larger ratio or an attenuator rated for the power";
            check(out, "scope input voltage", vin, vmax, "V RMS", bigger);
            check(out, "scope input power", pin, pmax, "W", bigger);
            check(out, "resistor power (derated to half)", pr, 0.5 * prated, "W", "use a resistor (or several in series) rated for it");
        }
        out.println("Assumptions");
        out.println("  - ratio (R + R_in) / R_in and loading R + R_in (common practice); the scope input is a pure "
                + ohms(rin) + " to ground");
        out.println("  - DC and low frequency: the resistor's own capacitance and the tip capacitance lower the loading at high"
                + " frequency, and the resistor's tolerance adds to the ratio error");
        out.println("  - the source is linear with " + ohms(zs) + " output impedance" + (o.containsKey("source-ohms") ? " (given)" : " (default)"));
        out.println("  - scope input limits " + fmt(vmax) + " V RMS and " + fmt(pmax) + " W" + (o.containsKey("input-max-vrms")
                || o.containsKey("input-max-watts") ? " (given)" : " (common 50-ohm input ratings, from memory: check your instrument)"));
        out.println("  - resistor rated " + fmt(prated) + " W and derated to half (common practice)");
        out.println("  - series values from IEC 60063 (" + series + ")");
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

    private static void rise(Map<String, String> o, PrintStream out) throws UsageException {
        if (!o.containsKey("bandwidth")) {
            throw new UsageException("rise: option --bandwidth HZ is required (such as --bandwidth 500MHz)");
        }
        double bw = qty(o, "bandwidth", "Hz", Double.NaN, 1, 1e13);
        double pbw = qty(o, "probe-bandwidth", "Hz", Double.NaN, 1, 1e13);
        double meas = qty(o, "measured", "s", Double.NaN, 1e-15, 1e3);
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

    private static void lead(Map<String, String> o, PrintStream out) throws UsageException {
        if (!o.containsKey("length")) {
            throw new UsageException("lead: option --length is required (such as --length 100mm)");
        }
        double mm = length(o.get("length"));
        double c = qty(o, "capacitance", "F", 10e-12, 1e-16, 1e-6);
        double bw = qty(o, "bandwidth", "Hz", Double.NaN, 1, 1e13);
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
        out.println("  - probe capacitance " + si(c, "F") + (o.containsKey("capacitance") ? " (given)"
                : " (default: a typical 10:1 passive probe, common practice, from memory)"));
        if (!Double.isNaN(bw)) {
            out.println("  - the factor of two between resonance and bandwidth is a working margin of this tool, not a standard");
        }
    }

    // ---------------------------------------------------------------------------------------- parsing

    private static final Pattern NUMBER = Pattern.compile("([+-]?(?:[0-9]+\\.?[0-9]*|\\.[0-9]+)(?:[eE][+-]?[0-9]+)?)\\s*([fpnuµmkMG]?)");

    /** Parses a number with an optional SI prefix and unit; a missing option gives {@code def}. */
    static double qty(Map<String, String> o, String name, String unit, double def, double min, double max) throws UsageException {
        String raw = o.get(name);
        if (raw == null) {
            return def;
        }
        double v = parse(raw, unit);
        if (Double.isNaN(v)) {
            throw new UsageException("option --" + name + ": expected a number" + (unit.isEmpty() ? "" : " in " + unit)
                    + " (SI prefixes allowed, such as " + example(unit) + "), got '" + raw + "'");
        }
        if (v < min || v > max) {
            throw new UsageException("option --" + name + ": " + raw + " is outside " + fmt(min) + " to " + fmt(max)
                    + (unit.isEmpty() ? "" : " " + unit));
        }
        return v;
    }

    static double parse(String raw, String unit) {
        String s = raw.trim();
        if (!unit.isEmpty()) {
            for (String u : aliases(unit)) {
                if (s.length() > u.length() && s.toLowerCase(Locale.ROOT).endsWith(u.toLowerCase(Locale.ROOT))) {
                    s = s.substring(0, s.length() - u.length()).trim();
                    break;
                }
            }
        }
        Matcher m = NUMBER.matcher(s);
        if (!m.matches()) {
            return Double.NaN;
        }
        double v = Double.parseDouble(m.group(1));
        double mult = switch (m.group(2)) {
            case "f" -> 1e-15;
            case "p" -> 1e-12;
            case "n" -> 1e-9;
            case "u", "µ" -> 1e-6;
            case "m" -> 1e-3;
            case "k" -> 1e3;
            case "M" -> 1e6;
            case "G" -> 1e9;
            default -> 1;
        };
        v *= mult;
        return Double.isFinite(v) ? v : Double.NaN;
    }

    private static List<String> aliases(String unit) {
        return switch (unit) {
            case "ohm" -> List.of("ohms", "ohm", "\u03a9");
            default -> List.of(unit);
        };
    }

    private static String example(String unit) {
        return switch (unit) {
            case "ohm" -> "4.7k";
            case "Hz" -> "500MHz";
            case "s" -> "800ps";
            case "F" -> "10pF";
            case "V" -> "3.3V";
            case "W" -> "0.25W";
            default -> "10";
        };
    }

    static double length(String raw) throws UsageException {
        String s = raw.trim().toLowerCase(Locale.ROOT);
        double scale = 1;
        if (s.endsWith("mm")) {
            s = s.substring(0, s.length() - 2);
        } else if (s.endsWith("cm")) {
            s = s.substring(0, s.length() - 2);
            scale = 10;
        } else if (s.endsWith("m")) {
            s = s.substring(0, s.length() - 1);
            scale = 1000;
        }
        double v;
        try {
            v = Double.parseDouble(s.trim()) * scale;
        } catch (NumberFormatException e) {
            throw new UsageException("option --length: expected a length such as 100mm, 10cm or 0.1m, got '" + raw + "'");
        }
        if (!(v > 0) || v > 1e5) {
            throw new UsageException("option --length: " + raw + " is outside 0 to 100 m");
        }
        return v;
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
