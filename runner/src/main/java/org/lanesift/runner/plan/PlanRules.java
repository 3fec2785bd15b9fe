package org.lanesift.runner.plan;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.unit.Quantity;

/**
 * The figures of a {@link CapturePlan} with the rule each comes from, and the channel set-ups
 * that can capture the link (docs/capture-planning.md, docs/fewer-channels.md).
 */
final class PlanRules {
    private static final String THUMB = "docs/reference-facts.md#probe-and-bench-rules-of-thumb";

    /**
     * One figure.
     *
     * @param name   stable key (JSON)
     * @param what   short label
     * @param number the value in {@code unit}
     * @param unit   unit symbol
     * @param rule   where it comes from
     */
    record Line(String name, String what, double number, String unit, String rule) {
        String value() {
            return unit.equals("samples") ? String.format(java.util.Locale.ROOT, "%.0f samples", number) : Quantity.format(number, unit);
        }
    }

    /**
     * One way to capture the link.
     *
     * @param name         the set-up
     * @param channels     instrument channels per acquisition
     * @param acquisitions acquisitions needed
     * @param limits       what it decodes and what it loses
     */
    record Setup(String name, int channels, int acquisitions, String limits) {
    }

    private PlanRules() {
    }

    static List<Line> lines(CapturePlan p) {
        List<Line> l = new ArrayList<>();
        l.add(new Line("unitIntervalS", "unit interval", p.unitIntervalS(), "s", p.kind() == LinkKind.PIXEL
                ? "pixel clock period / 7 (docs/reference-facts.md#pixel-link-clock-and-slot-mappings)"
                : "half the DDR clock period, data on both clock edges (docs/reference-facts.md#d-phy-levels-and-states)"));
        l.add(new Line("laneBitRate", "bit rate per lane", p.laneBitRate(), "bit/s", "1 / unit interval"));
        l.add(new Line("decodeRateHz", "sample rate to decode", p.decodeRateHz(), "S/s",
                "at least 2 samples per unit interval, Ts <= UI / 2 (docs/sampling-rate.md); a logic capture below it is refused"));
        l.add(new Line("riseTimeS", "rise time planned for", p.riseS(), "s", p.riseGiven() ? "given"
                : "the fastest 20-80 % edge the standard allows (docs/reference-facts.md#edge-rates-of-the-link-standards, from memory)"));
        l.add(new Line("passBandwidthHz", "bandwidth to pass the edge", p.passBandwidthHz(), "Hz",
                "0.35 / rise time (common practice, " + THUMB + ")"));
        l.add(new Line("measureBandwidthHz", "bandwidth to measure edges", p.measureBandwidthHz(), "Hz",
                "0.35 / (rise time / 3): an instrument a third as slow reads the edge about 5 % slow (rise times add as root"
                        + " sum of squares; common practice, " + THUMB + ")"));
        l.add(new Line("measureRateHz", "sample rate for edges and eyes", p.measureRateHz(), "S/s",
                "2.5 samples per hertz of the measuring bandwidth (common practice, " + THUMB + ")"));
        l.add(new Line("recordS", "record length", p.recordS(), "s",
                "(frames + 1) / frame rate: a capture starts anywhere inside a frame, so N complete frames need N + 1 periods"));
        l.add(new Line("recordSamplesDecode", "record at the decode rate", p.recordSamples(p.decodeRateHz()), "samples",
                "record length x sample rate to decode, per channel"));
        l.add(new Line("recordSamplesMeasure", "record at the edge rate", p.recordSamples(p.measureRateHz()), "samples",
                "record length x sample rate for edges and eyes, per channel"));
        return l;
    }

    static List<Setup> setups(CapturePlan p) {
        int n = p.signals();
        List<Setup> s = new ArrayList<>();
        s.add(new Setup("both legs of every pair (analog)", 2 * n, 1,
                "decodes and measures everything: leg skew, differential swing (VOD), common mode, edges, eyes"));
        s.add(new Setup("differential probes, one per pair", n, 1,
                "decodes and measures differential edges and eyes; loses leg skew and common mode"));
        s.add(new Setup("P legs only (analog, differential mode single)", n, 1,
                "decodes; loses leg skew, VOD and common mode (one leg cannot show them); edges and eyes are those of one leg"));
        if (p.kind() == LinkKind.PIXEL) {
            s.add(new Setup("logic analyser, threshold about 1.2 V on the P legs", n, 1,
                    "decodes at " + Quantity.format(p.decodeRateHz(), "S/s") + " or more; keeps no levels, edges or eyes; edge"
                            + " times are quantised to the sample period"));
            s.add(new Setup("two channels: the clock and one lane per acquisition (capture set)", 2, p.lanes(),
                    "the picture must repeat; the lane carrying the sync bits is in every acquisition and aligns them;"
                            + " anything that changes between acquisitions is lost"));
        } else {
            s.add(new Setup("fewer channels than signals", 0, 0, "not planned: a logic analyser cannot follow the high-speed"
                    + " swing around its low common mode, and packet traffic does not repeat for a capture set"));
        }
        return s;
    }
}
