package org.lanesift.plugins.si;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
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
 * Plugin {@code ringing}: averages the signal after every edge, aligned on the edges' interpolated
 * 50 % crossings ({@link EdgeAverager}; noise falls as the square root of the edge count), fits a
 * damped sinusoid to the averaged step (Apache Commons Math Levenberg-Marquardt), and also fits each
 * edge alone for the list of fits; the summary comes from the averaged step (from the median of the
 * single-edge fits only if the average cannot be fitted). It reports ring frequency, damping ratio
 * and Q, and, with the probe's input
 * capacitance, the loop inductance that would resonate there, {@code L = 1 / ((2 pi f0)^2 C)}, and
 * the ground-lead length it suggests at about 1 nH per mm (common practice), with plain advice.
 * Writes {@code <id>-ringing.json}.
 */
public final class RingingPlugin implements PluginProvider {
    static final String ID = "ringing";
    /** Default probe input capacitance: a typical 10:1 passive probe tip, about 10 pF (common practice, from memory). */
    static final double DEFAULT_PROBE_PF = 10.0;
    /** Inductance of a straight wire per millimetre, about 1 nH (common practice). */
    static final double NH_PER_MM = 1.0;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Ringing")
            .description("Fits a damped sinusoid after each edge: ring frequency, damping ratio, Q, and the ground-loop "
                    + "inductance and lead length that the probe capacitance implies, with advice.")
            .option(EdgeMetricsPlugin.LEVELS)
            .option(EdgeMetricsPlugin.LEVEL_SAMPLES)
            .option(OptionSpec.number("probeCapacitancePf", "pF", DEFAULT_PROBE_PF, 0.01, 1000.0,
                    "probe input capacitance at the tip; default 10 pF, a typical 10:1 passive probe (common practice, from memory)"))
            .option(OptionSpec.integer("maxFits", 500L, 1, 100_000, "edges to fit at most (the rest are counted)"))
            .option(OptionSpec.integer("maxFitSamples", 65_536L, 64, 1 << 22, "samples after an edge kept for its fit"))
            .option(OptionSpec.bool("annotateEdges", false, "emit one annotation per fitted edge"))
            .input(PortSpec.of("signal", DataKind.ANALOG, "the signal, volts"))
            .output(PortSpec.of("files", DataKind.ARTIFACT, "<id>-ringing.json"))
            .build();

    /** Creates the provider. */
    public RingingPlugin() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext ctx) {
        return new RingStage(ctx);
    }

    /**
     * Loop inductance that resonates with {@code capacitanceF} at {@code naturalHz}.
     *
     * @param naturalHz   undamped resonance, Hz
     * @param capacitanceF capacitance, farads
     * @return henries
     */
    static double inductance(double naturalHz, double capacitanceF) {
        double w = 2 * Math.PI * naturalHz;
        return 1 / (w * w * capacitanceF);
    }

    /** Plain advice for a ring at {@code ringHz} that fits {@code henries} with {@code pf} at the tip. */
    static String advice(double ringHz, double henries, double pf, double q) {
        double nh = henries * 1e9;
        double mm = nh / NH_PER_MM;
        String len = mm >= 20 ? String.format(Locale.ROOT, "roughly a %.0f cm ground lead", mm / 10)
                : String.format(Locale.ROOT, "roughly %.0f mm of lead", mm);
        String head = String.format(Locale.ROOT, "the ring at %s fits about %s of loop inductance with %s pF at the tip, %s",
                hz(ringHz), nh >= 10 ? String.format(Locale.ROOT, "%.0f nH", nh) : String.format(Locale.ROOT, "%.1f nH", nh),
                trim(pf), len);
        String damp = q < 2 ? String.format(Locale.ROOT, " (well damped, Q %.1f)", q) : "";
        if (mm >= 20) {
            return head + damp + ": use a short ground spring or a solder-in tip with a ground a few mm away";
        } else if (mm >= 8) {
            return head + damp + ": shorten the ground connection further if the ring matters";
        }
        return head + damp + ": the probe loop is already short, so the ring probably belongs to the circuit (or the probe head) rather than the ground lead";
    }

    static String hz(double f) {
        if (f >= 1e9) {
            return String.format(Locale.ROOT, "%.3g GHz", f / 1e9);
        } else if (f >= 1e6) {
            return String.format(Locale.ROOT, "%.3g MHz", f / 1e6);
        } else if (f >= 1e3) {
            return String.format(Locale.ROOT, "%.3g kHz", f / 1e3);
        }
        return String.format(Locale.ROOT, "%.3g Hz", f);
    }

    private static String trim(double v) {
        return v == Math.rint(v) ? Long.toString((long) v)
                : new java.math.BigDecimal(String.format(Locale.ROOT, "%.3g", v)).stripTrailingZeros().toPlainString();
    }

    /** The running instance. */
    static final class RingStage extends LevelStage {
        private final double capF;
        private final int maxFits;
        private final int tailCap;
        private final boolean annotateEdges;
        private final List<double[]> fits = new ArrayList<>();
        private final List<String> failures = new ArrayList<>();
        private long edges;
        private long fitted;
        private long notFitted;
        private long skipped;
        private EdgeAverager averager;

        RingStage(StageContext ctx) {
            super(ctx, ID);
            capF = ctx.options().getDouble("probeCapacitancePf") * 1e-12;
            maxFits = ctx.options().getInt("maxFits");
            tailCap = ctx.options().getInt("maxFitSamples");
            annotateEdges = ctx.options().getBoolean("annotateEdges");
        }

        @Override
        EdgeTracker tracker(Levels levels) {
            return new EdgeTracker(levels, 0.05, tailCap, e -> edge(e, levels));
        }

        private void edge(EdgeTracker.Edge e, Levels lv) {
            edges++;
            double endFs = e.departFs() - (e.truncated() ? 0 : e.transitionFs());
            int n = (int) Math.max(0, Math.min(e.tailCount(), Math.floor((endFs - e.tailStartFs()) / periodFs)));
            if (averager == null) {
                averager = new EdgeAverager(periodFs, lv.lowVolts, lv.highVolts);
            }
            averager.add(e.tail(), n, e.tailStartFs(), e.t50(), e.rising(), endFs);
            if (fitted + notFitted >= maxFits) {
                skipped++;
                return;
            }
            RingFit.Result r = RingFit.fit(e.tail(), n, e.tailStartFs(), periodFs, e.rising(), lv.swing());
            if (!r.ok()) {
                notFitted++;
                if (failures.size() < 20) {
                    failures.add(String.format(Locale.ROOT, "edge at %.6g ns: %s", e.t50() / 1e6, r.reason()));
                }
                return;
            }
            fitted++;
            double l = inductance(r.naturalHz(), capF);
            fits.add(new double[] {e.t50(), e.rising() ? 1 : 0, r.ringHz(), r.naturalHz(), r.alphaPerS(), r.zeta(), r.q(),
                r.amplitudeVolts(), r.rSquared(), l, r.points()});
            if (annotateEdges) {
                ctx.annotate(Annotation.on(ctx.instanceId(), "ring-fit").span(Math.round(r.startFs()), Math.round(endFs))
                        .label(String.format(Locale.ROOT, "ring %s, Q %.1f", hz(r.ringHz()), r.q()))
                        .number("ringHz", r.ringHz(), "Hz").number("zeta", r.zeta(), "").number("q", r.q(), "")
                        .number("inductanceH", l, "H").build());
            }
        }

        private double median(int col) {
            double[] v = new double[fits.size()];
            for (int i = 0; i < v.length; i++) {
                v[i] = fits.get(i)[col];
            }
            if (v.length == 0) {
                return Double.NaN;
            }
            Arrays.sort(v);
            return v.length % 2 == 1 ? v[v.length / 2] : (v[v.length / 2 - 1] + v[v.length / 2]) / 2;
        }

        @Override
        void done(Levels lv) {
            String id = ctx.instanceId();
            RingFit.Result avg = averager == null || averager.count() == 0 ? RingFit.Result.fail("no complete edge to average")
                    : RingFit.fit(averager.average(), averager.length(), averager.firstT50Fs() + averager.delayFs(), periodFs, true, lv.swing());
            boolean fromAverage = avg.ok();
            double ring = fromAverage ? avg.ringHz() : median(2);
            double nat = fromAverage ? avg.naturalHz() : median(3);
            double zeta = fromAverage ? avg.zeta() : median(5);
            double q = fromAverage ? avg.q() : median(6);
            boolean any = fromAverage || !fits.isEmpty();
            double l = any ? inductance(nat, capF) : Double.NaN;
            double mm = l * 1e9 / NH_PER_MM;
            String advice = !any ? "no ringing was fitted after " + edges + " edges"
                    + (averager != null && averager.count() > 0 ? " (average of " + averager.count() + " edges: " + avg.reason() + ")"
                    : failures.isEmpty() ? "" : " (" + failures.get(0) + ")")
                    : advice(ring, l, capF * 1e12, q);
            JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull().beginObject();
            j.field("instance", id);
            j.field("plugin", ID);
            j.field("channel", channel);
            Source levels = Source.measured("the two levels of the signal");
            Sourced.of(lv.lowVolts, "V", levels).field(j, "lowLevelVolts");
            Sourced.of(lv.highVolts, "V", levels).field(j, "highLevelVolts");
            j.field("edges", edges);
            j.field("fitted", fitted);
            j.field("notFitted", notFitted);
            j.field("notTried", skipped);
            j.field("model", "v(t) = A exp(-alpha t) cos(2 pi f t + phi) + c from the first peak after the edge, "
                    + "Levenberg-Marquardt (Apache Commons Math 3)");
            j.name("average").beginObject();
            j.field("method", "samples after every complete edge, resampled onto a common grid aligned on the interpolated "
                    + "50 % crossing, falling edges mirrored, averaged; then fitted once");
            j.field("edgesAveraged", averager == null ? 0 : averager.count());
            j.field("edgesLeftOut", averager == null ? 0 : averager.leftOut());
            j.field("samples", averager == null ? 0 : averager.length());
            j.field("fitted", avg.ok());
            j.field("reason", avg.ok() ? "" : avg.reason());
            Source avgFit = Source.measured("fit of the averaged edge");
            Sourced.of(avg.ringHz(), "Hz", avgFit).field(j, "ringHz");
            Sourced.of(avg.naturalHz(), "Hz", avgFit).field(j, "naturalHz");
            Sourced.of(avg.zeta(), null, avgFit).field(j, "dampingRatio");
            Sourced.of(avg.amplitudeVolts(), "V", avgFit).field(j, "amplitudeVolts");
            Sourced.of(avg.rSquared(), null, Source.measured("goodness of the fit of the averaged edge")).field(j, "rSquared");
            j.endObject();
            j.name("summary").beginObject();
            j.field("from", fromAverage ? "the averaged edge" : any ? "the median of the single-edge fits (the average could not be fitted)" : "nothing fitted");
            Source sumFit = Source.measured(fromAverage ? "fit of the averaged edge" : "median of the single-edge fits");
            Sourced.of(ring, "Hz", sumFit).field(j, "ringHz");
            Sourced.of(nat, "Hz", sumFit).field(j, "naturalHz");
            Sourced.of(zeta, null, sumFit).field(j, "dampingRatio");
            Sourced.of(q, null, sumFit).field(j, "q");
            Sourced.of(capF * 1e12, "pF", capF * 1e12 == DEFAULT_PROBE_PF
                    ? Source.assumed("a typical 10:1 passive probe, common practice, from memory") : Source.given("option probeCapacitancePf"))
                    .field(j, "probeCapacitancePf");
            Sourced.of(l * 1e9, "nH", Source.derived("L = 1 / ((2 pi f0)^2 C) from the measured f0 and the capacitance above"))
                    .field(j, "loopInductanceNh");
            Sourced.of(mm, "mm", Source.derived("about 1 nH per mm of straight lead (common practice)")).field(j, "leadLengthMm");
            j.field("advice", advice);
            j.endObject();
            j.name("assumptions").beginArray();
            j.value("the ring is the series resonance of the ground-loop inductance and the probe capacitance: "
                    + "L = 1 / ((2 pi f0)^2 C), f0 the undamped natural frequency");
            j.value("probe capacitance " + trim(capF * 1e12) + " pF"
                    + (capF * 1e12 == DEFAULT_PROBE_PF ? " (default: a typical 10:1 passive probe, common practice, from memory)" : " (given)"));
            j.value("a straight lead has about 1 nH per mm (common practice); a loop's real inductance depends on its area");
            j.endArray();
            j.name("fits").beginArray();
            for (double[] f : fits) {
                j.beginObject();
                j.field("t50Ns", f[0] / 1e6);
                j.field("edge", f[1] == 1 ? "rising" : "falling");
                j.field("ringHz", f[2]);
                j.field("naturalHz", f[3]);
                j.field("alphaPerS", f[4]);
                j.field("dampingRatio", f[5]);
                j.field("q", f[6]);
                j.field("amplitudeVolts", f[7]);
                j.field("rSquared", f[8]);
                j.field("loopInductanceNh", f[9] * 1e9);
                j.field("points", (long) f[10]);
                j.endObject();
            }
            j.endArray();
            j.name("notFittedReasons").beginArray();
            for (String s : failures) {
                j.value(s);
            }
            j.endArray();
            j.endObject();
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-ringing.json", "application/json", (j.finish() + "\n").getBytes(StandardCharsets.UTF_8)));
            // the annotation spans the edge that was fitted (the first one averaged), not the whole capture
            long spanFrom = fromAverage ? Math.round(averager.firstT50Fs()) : firstFs;
            long spanTo = fromAverage ? Math.max(spanFrom, Math.round(Math.min(averager.firstDepartFs(),
                    averager.firstT50Fs() + averager.delayFs() + averager.length() * periodFs))) : lastFs;
            Annotation.Builder a = Annotation.on(id, "ringing").span(spanFrom, spanTo).label(advice)
                    .severity(any && mm >= 20 ? Severity.WARNING : Severity.INFO)
                    .text("advice", advice);
            if (any) {
                a.number("ringHz", ring, "Hz").number("dampingRatio", zeta, "").number("q", q, "")
                        .number("loopInductanceH", l, "H").number("leadLengthMm", mm, "mm");
            }
            ctx.annotate(a.build());
        }
    }
}
