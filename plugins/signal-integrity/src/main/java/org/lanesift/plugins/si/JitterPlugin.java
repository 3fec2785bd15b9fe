package org.lanesift.plugins.si;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.lanesift.kit.SampleStats;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Plugin {@code jitter}: the time-interval error (TIE) of clock edges against an ideal clock fitted
 * by least squares (a straight line through edge time against edge number; missing edges are
 * detected from the median period and skipped in the numbering), period jitter and cycle-to-cycle
 * jitter, each with RMS, peak-to-peak and a histogram. Writes {@code <id>-jitter.json} and
 * {@code <id>-jitter.png}. Times in the report are picoseconds.
 */
public final class JitterPlugin implements PluginProvider {
    static final String ID = "jitter";
    static final int BINS = 50;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Jitter")
            .description("Time-interval error against a least-squares ideal clock, period and cycle-to-cycle jitter, "
                    + "with RMS, peak-to-peak and histograms.")
            .option(OptionSpec.choice("edge", "rising", "which edges are clock edges", "rising", "falling", "both"))
            .option(OptionSpec.integer("maxEdges", 4_000_000L, 3, 50_000_000,
                    "edges analysed at most (8 bytes each); later edges are counted but not analysed"))
            .input(PortSpec.of("clock", DataKind.EDGES, "clock edges"))
            .output(PortSpec.of("files", DataKind.ARTIFACT, "<id>-jitter.json and <id>-jitter.png"))
            .build();

    /** Creates the provider. */
    public JitterPlugin() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext ctx) {
        return new JitterStage(ctx);
    }

    /**
     * The result of {@link #analyse}.
     *
     * @param edges        edges analysed
     * @param periodFs     fitted ideal period
     * @param gaps         places where edges were missing (numbering skipped)
     * @param tie          TIE distribution, ps
     * @param period       period distribution, ps (consecutive edges only)
     * @param cycleToCycle difference of consecutive periods, ps
     */
    record Result(int edges, double periodFs, long gaps, SampleStats tie, SampleStats period, SampleStats cycleToCycle) {
        /** RMS of the TIE about zero (the least-squares line makes its mean zero). */
        double tieRmsPs() {
            return Math.hypot(tie.mean(), tie.std());
        }

        double c2cRmsPs() {
            return Math.hypot(cycleToCycle.mean(), cycleToCycle.std());
        }
    }

    /**
     * Analyses sorted edge times.
     *
     * @param t times, femtoseconds, increasing
     * @param n how many
     * @return the result
     */
    static Result analyse(long[] t, int n) {
        int keep = Math.min(n, 1 << 20);
        SampleStats tie = new SampleStats("ps", keep);
        SampleStats period = new SampleStats("ps", keep);
        SampleStats c2c = new SampleStats("ps", keep);
        if (n < 3) {
            return new Result(n, Double.NaN, 0, tie, period, c2c);
        }
        int m = Math.min(n - 1, 100_001);
        long[] d = new long[m];
        for (int i = 0; i < m; i++) {
            d[i] = t[i + 1] - t[i];
        }
        Arrays.sort(d);
        double nominal = d[m / 2];
        if (!(nominal > 0)) {
            nominal = 1;
        }
        // edge numbers, skipping missing edges
        long[] k = new long[n];
        long gaps = 0;
        for (int i = 1; i < n; i++) {
            long step = Math.max(1, Math.round((t[i] - t[i - 1]) / nominal));
            if (step > 1) {
                gaps++;
            }
            k[i] = k[i - 1] + step;
        }
        // least squares t - t0 = a + b k, centred for accuracy
        double mk = 0;
        double mt = 0;
        for (int i = 0; i < n; i++) {
            mk += k[i];
            mt += (double) (t[i] - t[0]);
        }
        mk /= n;
        mt /= n;
        double skk = 0;
        double skt = 0;
        for (int i = 0; i < n; i++) {
            double dk = k[i] - mk;
            skk += dk * dk;
            skt += dk * ((double) (t[i] - t[0]) - mt);
        }
        double b = skt / skk;
        for (int i = 0; i < n; i++) {
            double ideal = mt + b * (k[i] - mk);
            tie.add(((double) (t[i] - t[0]) - ideal) / 1000);
        }
        double prevPeriod = Double.NaN;
        for (int i = 1; i < n; i++) {
            if (k[i] - k[i - 1] != 1) {
                prevPeriod = Double.NaN;
                continue;
            }
            double p = (t[i] - t[i - 1]) / 1000.0;
            period.add(p);
            if (!Double.isNaN(prevPeriod)) {
                c2c.add(p - prevPeriod);
            }
            prevPeriod = p;
        }
        return new Result(n, b, gaps, tie, period, c2c);
    }

    /** The running instance. */
    static final class JitterStage implements Stage {
        private final StageContext ctx;
        private final String which;
        private final int maxEdges;
        private long[] times = new long[4096];
        private int n;
        private long ignored;
        private long firstFs = Long.MAX_VALUE;
        private long lastFs = Long.MIN_VALUE;
        private String channel = "clock";

        JitterStage(StageContext ctx) {
            this.ctx = ctx;
            which = ctx.options().getString("edge");
            maxEdges = ctx.options().getInt("maxEdges");
        }

        @Override
        public void accept(int input, Block block) {
            Edges e = (Edges) block;
            channel = e.channel();
            firstFs = Math.min(firstFs, e.startFs());
            lastFs = Math.max(lastFs, e.endFs());
            for (int i = 0; i < e.count(); i++) {
                boolean rising = e.levelAfter(i);
                if (which.equals("rising") && !rising || which.equals("falling") && rising) {
                    continue;
                }
                long t = e.timesFs()[i];
                if (n > 0 && t <= times[n - 1]) {
                    continue; // not after the previous edge (blocks overlapping): the list must stay increasing
                }
                if (e.isUnknownAt(t)) {
                    continue;
                }
                if (n == maxEdges) {
                    ignored++;
                    continue;
                }
                if (n == times.length) {
                    times = Arrays.copyOf(times, (int) Math.min(maxEdges, 2L * times.length));
                }
                times[n++] = t;
            }
        }

        @Override
        public void finish() {
            String id = ctx.instanceId();
            Result r = analyse(times, n);
            if (firstFs == Long.MAX_VALUE) {
                firstFs = 0;
                lastFs = 0;
            }
            JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull().beginObject();
            j.field("instance", id);
            j.field("plugin", ID);
            j.field("channel", channel);
            j.field("edge", which);
            j.field("edgesAnalysed", n);
            j.field("edgesNotAnalysed", ignored);
            j.field("missingEdgePlaces", r.gaps());
            j.field("idealPeriodPs", r.periodFs() / 1000);
            j.field("idealFrequencyHz", 1e15 / r.periodFs());
            j.field("tieRmsPs", r.tieRmsPs());
            j.field("tiePeakToPeakPs", r.tie().peakToPeak());
            j.field("periodMeanPs", r.period().mean());
            j.field("periodJitterRmsPs", r.period().std());
            j.field("periodJitterPeakToPeakPs", r.period().peakToPeak());
            j.field("cycleToCycleRmsPs", r.c2cRmsPs());
            j.field("cycleToCyclePeakToPeakPs", r.cycleToCycle().peakToPeak());
            j.field("definitions", "TIE: edge time minus a least-squares line through edge time against edge number; "
                    + "period jitter: sd of consecutive edge intervals; cycle-to-cycle: differences of consecutive periods (RMS about 0)");
            r.tie().write(j, "tie", BINS, 1.0);
            r.period().write(j, "period", BINS, 1.0);
            r.cycleToCycle().write(j, "cycleToCycle", BINS, 1.0);
            j.endObject();
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-jitter.json", "application/json", (j.finish() + "\n").getBytes(StandardCharsets.UTF_8)));
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-jitter.png", "image/png", Plot.histograms(
                    id + " jitter of '" + channel + "' (" + which + " edges, " + n + " analysed)", List.of(
                            new Plot.Panel(String.format(Locale.ROOT, "time-interval error: RMS %.3f ps, peak-to-peak %.3f ps",
                                    r.tieRmsPs(), r.tie().peakToPeak()), "TIE (ps)", r.tie().histogram(BINS, 1.0), 1),
                            new Plot.Panel(String.format(Locale.ROOT, "period: mean %.4f ps, jitter RMS %.3f ps, peak-to-peak %.3f ps",
                                    r.period().mean(), r.period().std(), r.period().peakToPeak()), "period (ps)", r.period().histogram(BINS, 1.0), 1),
                            new Plot.Panel(String.format(Locale.ROOT, "cycle-to-cycle: RMS %.3f ps, peak-to-peak %.3f ps",
                                    r.c2cRmsPs(), r.cycleToCycle().peakToPeak()), "period difference (ps)", r.cycleToCycle().histogram(BINS, 1.0), 1)))));
            Annotation.Builder a = Annotation.on(id, n < 3 ? "jitter-too-few-edges" : "jitter").span(firstFs, lastFs)
                    .severity(n < 3 ? Severity.WARNING : Severity.INFO)
                    .label(n < 3 ? "fewer than 3 clock edges: no jitter figures"
                            : String.format(Locale.ROOT, "TIE %.3f ps RMS, %.3f ps p-p", r.tieRmsPs(), r.tie().peakToPeak()));
            if (n >= 3) {
                a.number("tieRmsPs", r.tieRmsPs(), "ps").number("tiePeakToPeakPs", r.tie().peakToPeak(), "ps")
                        .number("periodJitterRmsPs", r.period().std(), "ps").number("cycleToCycleRmsPs", r.c2cRmsPs(), "ps");
            }
            ctx.annotate(a.build());
            if (ignored > 0) {
                ctx.annotate(Annotation.on(id, "jitter-edges-not-analysed").span(firstFs, lastFs).severity(Severity.WARNING)
                        .label(ignored + " edges after the first " + n + " were not analysed (option maxEdges)").build());
            }
        }
    }
}
