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
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * Plugin {@code jitter}: the time-interval error (TIE) of clock edges against an ideal clock fitted
 * by least squares (a straight line through edge time against edge number; missing edges are
 * detected from the median period and skipped in the numbering), period jitter and cycle-to-cycle
 * jitter, each with RMS, peak-to-peak and a histogram; the split of the TIE into random and
 * deterministic jitter under the dual-Dirac model with total jitter at a bit error ratio and a
 * bathtub curve ({@link JitterDecomposition}); optionally the TIE against a tracking reference
 * clock of a given loop bandwidth ({@link TrackingClock}). Writes {@code <id>-jitter.json},
 * {@code <id>-jitter.png} and {@code <id>-bathtub.png}. Times in the report are picoseconds.
 * Method: docs/jitter.md.
 */
public final class JitterPlugin implements PluginProvider {
    static final String ID = "jitter";
    static final int BINS = 50;
    /** Default bit error ratio for total jitter, the one most link specifications quote (common practice). */
    static final double DEFAULT_BER = 1e-12;
    /** The docs/reference-facts.md section of the dual-Dirac relation. */
    static final String DUAL_DIRAC = "jitter-under-the-dual-dirac-model";
    /** Points of the bathtub curve, half on each wall. */
    static final int BATHTUB_POINTS = 100;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Jitter")
            .description("Time-interval error against a least-squares ideal clock, period and cycle-to-cycle jitter, "
                    + "with RMS, peak-to-peak and histograms.")
            .option(OptionSpec.choice("edge", "rising", "which edges are clock edges", "rising", "falling", "both"))
            .option(OptionSpec.integer("maxEdges", 4_000_000L, 3, 50_000_000,
                    "edges analysed at most (8 bytes each); later edges are counted but not analysed"))
            .option(OptionSpec.number("ber", "", DEFAULT_BER, 1e-18, 1e-3,
                    "bit error ratio at which total jitter and the eye opening are given (dual-Dirac extrapolation)"))
            .option(OptionSpec.number("trackingBandwidthHz", "Hz", 0.0, 0.0, 1e12,
                    "loop bandwidth of a tracking reference clock for a second TIE; 0 leaves it out"))
            .option(OptionSpec.integer("trackingOrder", 2L, 1, 2,
                    "order of the tracking loop: 1 (phase only) or 2 (phase and frequency, damping 0.707)"))
            .option(OptionSpec.number("dropoutPeriods", "", 0.0, 0.0, 1.0e6, "a gap between clock edges longer than this many"
                    + " ideal periods is a clock-dropout finding; 0 (the default) leaves dropouts to the stage that recovers the"
                    + " clock (dual-edge): set it where this stage is the only one that sees the clock"))
            .input(PortSpec.of("clock", DataKind.EDGES, "clock edges"))
            .output(PortSpec.of("files", DataKind.ARTIFACT, "<id>-jitter.json, <id>-jitter.png and <id>-bathtub.png"))
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
     * @param tiePs        every TIE value, ps ({@code edges} of them)
     * @param number       interval number of every edge (missing edges skipped)
     */
    record Result(int edges, double periodFs, long gaps, SampleStats tie, SampleStats period, SampleStats cycleToCycle,
                  double[] tiePs, long[] number) {
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
            return new Result(n, Double.NaN, 0, tie, period, c2c, new double[0], new long[0]);
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
        double[] tiePs = new double[n];
        for (int i = 0; i < n; i++) {
            double ideal = mt + b * (k[i] - mk);
            tiePs[i] = ((double) (t[i] - t[0]) - ideal) / 1000;
            tie.add(tiePs[i]);
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
        return new Result(n, b, gaps, tie, period, c2c, tiePs, k);
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
        private final EdgeFilter edgeFilter = new EdgeFilter();
        private final double ber;
        private final double trackingHz;
        private final int trackingOrder;
        private final double dropoutPeriods;

        JitterStage(StageContext ctx) {
            this.ctx = ctx;
            which = ctx.options().getString("edge");
            maxEdges = ctx.options().getInt("maxEdges");
            ber = ctx.options().getDouble("ber");
            trackingHz = ctx.options().getDouble("trackingBandwidthHz");
            trackingOrder = ctx.options().getInt("trackingOrder");
            dropoutPeriods = ctx.options().getDouble("dropoutPeriods");
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
                if (!edgeFilter.isEdge(e, i)) {
                    continue; // restores the level after an unknown span: no clock edge (Edges.levelOnly)
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
            edgeFilter.done(e);
        }

        @Override
        public void finish() {
            String id = ctx.instanceId();
            Result r = analyse(times, n);
            if (firstFs == Long.MAX_VALUE) {
                firstFs = 0;
                lastFs = 0;
            }
            double[] sorted = r.tiePs().clone();
            Arrays.sort(sorted);
            JitterDecomposition.Result d = JitterDecomposition.decomposeSorted(sorted, sorted.length, ber);
            double uiPs = r.periodFs() / 1000;
            double maxTrackingHz = TrackingClock.maxBandwidthHz(r.periodFs());
            if (trackingHz > 0 && n >= 3 && trackingHz > maxTrackingHz) {
                throw new OptionException("trackingBandwidthHz", String.format(Locale.ROOT, "option 'trackingBandwidthHz' of plugin '%s' "
                        + "instance '%s': %s is too wide for clock edges %.6g ps apart; expected at most %s (a loop updated once "
                        + "per interval follows the model only well below the edge rate)", ID, id, RingingPlugin.hz(trackingHz),
                        r.periodFs() / 1000, RingingPlugin.hz(maxTrackingHz)));
            }
            TrackingClock.Result tr = trackingHz > 0 && n >= 3
                    ? TrackingClock.run(times, r.number(), n, r.periodFs(), trackingHz, trackingOrder) : null;
            SampleStats trTie = new SampleStats("ps", tr == null ? 1 : Math.min(tr.count(), 1 << 20));
            if (tr != null) {
                for (int i = 0; i < tr.count(); i++) {
                    trTie.add(tr.tiePs()[i]);
                }
            }
            JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull().beginObject();
            j.field("instance", id);
            j.field("plugin", ID);
            j.field("channel", channel);
            j.field("edge", which);
            j.field("edgesAnalysed", n);
            j.field("edgesNotAnalysed", ignored);
            j.field("missingEdgePlaces", r.gaps());
            Source lsq = Source.measured("a least-squares line through edge time against edge number");
            Source edges = Source.measured("from the clock edges");
            Sourced.of(r.periodFs() / 1000, "ps", lsq).field(j, "idealPeriodPs");
            Sourced.of(1e15 / r.periodFs(), "Hz", lsq).field(j, "idealFrequencyHz");
            Sourced.of(r.tieRmsPs(), "ps", edges).field(j, "tieRmsPs");
            Sourced.of(r.tie().peakToPeak(), "ps", edges).field(j, "tiePeakToPeakPs");
            Sourced.of(r.period().mean(), "ps", edges).field(j, "periodMeanPs");
            Sourced.of(r.period().std(), "ps", edges).field(j, "periodJitterRmsPs");
            Sourced.of(r.period().peakToPeak(), "ps", edges).field(j, "periodJitterPeakToPeakPs");
            Sourced.of(r.c2cRmsPs(), "ps", edges).field(j, "cycleToCycleRmsPs");
            Sourced.of(r.cycleToCycle().peakToPeak(), "ps", edges).field(j, "cycleToCyclePeakToPeakPs");
            j.field("definitions", "TIE: edge time minus a least-squares line through edge time against edge number; "
                    + "period jitter: sd of consecutive edge intervals; cycle-to-cycle: differences of consecutive periods (RMS about 0)");
            writeDecomposition(j, d, uiPs, PeriodicJitter.of(r.tiePs(), r.number(), n), 1e15 / r.periodFs());
            double[][] tub = bathtub(d, sorted, uiPs);
            writeBathtub(j, tub, uiPs);
            writeTracking(j, tr, trTie);
            r.tie().write(j, "tie", BINS, 1.0);
            r.period().write(j, "period", BINS, 1.0);
            r.cycleToCycle().write(j, "cycleToCycle", BINS, 1.0);
            j.endObject();
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-jitter.json", "application/json", (j.finish() + "\n").getBytes(StandardCharsets.UTF_8)));
            String what = "'" + channel + "' (" + which + " edges, " + n + " analysed)";
            String rjdj = d.fitted() ? String.format(Locale.ROOT, "; RJ %.3f, DJ(dd) %.3f, TJ(%.0e) %.2f ps%s",
                    d.rjRms(), d.djDd(), ber, d.tj(), d.modelHolds() ? "" : " (doubtful)") : "; no RJ/DJ split";
            java.util.ArrayList<Plot.Panel> panels = new java.util.ArrayList<>(List.of(
                    new Plot.Panel(String.format(Locale.ROOT, "TIE: RMS %.3f ps, p-p %.3f ps",
                            r.tieRmsPs(), r.tie().peakToPeak()) + rjdj, "TIE (ps)", r.tie().histogram(BINS, 1.0), 1),
                    new Plot.Panel(String.format(Locale.ROOT, "period: mean %.4f ps, jitter RMS %.3f ps, peak-to-peak %.3f ps",
                            r.period().mean(), r.period().std(), r.period().peakToPeak()), "period (ps)", r.period().histogram(BINS, 1.0), 1),
                    new Plot.Panel(String.format(Locale.ROOT, "cycle-to-cycle: RMS %.3f ps, peak-to-peak %.3f ps",
                            r.c2cRmsPs(), r.cycleToCycle().peakToPeak()), "period difference (ps)", r.cycleToCycle().histogram(BINS, 1.0), 1)));
            if (tr != null) {
                panels.add(new Plot.Panel(String.format(Locale.ROOT, "TIE against a tracking clock (loop bandwidth %s, order %d): RMS %.3f ps, peak-to-peak %.3f ps",
                        RingingPlugin.hz(trackingHz), trackingOrder, Math.hypot(trTie.mean(), trTie.std()), trTie.peakToPeak()),
                        "TIE (ps)", trTie.histogram(BINS, 1.0), 1));
            }
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-jitter.png", "image/png",
                    Plot.histograms("Jitter of " + what, panels)));
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-bathtub.png", "image/png", bathtubPng(d, tub, uiPs, what)));
            Annotation.Builder a = Annotation.on(id, n < 3 ? "jitter-too-few-edges" : "jitter").span(firstFs, lastFs)
                    .severity(n < 3 ? Severity.WARNING : Severity.INFO)
                    .label(n < 3 ? "fewer than 3 clock edges: no jitter figures"
                            : String.format(Locale.ROOT, "TIE %.3f ps RMS, %.3f ps p-p", r.tieRmsPs(), r.tie().peakToPeak())
                            + (d.fitted() ? String.format(Locale.ROOT, ", RJ %.3f ps, DJ %.3f ps, TJ(%.0e) %.3f ps", d.rjRms(), d.djDd(), ber, d.tj()) : ""));
            if (n >= 3) {
                a.number("tieRmsPs", r.tieRmsPs(), "ps").number("tiePeakToPeakPs", r.tie().peakToPeak(), "ps")
                        .number("periodJitterRmsPs", r.period().std(), "ps").number("cycleToCycleRmsPs", r.c2cRmsPs(), "ps");
                if (d.fitted()) {
                    a.number("randomJitterRmsPs", d.rjRms(), "ps").number("deterministicJitterPs", d.djDd(), "ps")
                            .number("totalJitterPs", d.tj(), "ps");
                }
            }
            ctx.annotate(a.build());
            if (dropoutPeriods > 0 && n >= 3) {
                dropouts(r.periodFs());
            }
            if (ignored > 0) {
                ctx.annotate(Annotation.on(id, "jitter-edges-not-analysed").span(firstFs, lastFs).severity(Severity.WARNING)
                        .label(ignored + " edges after the first " + n + " were not analysed (option maxEdges)").build());
            }
        }

        /** One clock-dropout finding per gap between analysed edges longer than {@code dropoutPeriods} ideal periods. */
        private void dropouts(double periodFs) {
            double limit = dropoutPeriods * periodFs;
            for (int i = 1; i < n; i++) {
                long gap = times[i] - times[i - 1];
                if (gap > limit) {
                    ctx.annotate(Annotation.on(ctx.instanceId(), "clock-dropout").span(times[i - 1], times[i]).severity(Severity.ERROR)
                            .label(String.format(Locale.ROOT, "'%s': no clock edge for %.2f periods (limit %.4g, option dropoutPeriods)",
                                    channel, gap / periodFs, dropoutPeriods))
                            .number("gapFs", gap, "fs").number("periods", gap / periodFs, "").build());
                }
            }
        }

        private void writeDecomposition(JsonWriter j, JitterDecomposition.Result d, double uiPs, PeriodicJitter.Result pj,
                                        double edgeHz) {
            new Sourced(ber, null, ber == DEFAULT_BER ? Source.assumed("1e-12, common practice") : Source.given("option ber"))
                    .field(j, "ber");
            j.name("decomposition").beginObject();
            j.field("model", "dual-Dirac: two Gaussians of weight 1/2; each tail fitted as a straight line on the Q scale "
                    + "(beyond Q " + JitterDecomposition.Q_SHALLOW + ", at most Q " + JitterDecomposition.Q_DEEP + ")");
            Source fit = Source.measured("tail fits of the TIE distribution");
            Sourced.of(d.rjRms(), "ps", fit).field(j, "randomJitterRmsPs");
            Sourced.of(d.djDd(), "ps", fit).field(j, "deterministicJitterDualDiracPs");
            Sourced.of(d.qBer(), null, Source.standard("Q(BER) = -inverse standard normal CDF of BER; Q(1e-12) = 7.034, "
                    + "Fibre Channel MJSQ, T11.2", DUAL_DIRAC)).field(j, "qOfBer");
            Sourced.of(d.tj(), "ps", Source.derived("TJ(BER) = DJ(dual-Dirac) + 2 Q(BER) RJ (" + Source.FACTS + "#" + DUAL_DIRAC
                    + ") from the measured RJ and DJ")).field(j, "totalJitterPs");
            j.field("relation", "TJ(BER) = DJ(dual-Dirac) + 2 Q(BER) RJ, Q(BER) = -inverse standard normal CDF of BER");
            Sourced.of(d.fitted() ? Math.max(0, 1 - d.tj() / uiPs) : Double.NaN, "UI", Source.derived("1 - TJ(BER) / unit interval"))
                    .field(j, "eyeOpeningUi");
            Sourced.of(pj.peakToPeak(), "ps", Source.measured("peak-to-peak of the sum of the spectral lines of the TIE against edge"
                    + " number, each fitted by least squares; the dual-Dirac DJ above is at most this for periodic jitter"))
                    .field(j, "periodicJitterPeakToPeakPs");
            Sourced.of(pj.residualRms(), "ps", Source.measured("RMS of the TIE with those lines removed: random jitter and"
                    + " non-periodic deterministic jitter")).field(j, "residualTieRmsPs");
            j.name("periodicLines").beginArray();
            for (PeriodicJitter.Tone t : pj.tones()) {
                j.beginObjectInline().field("frequencyHz", t.cyclesPerEdge() * edgeHz).field("amplitudePs", t.amplitude()).endObject();
            }
            j.endArray();
            JitterDecomposition.Tail[] tails = {d.left(), d.right()};
            for (int side = 0; side < 2; side++) {
                JitterDecomposition.Tail t = tails[side];
                j.name(side == 0 ? "leftTail" : "rightTail").beginObject();
                Sourced.of(t == null ? Double.NaN : t.mu(), "ps", fit).field(j, "diracPs");
                Sourced.of(t == null ? Double.NaN : t.sigma(), "ps", fit).field(j, "sigmaPs");
                Sourced.of(t == null ? Double.NaN : t.weight(), null, Source.standard("the dual-Dirac model's weight of each"
                        + " Dirac, Fibre Channel MJSQ, T11.2", DUAL_DIRAC)).field(j, "diracWeight");
                Sourced.of(t == null ? Double.NaN : t.r2(), null, Source.measured("goodness of the tail fit")).field(j, "rSquared");
                j.field("points", t == null ? 0 : t.points());
                j.endObject();
            }
            j.field("modelHolds", d.modelHolds());
            j.name("modelCaveats").beginArray();
            for (String c : d.caveats()) {
                j.value(c);
            }
            j.endArray();
            j.endObject();
        }

        /**
         * Width of each wall of the bathtub shown, ps: where the model (or, without a fit, the
         * measured TIE) has fallen well below any BER of interest, at most half the interval.
         */
        private static double wallPs(JitterDecomposition.Result d, double[] sorted, double uiPs) {
            double w = sorted.length == 0 ? uiPs / 2 : 1.5 * Math.max(Math.abs(sorted[0]), Math.abs(sorted[sorted.length - 1]));
            if (d.fitted()) {
                double q = 8.5; // about 1e-17, below the plot's floor
                w = Math.max(w, 1.25 * Math.max(d.right().mu() + q * d.right().sigma(), -d.left().mu() + q * d.left().sigma()));
            }
            return Double.isFinite(w) && w > 0 ? Math.min(w, uiPs / 2) : uiPs / 2;
        }

        /**
         * Sampling instants (ps after the ideal edge) across both walls of the bathtub, log10 of the
         * model's error probability, measured error share: the first half of the points cover
         * {@code [0, wall]}, the second {@code [ui - wall, ui]} (the whole interval when the wall is half of it).
         */
        private double[][] bathtub(JitterDecomposition.Result d, double[] sorted, double uiPs) {
            double wall = wallPs(d, sorted, uiPs);
            int half = BATHTUB_POINTS / 2;
            double[] x = new double[BATHTUB_POINTS];
            double[] model = new double[BATHTUB_POINTS];
            double[] meas = new double[BATHTUB_POINTS];
            for (int i = 0; i < BATHTUB_POINTS; i++) {
                x[i] = i < half ? wall * i / (half - 1) : uiPs - wall + wall * (i - half) / (half - 1);
                model[i] = d.fitted() ? Math.log10(JitterDecomposition.bathtubModel(d, uiPs, x[i])) : Double.NaN;
                meas[i] = sorted.length == 0 ? 0 : JitterDecomposition.bathtubMeasured(sorted, sorted.length, uiPs, x[i]);
            }
            return new double[][] {x, model, meas};
        }

        private void writeBathtub(JsonWriter j, double[][] b, double uiPs) {
            j.name("bathtub").beginObject();
            Sourced.of(uiPs, "ps", Source.measured("the least-squares clock period")).field(j, "unitIntervalPs");
            Sourced.of(1.0, null, Source.assumed("1, every interval has a transition (a clock)")).field(j, "transitionDensity");
            j.field("points", "the first half span the wall after one ideal edge, the second half the wall before the next");
            j.name("positionPs").inlineArray(b[0], b[0].length);
            j.name("modelLog10ErrorProbability").inlineArray(b[1], b[1].length);
            j.name("measuredErrorShare").inlineArray(b[2], b[2].length);
            j.endObject();
        }

        private byte[] bathtubPng(JitterDecomposition.Result d, double[][] b, double uiPs, String what) {
            String sub = d.fitted() ? String.format(Locale.ROOT, "RJ %.3f ps RMS, DJ(dual-Dirac) %.3f ps, TJ(%.0e) %.3f ps, eye opening %.4f UI of %.6g ps%s",
                    d.rjRms(), d.djDd(), ber, d.tj(), Math.max(0, 1 - d.tj() / uiPs), uiPs, d.modelHolds() ? "" : "; model doubtful")
                    : "no dual-Dirac fit: " + d.caveats().get(0);
            return BathtubPlot.render("Bathtub of " + what, sub, b[0], uiPs, b[1], b[2], ber);
        }

        private void writeTracking(JsonWriter j, TrackingClock.Result tr, SampleStats trTie) {
            j.name("trackingReference");
            if (tr == null) {
                j.nullValue();
                return;
            }
            j.beginObject();
            Sourced.of(trackingHz, "Hz", Source.given("option trackingBandwidthHz")).field(j, "loopBandwidthHz");
            j.field("order", trackingOrder);
            j.field("dampingRatio", trackingOrder == 2 ? TrackingClock.ZETA : Double.NaN);
            j.field("settlingEdgesLeftOut", tr.settlingEdges());
            Source against = Source.measured("TIE against the tracking reference");
            Sourced.of(Math.hypot(trTie.mean(), trTie.std()), "ps", against).field(j, "tieRmsPs");
            Sourced.of(trTie.peakToPeak(), "ps", against).field(j, "tiePeakToPeakPs");
            j.field("definition", "TIE against a reference clock that follows the edges through a phase-locked loop "
                    + "of this bandwidth (wander slower than it is removed)");
            j.endObject();
        }
    }
}
