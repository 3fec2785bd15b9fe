package org.lanesift.plugins.si;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.lanesift.kit.SampleStats;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.DataKind;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * Plugin {@code edge-metrics}: per transition of an analog signal the 10-90 % and 20-80 % rise and
 * fall times, overshoot (after rising edges) and undershoot (after falling edges) in percent of
 * the swing, and the settling time from the 50 % crossing into a band around the final level; the
 * distributions over the capture go to {@code <id>-edges.json} and a histogram picture
 * {@code <id>-edges.png}.
 */
public final class EdgeMetricsPlugin implements PluginProvider {
    static final String ID = "edge-metrics";
    static final int KEEP = 1 << 20;
    static final int BINS = 40;
    /** Default settling band, percent of the swing. */
    static final double DEFAULT_SETTLING_PERCENT = 5.0;

    static final OptionSpec LEVELS = OptionSpec.numbers("levelsVolts", "V",
            "the two levels [low, high] in volts; empty = the histogram modes of the first levelSamples samples");
    static final OptionSpec LEVEL_SAMPLES = OptionSpec.integer("levelSamples", 262_144L, 1_000, 1L << 26,
            "samples used to find the levels when levelsVolts is not given");

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Edge metrics")
            .description("Rise and fall times (10-90 % and 20-80 %), overshoot, undershoot and settling time of every "
                    + "transition, with their distributions over the capture.")
            .option(LEVELS)
            .option(LEVEL_SAMPLES)
            .option(OptionSpec.number("settlingPercent", "%", DEFAULT_SETTLING_PERCENT, 0.1, 9.0,
                    "half-width of the settling band around the final level, percent of the swing"))
            .option(OptionSpec.bool("annotateEdges", false, "emit one annotation per edge (many on a long capture)"))
            .input(PortSpec.of("signal", DataKind.ANALOG, "the signal, volts"))
            .output(PortSpec.of("files", DataKind.ARTIFACT, "<id>-edges.json and <id>-edges.png"))
            .build();

    /** Creates the provider. */
    public EdgeMetricsPlugin() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext ctx) {
        return new MetricsStage(ctx);
    }

    /** The running instance. */
    static final class MetricsStage extends LevelStage {
        private final double settleFraction;
        private final boolean annotateEdges;
        private final SampleStats rise1090 = new SampleStats("ps", KEEP);
        private final SampleStats rise2080 = new SampleStats("ps", KEEP);
        private final SampleStats fall1090 = new SampleStats("ps", KEEP);
        private final SampleStats fall2080 = new SampleStats("ps", KEEP);
        private final SampleStats overshoot = new SampleStats("%", KEEP);
        private final SampleStats undershoot = new SampleStats("%", KEEP);
        private final SampleStats settleRise = new SampleStats("ps", KEEP);
        private final SampleStats settleFall = new SampleStats("ps", KEEP);
        private long unsettled;
        private long truncated;
        private EdgeTracker tracker;

        MetricsStage(StageContext ctx) {
            super(ctx, ID);
            settleFraction = ctx.options().getDouble("settlingPercent") / 100;
            annotateEdges = ctx.options().getBoolean("annotateEdges");
        }

        @Override
        EdgeTracker tracker(Levels levels) {
            tracker = new EdgeTracker(levels, settleFraction, 0, this::edge);
            return tracker;
        }

        private void edge(EdgeTracker.Edge e) {
            if (e.truncated()) {
                truncated++;
            }
            double t = e.transitionFs() / 1000;
            double t2 = e.transition2080Fs() / 1000;
            double st = e.settlingFs() / 1000;
            (e.rising() ? rise1090 : fall1090).add(t);
            (e.rising() ? rise2080 : fall2080).add(t2);
            (e.rising() ? overshoot : undershoot).add(e.overshootPct());
            if (Double.isNaN(st)) {
                unsettled++;
            } else {
                (e.rising() ? settleRise : settleFall).add(st);
            }
            if (annotateEdges) {
                ctx.annotate(Annotation.on(ctx.instanceId(), e.rising() ? "rising-edge" : "falling-edge")
                        .span(Math.round(e.cross()[0]), Math.round(e.cross()[4]))
                        .label(String.format(Locale.ROOT, "%s %.1f ps, %s %.1f %%", e.rising() ? "rise" : "fall", t,
                                e.rising() ? "overshoot" : "undershoot", e.overshootPct()))
                        .number("transition1090Ps", t, "ps")
                        .number("transition2080Ps", t2, "ps")
                        .number(e.rising() ? "overshootPct" : "undershootPct", e.overshootPct(), "%")
                        .number("settlingPs", st, "ps")
                        .build());
            }
        }

        @Override
        void done(Levels lv) {
            String id = ctx.instanceId();
            JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull().beginObject();
            j.field("instance", id);
            j.field("plugin", ID);
            j.field("channel", channel);
            j.field("samples", samples);
            Sourced.of(periodFs / 1000, "ps", Source.given("the capture's sample rate")).field(j, "samplePeriodPs");
            boolean found = ctx.options().getNumbers("levelsVolts").isEmpty();
            Source levels = found ? Source.measured("histogram modes of the first samples") : Source.given("option levelsVolts");
            Sourced.of(lv.lowVolts, "V", levels).field(j, "lowLevelVolts");
            Sourced.of(lv.highVolts, "V", levels).field(j, "highLevelVolts");
            j.field("levelsFrom", found ? "histogram modes of the first samples" : "option levelsVolts");
            Sourced.of(settleFraction * 100, "%", settleFraction * 100 == DEFAULT_SETTLING_PERCENT
                    ? Source.assumed("a 5 % settling band, common practice") : Source.given("option settlingPercent"))
                    .field(j, "settlingBandPercent");
            j.field("risingEdges", rise1090.count());
            j.field("fallingEdges", fall1090.count());
            j.field("incompleteTransitions", tracker.incomplete());
            j.field("unsettledEdges", unsettled);
            j.field("edgesCutByCaptureEnd", truncated);
            j.field("definitions", "rise/fall: last crossings of the 10/20/80/90 % levels, linearly interpolated; "
                    + "overshoot: extreme beyond the arrival level before the next transition leaves, % of swing; "
                    + "settling: from the 50 % crossing to the last entry into the band");
            rise1090.write(j, "rise1090", BINS, 1.0);
            rise2080.write(j, "rise2080", BINS, 1.0);
            fall1090.write(j, "fall1090", BINS, 1.0);
            fall2080.write(j, "fall2080", BINS, 1.0);
            overshoot.write(j, "overshoot", BINS, 1.0);
            undershoot.write(j, "undershoot", BINS, 1.0);
            settleRise.write(j, "settlingAfterRise", BINS, 1.0);
            settleFall.write(j, "settlingAfterFall", BINS, 1.0);
            j.endObject();
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-edges.json", "application/json", (j.finish() + "\n").getBytes(StandardCharsets.UTF_8)));
            List<Plot.Panel> panels = new ArrayList<>();
            panels.add(new Plot.Panel(summary("rise 10-90 %", rise1090), "rise time 10-90 % (ps)", rise1090.histogram(BINS, 1.0), 1));
            panels.add(new Plot.Panel(summary("fall 90-10 %", fall1090), "fall time 90-10 % (ps)", fall1090.histogram(BINS, 1.0), 1));
            panels.add(new Plot.Panel(summary("overshoot after rising edges", overshoot), "overshoot (% of swing)", overshoot.histogram(BINS, 1.0), 1));
            panels.add(new Plot.Panel(summary("undershoot after falling edges", undershoot), "undershoot (% of swing)", undershoot.histogram(BINS, 1.0), 1));
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-edges.png", "image/png",
                    Plot.histograms("edge metrics of " + channel + ": " + rise1090.count() + " rising, "
                            + fall1090.count() + " falling edges", panels)));
            ctx.annotate(Annotation.on(id, "edge-summary").span(firstFs, lastFs)
                    .label(String.format(Locale.ROOT, "rise %.1f ps, fall %.1f ps, overshoot %.1f %%", rise1090.mean(),
                            fall1090.mean(), overshoot.mean()))
                    .number("rise1090MeanPs", rise1090.mean(), "ps")
                    .number("fall1090MeanPs", fall1090.mean(), "ps")
                    .number("overshootMeanPct", overshoot.mean(), "%")
                    .number("undershootMeanPct", undershoot.mean(), "%")
                    .field("edges", org.lanesift.annotation.Field.integer(rise1090.count() + fall1090.count(), ""))
                    .build());
            if (rise1090.count() + fall1090.count() == 0) {
                ctx.annotate(Annotation.on(id, "no-edges").span(firstFs, lastFs).severity(Severity.WARNING)
                        .label("no complete transitions between " + fmtV(lv.lowVolts) + " and " + fmtV(lv.highVolts)).build());
            }
        }

        private static String summary(String what, SampleStats d) {
            return String.format(Locale.ROOT, "%s: n = %d, mean %.4g, sd %.3g, min %.4g, max %.4g %s", what, d.count(),
                    d.mean(), d.std(), d.min(), d.max(), d.unit());
        }

        private static String fmtV(double v) {
            return String.format(Locale.ROOT, "%.3f V", v);
        }
    }
}
