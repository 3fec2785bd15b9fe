package org.lanesift.runner.plan;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.unit.Quantity;

/**
 * Checks a capture, as {@code inspect} summarised it, against the rules of a {@link CapturePlan}:
 * sample rate to decode, sample rate to measure edges and eyes, record length, channels, and the
 * clock frequency found against the one given.
 */
final class CaptureCheck {
    /** Relative difference within which a clock found in the capture is the link's clock. */
    static final double CLOCK_TOLERANCE = 0.01;

    /** How a rule came out. */
    enum Verdict {
        /** The capture meets the rule. */
        MEETS,
        /** The capture does not meet a rule it needs for decoding. */
        FAILS,
        /** The capture decodes, but a measurement from it will be limited. */
        LIMITS,
        /** The capture holds nothing the rule can be judged on. */
        NOT_JUDGED
    }

    /**
     * One rule applied.
     *
     * @param rule    what is checked, short
     * @param verdict how it came out
     * @param detail  the figures and what follows from them
     */
    record Result(String rule, Verdict verdict, String detail) {
    }

    private CaptureCheck() {
    }

    static List<Result> check(CapturePlan plan, InspectReport report) {
        List<Result> out = new ArrayList<>();
        double lowest = Double.POSITIVE_INFINITY;
        String lowestName = null;
        boolean anyAnalog = false;
        double lowestAnalog = Double.POSITIVE_INFINITY;
        double longestS = 0;
        int signals = 0;
        for (InspectReport.Channel c : report.channels()) {
            if (c.kind().equals("WORDS")) {
                continue;
            }
            signals++;
            longestS = Math.max(longestS, c.durationS());
            if (c.sampleRateHz() != null && c.sampleRateHz() < lowest) {
                lowest = c.sampleRateHz();
                lowestName = c.name();
            }
            if (c.kind().equals("ANALOG") && c.sampleRateHz() != null) {
                anyAnalog = true;
                lowestAnalog = Math.min(lowestAnalog, c.sampleRateHz());
            }
        }
        double ui = plan.unitIntervalS();
        if (lowestName == null) {
            out.add(new Result("sample rate to decode", Verdict.NOT_JUDGED, "the channels are edge lists without a sample rate;"
                    + " the sampler checks a logic capture's grid itself (docs/sampling-rate.md)"));
        } else {
            double perUi = lowest * ui;
            out.add(new Result("sample rate to decode", lowest >= plan.decodeRateHz() ? Verdict.MEETS : Verdict.FAILS,
                    String.format(Locale.ROOT, "%s (channel %s) gives %.2f samples per unit interval of %s; at least %.0f needed,"
                            + " so at least %s (docs/sampling-rate.md)", Quantity.format(lowest, "S/s"), lowestName, perUi,
                            Quantity.format(ui, "s"), CapturePlan.DECODE_SAMPLES_PER_UI, Quantity.format(plan.decodeRateHz(), "S/s"))));
        }
        if (!anyAnalog) {
            out.add(new Result("sample rate to measure edges and eyes", Verdict.NOT_JUDGED,
                    "no analog channel: a logic capture keeps no edge shape, so rise times and eyes cannot be measured from it"));
        } else {
            out.add(new Result("sample rate to measure edges and eyes", lowestAnalog >= plan.measureRateHz() ? Verdict.MEETS : Verdict.LIMITS,
                    String.format(Locale.ROOT, "%s against %s (2.5 samples per hertz of %s, the bandwidth that reads a %s edge"
                            + " within about 5 %%; docs/reference-facts.md#probe-and-bench-rules-of-thumb)",
                            Quantity.format(lowestAnalog, "S/s"), Quantity.format(plan.measureRateHz(), "S/s"),
                            Quantity.format(plan.measureBandwidthHz(), "Hz"), Quantity.format(plan.riseS(), "s"))));
        }
        out.add(new Result("record length", longestS >= plan.recordS() ? Verdict.MEETS : Verdict.FAILS,
                String.format(Locale.ROOT, "%s recorded; %d complete frame%s at %s need %s (frames + 1 frame periods)",
                        Quantity.format(longestS, "s"), plan.frames(), plan.frames() == 1 ? "" : "s",
                        Quantity.format(plan.frameRateHz(), "Hz"), Quantity.format(plan.recordS(), "s"))));
        int need = plan.signals();
        String how = signals >= 2 * need ? "enough for both legs of every pair"
                : signals >= need ? "enough for one signal per lane (P legs only, differential probes or logic inputs)"
                : "fewer than the link's " + need + " signals: capture the lanes in several acquisitions sharing one lane and"
                        + " assemble them (a capture set, docs/capture-set.md)";
        out.add(new Result("channels", signals >= need ? Verdict.MEETS : Verdict.FAILS,
                signals + " channel" + (signals == 1 ? "" : "s") + " for a clock and " + plan.lanes() + " data lane"
                        + (plan.lanes() == 1 ? "" : "s") + ": " + how));
        out.add(clock(plan, report));
        return out;
    }

    private static Result clock(CapturePlan plan, InspectReport report) {
        if (report.clocks().isEmpty()) {
            return new Result("clock", Verdict.NOT_JUDGED, "inspect found no channel with a regular period");
        }
        InspectReport.Clock best = null;
        for (InspectReport.Clock c : report.clocks()) {
            if (best == null || Math.abs(c.frequencyHz() - plan.clockHz()) < Math.abs(best.frequencyHz() - plan.clockHz())) {
                best = c;
            }
        }
        double rel = Math.abs(best.frequencyHz() - plan.clockHz()) / plan.clockHz();
        return new Result("clock", rel <= CLOCK_TOLERANCE ? Verdict.MEETS : Verdict.FAILS,
                String.format(Locale.ROOT, "%s shows %s, %s the %s given (within %.0f %% counts)", best.channel(),
                        Quantity.format(best.frequencyHz(), "Hz"), rel <= CLOCK_TOLERANCE ? "matching" : "not",
                        Quantity.format(plan.clockHz(), "Hz"), 100 * CLOCK_TOLERANCE));
    }
}
