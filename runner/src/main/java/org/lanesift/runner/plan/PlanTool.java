package org.lanesift.runner.plan;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.json.JsonWriter;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.runner.capture.Inspector;
import org.lanesift.unit.Quantity;

/**
 * {@code lanesift plan}: before a capture, what it needs (unit interval, sample rates, bandwidth,
 * record length, channels and the fewer-channel ways); after it, with {@code --capture}, whether
 * the capture meets the same rules (read by {@code inspect}'s code). Rules in docs/capture-planning.md.
 */
public final class PlanTool implements Tool {
    /** Exit status when a capture fails a rule it needs for decoding. */
    public static final int EXIT_FAILS = 3;

    static final ToolSpec SPEC = ToolSpec.builder("plan")
            .summary("what a capture of a link needs (sample rate, bandwidth, record length, channels), and whether one meets it")
            .description("Takes a link description and works out, each figure with its rule: the unit interval, the least",
                    "sample rate to decode (2 samples per unit interval), the bandwidth and sample rate to measure edges and",
                    "eyes (0.35 / rise time; a third of the rise time; 2.5 samples per hertz), the record length for N",
                    "frames, the channels needed and the ways to capture with fewer. With --capture FILE it checks that",
                    "capture against the same rules. See docs/capture-planning.md.")
            .option(OptionSpec.choice("link", "pixel", "link kind: pixel (7:1 LVDS) or packet (D-PHY high speed)", "pixel", "packet"),
                    "KIND")
            .required(OptionSpec.number("clock", "Hz", null, 1e3, 1e11, "the forwarded clock: pixel clock (pixel link) or"
                    + " DDR clock (packet link), such as 25MHz"), "HZ")
            .option(OptionSpec.integer("lanes", 3L, 1, 16, "data lanes"), "N")
            .option(OptionSpec.integer("frames", 1L, 1, 1000, "complete frames wanted"), "N")
            .option(OptionSpec.number("frame-rate", "Hz", 60.0, 0.01, 1e6, "frames per second of the picture"), "HZ")
            .option(OptionSpec.number("rise-time", "s", 0.0, 0.0, 1e-3, "rise time (20 to 80 percent) to plan for;"
                    + " 0 = the fastest the link's standard allows"), "SECONDS")
            .option(OptionSpec.text("capture", "", "a capture to check against the plan"), "FILE")
            .flag("json", "print the plan (and the checks) as JSON")
            .footer("Exit codes: 0 planned (and the capture meets every rule it needs);",
                    "3 the capture fails a rule; 2 bad input; 1 internal error.",
                    "",
                    "Safety: a scope's ground lead is earthed: never clip it to a",
                    "mains-referenced circuit; a 50-ohm input has a voltage and power",
                    "limit (check the instrument's rating); display flex cables need ESD",
                    "precautions. Follow local codes and licensed practice (README, Safety).")
            .build();

    /** Creates the tool (ServiceLoader). */
    public PlanTool() {
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        LinkKind kind = LinkKind.valueOf(args.text("link").toUpperCase(Locale.ROOT));
        double rise = args.number("rise-time");
        CapturePlan plan = rise > 0
                ? new CapturePlan(kind, args.number("clock"), (int) args.integer("lanes", 3), (int) args.integer("frames", 1),
                        args.number("frame-rate"), rise, true)
                : CapturePlan.of(kind, args.number("clock"), (int) args.integer("lanes", 3), (int) args.integer("frames", 1),
                        args.number("frame-rate"));
        List<CaptureCheck.Result> checks = List.of();
        InspectReport report = null;
        String capture = args.text("capture");
        if (!capture.isEmpty()) {
            Path file = Path.of(capture);
            if (!Files.isRegularFile(file)) {
                throw new OptionException("capture", "--capture " + capture + ": no such file (expected a capture: .csv, .vcd,"
                        + " raw or packed logic binary with a .json sidecar)");
            }
            report = Inspector.inspect(file, Map.of());
            checks = CaptureCheck.check(plan, report);
        }
        if (args.flag("json")) {
            console.out().print(json(plan, report, checks));
        } else if (!console.quiet()) {
            console.out().print(text(plan, report, checks));
        }
        return checks.stream().anyMatch(c -> c.verdict() == CaptureCheck.Verdict.FAILS) ? EXIT_FAILS : 0;
    }

    static String text(CapturePlan p, InspectReport report, List<CaptureCheck.Result> checks) {
        StringBuilder sb = new StringBuilder();
        sb.append(p.kind().text).append(", clock ").append(Quantity.format(p.clockHz(), "Hz")).append(", ").append(p.lanes())
                .append(" data lane").append(p.lanes() == 1 ? "" : "s").append('\n');
        for (PlanRules.Line l : PlanRules.lines(p)) {
            sb.append(String.format(Locale.ROOT, "  %-30s %s%n      rule: %s%n", l.what(), l.value(), l.rule()));
        }
        sb.append("channels\n");
        for (PlanRules.Setup s : PlanRules.setups(p)) {
            sb.append("  ").append(s.name()).append(": ").append(s.channels()).append(" channel").append(s.channels() == 1 ? "" : "s")
                    .append(s.acquisitions() > 1 ? " x " + s.acquisitions() + " acquisitions" : "").append("\n      ")
                    .append(s.limits()).append('\n');
        }
        if (report != null) {
            sb.append("capture ").append(report.file()).append(" (").append(report.format()).append(")\n");
            for (CaptureCheck.Result c : checks) {
                sb.append(String.format(Locale.ROOT, "  %-11s %s: %s%n", c.verdict().name().toLowerCase(Locale.ROOT).replace('_', ' '),
                        c.rule(), c.detail()));
            }
        }
        sb.append("Safety: probing means touching live circuits. A scope's ground is earthed (never on a mains-referenced\n"
                + "circuit), a 50-ohm input has a voltage and power limit, display flex cables need ESD care. Follow local\n"
                + "codes and licensed practice.\n");
        return sb.toString();
    }

    static String json(CapturePlan p, InspectReport report, List<CaptureCheck.Result> checks) {
        JsonWriter w = JsonWriter.pretty().beginObject();
        w.field("format", "lanesift-plan/1").field("link", p.kind().name().toLowerCase(Locale.ROOT));
        w.field("clockHz", p.clockHz()).field("lanes", p.lanes()).field("frames", p.frames()).field("frameRateHz", p.frameRateHz());
        w.field("riseTimeS", p.riseS()).field("riseTimeSource", p.riseGiven() ? "given"
                : "standard: docs/reference-facts.md#edge-rates-of-the-link-standards");
        w.name("figures").beginArray();
        for (PlanRules.Line l : PlanRules.lines(p)) {
            w.beginObject().field("name", l.name()).field("value", l.number()).field("unit", l.unit()).field("rule", l.rule()).endObject();
        }
        w.endArray();
        w.name("setups").beginArray();
        for (PlanRules.Setup s : PlanRules.setups(p)) {
            w.beginObject().field("name", s.name()).field("channels", s.channels()).field("acquisitions", s.acquisitions())
                    .field("limits", s.limits()).endObject();
        }
        w.endArray();
        if (report != null) {
            w.field("capture", report.file());
            w.name("checks").beginArray();
            for (CaptureCheck.Result c : checks) {
                w.beginObject().field("rule", c.rule()).field("verdict", c.verdict().name().toLowerCase(Locale.ROOT))
                        .field("detail", c.detail()).endObject();
            }
            w.endArray();
        }
        return w.endObject().toString() + "\n";
    }
}
