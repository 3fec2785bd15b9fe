package org.lanesift.plugins.si;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Arrays;
import java.util.List;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * Plugin {@code eye-diagram}: folds an analog signal (a differential signal or one leg, volts) on
 * a recovered clock (input {@code clock}, edge list) or on a fixed bit rate (option
 * {@code bitRateHz}) over one or two unit intervals, and writes {@code <id>-eye.png} (density plot
 * with axes in ns and mV and a colour scale legend) and {@code <id>-eye.json} (levels, eye height
 * and width at the sample point, mask hits). An optional mask is read from {@code maskFile}
 * (format in docs/eye-mask.md).
 */
public final class EyeDiagramPlugin implements PluginProvider {
    static final String ID = "eye-diagram";
    /** Samples buffered to fix the voltage range when {@code rangeMv} is not given. */
    static final int RANGE_SAMPLES = 1 << 16;
    /** Default sample point, UI: the middle of the unit interval. */
    static final double DEFAULT_SAMPLE_POINT_UI = 0.5;
    /** Samples that may wait for clock edges before the stage gives up. */
    static final int MAX_PENDING = 1 << 24;
    /** Fixed-rate folding restarts its phase from the absolute sample index every this many samples. */
    static final int ANCHOR = 4096;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Eye diagram")
            .description("Folds a signal on its clock or a given bit rate into a voltage-time density plot; "
                    + "measures eye height and width at the sample point and counts mask hits.")
            .option(OptionSpec.number("bitRateHz", "Hz", 0.0, 0.0, 1e12,
                    "bit rate to fold on when no clock is wired; 0 = fold on the edges of input 'clock'"))
            .option(OptionSpec.choice("clockEdge", "rising", "which clock edges start an interval", "rising", "falling", "both"))
            .option(OptionSpec.integer("uiPerClockInterval", 1L, 1, 64,
                    "unit intervals between two used clock edges (1 for a DDR clock with clockEdge=both, 7 for a 7:1 pixel clock)"))
            .option(OptionSpec.integer("uiCount", 2L, 1, 2, "unit intervals shown across the picture"))
            .option(OptionSpec.integer("widthPx", 640L, 64, 4096, "width of the density plot in pixels (one time bin per pixel)"))
            .option(OptionSpec.integer("heightPx", 400L, 32, 4096, "height of the density plot in pixels (one voltage bin per pixel)"))
            .option(OptionSpec.text("maskFile", "", "eye mask file (docs/eye-mask.md); empty for none"))
            .option(OptionSpec.number("samplePoint", "UI", DEFAULT_SAMPLE_POINT_UI, 0.0, 1.0,
                    "where in the unit interval eye height is measured (0.5 = middle of the eye after alignment)"))
            .option(OptionSpec.choice("align", "auto", "auto centres the eye opening at 0.5 UI (crossings near 0 and 1); none keeps the clock/bit-rate phase", "auto", "none"))
            .option(OptionSpec.number("offsetUi", "UI", 0.0, -1.0, 1.0, "extra shift of the time axis, in UI"))
            .option(OptionSpec.numbers("rangeMv", "mV", "voltage range [min, max] of the plot; empty = from the first 65536 samples"))
            .option(OptionSpec.numbers("thresholdMv", "mV", "decision threshold [value]; empty = midway between the two levels"))
            .input(PortSpec.of("signal", DataKind.ANALOG, "the signal to fold, volts"))
            .input(PortSpec.optional("clock", DataKind.EDGES, "recovered clock edges (not needed with bitRateHz)"))
            .output(PortSpec.of("files", DataKind.ARTIFACT, "<id>-eye.png and <id>-eye.json"))
            .build();

    /** Creates the provider. */
    public EyeDiagramPlugin() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext ctx) {
        OptionValues o = ctx.options();
        List<Double> range = o.getNumbers("rangeMv");
        if (!range.isEmpty() && (range.size() != 2 || !(range.get(1) > range.get(0)))) {
            throw new OptionException("rangeMv", "option 'rangeMv' of plugin '" + ID + "': expected two increasing numbers [min, max] in mV, got " + range);
        }
        List<Double> thr = o.getNumbers("thresholdMv");
        if (thr.size() > 1) {
            throw new OptionException("thresholdMv", "option 'thresholdMv' of plugin '" + ID + "': expected one number in mV or nothing, got " + thr);
        }
        EyeMask mask = null;
        String mf = o.getString("maskFile");
        if (!mf.isBlank()) {
            try {
                mask = EyeMask.read(Path.of(mf));
            } catch (EyeMask.MaskException | java.nio.file.InvalidPathException e) {
                throw new OptionException("maskFile", "option 'maskFile' of plugin '" + ID + "': " + e.getMessage());
            }
        }
        return new EyeStage(ctx, mask);
    }

    /** The running instance. */
    static final class EyeStage implements Stage {
        private final StageContext ctx;
        private final EyeMask mask;
        private final double bitRateHz;
        private final boolean clockMode;
        private final String clockEdge;
        private final int uiPerInterval;
        private final int uiCount;
        private final int widthBins;
        private final int heightBins;
        private final double samplePoint;
        private final boolean align;
        private final double offsetUi;
        private final List<Double> rangeMv;
        private final double thresholdMv;

        private final ArrayDeque<AnalogBlock> pending = new ArrayDeque<>();
        private long pendingSamples;
        private final Levels.Collector rangeCollector = new Levels.Collector(RANGE_SAMPLES);
        private EyeAccumulator acc;
        private double t0Fs = Double.NaN;
        private double periodFs;
        private long firstFs = Long.MAX_VALUE;
        private long lastFs = Long.MIN_VALUE;
        private long samplesSeen;
        private long unclocked;

        // clock edges: times[head..tail) with global edge number headIndex at head
        private long[] edgeTimes = new long[1024];
        private int head;
        private int tail;
        private long headIndex;
        private long clockEdges;
        private final EdgeFilter edgeFilter = new EdgeFilter();
        private long firstEdge;
        private double carryPhase;
        private long carryIndex = Long.MIN_VALUE;
        private long carryEdge = -1;
        /** Name of the folded signal's channel, as its first block gives it. */
        private String signalChannel = "signal";

        EyeStage(StageContext ctx, EyeMask mask) {
            this.ctx = ctx;
            this.mask = mask;
            OptionValues o = ctx.options();
            bitRateHz = o.getDouble("bitRateHz");
            clockMode = bitRateHz == 0;
            clockEdge = o.getString("clockEdge");
            uiPerInterval = o.getInt("uiPerClockInterval");
            uiCount = o.getInt("uiCount");
            widthBins = o.getInt("widthPx") / uiCount * uiCount;
            heightBins = o.getInt("heightPx");
            samplePoint = o.getDouble("samplePoint");
            align = o.getString("align").equals("auto");
            offsetUi = o.getDouble("offsetUi");
            rangeMv = o.getNumbers("rangeMv");
            List<Double> thr = o.getNumbers("thresholdMv");
            thresholdMv = thr.isEmpty() ? Double.NaN : thr.get(0);
        }

        @Override
        public void accept(int input, Block block) {
            if (input == 0) {
                AnalogBlock b = (AnalogBlock) block;
                if (b.length() == 0) {
                    return;
                }
                if (Double.isNaN(t0Fs)) {
                    signalChannel = b.channel();
                    periodFs = b.periodFs();
                    t0Fs = b.startFs() - b.firstIndex() * periodFs;
                } else if (Math.abs(b.periodFs() - periodFs) > 1e-9 * periodFs) {
                    throw new org.lanesift.plugin.InputFormatException("eye-diagram '" + ctx.instanceId() + "': channel '" + b.channel()
                            + "' changed its sample period from " + periodFs + " fs to " + b.periodFs() + " fs at sample " + b.firstIndex());
                }
                firstFs = Math.min(firstFs, b.startFs());
                lastFs = Math.max(lastFs, b.endFs());
                samplesSeen += b.length();
                if (!rangeCollector.full()) {
                    rangeCollector.take(b.volts(), 0, b.length(), b.invalid());
                }
                pending.add(b);
                pendingSamples += b.length();
                process(false);
                if (pendingSamples > MAX_PENDING) {
                    throw new org.lanesift.plugin.InputFormatException("eye-diagram '" + ctx.instanceId() + "': " + pendingSamples
                            + " samples of input 'signal' are waiting for clock edges that have not arrived; wire input 'clock' "
                            + "to a clock edge list or set option bitRateHz");
                }
            } else {
                if (!clockMode) {
                    return;
                }
                addEdges((Edges) block);
                process(false);
            }
        }

        private void addEdges(Edges e) {
            for (int i = 0; i < e.count(); i++) {
                boolean rising = e.levelAfter(i);
                boolean use = switch (clockEdge) {
                    case "rising" -> rising;
                    case "falling" -> !rising;
                    default -> true;
                };
                if (!use) {
                    continue;
                }
                if (!edgeFilter.isEdge(e, i)) {
                    continue; // restores the level after an unknown span: no clock edge (Edges.levelOnly)
                }
                long t = e.timesFs()[i];
                if (tail > head && t <= edgeTimes[tail - 1]) {
                    continue; // duplicate or out of order across blocks: ignore, it would make an empty interval
                }
                if (tail == edgeTimes.length) {
                    if (head > edgeTimes.length / 2) {
                        System.arraycopy(edgeTimes, head, edgeTimes, 0, tail - head);
                        tail -= head;
                        head = 0;
                    } else {
                        edgeTimes = Arrays.copyOf(edgeTimes, edgeTimes.length * 2);
                    }
                }
                edgeTimes[tail++] = t;
                if (clockEdges == 0) {
                    firstEdge = t;
                }
                clockEdges++;
            }
            edgeFilter.done(e);
        }

        private void process(boolean last) {
            if (acc == null) {
                if (!rangeCollector.full() && !last) {
                    return;
                }
                double lo;
                double hi;
                if (!rangeMv.isEmpty()) {
                    lo = rangeMv.get(0) / 1000;
                    hi = rangeMv.get(1) / 1000;
                } else {
                    float[] s = rangeCollector.samples();
                    int n = rangeCollector.count();
                    if (n == 0) {
                        return;
                    }
                    lo = Double.POSITIVE_INFINITY;
                    hi = Double.NEGATIVE_INFINITY;
                    for (int i = 0; i < n; i++) {
                        lo = Math.min(lo, s[i]);
                        hi = Math.max(hi, s[i]);
                    }
                    double span = Math.max(hi - lo, 1e-3);
                    lo -= 0.2 * span;
                    hi += 0.2 * span;
                }
                acc = new EyeAccumulator(widthBins, heightBins, lo, hi);
            }
            while (!pending.isEmpty()) {
                AnalogBlock b = pending.peek();
                if (clockMode && !last && (tail == head || edgeTimes[tail - 1] < b.endFs())) {
                    return;
                }
                if (clockMode) {
                    foldOnClock(b);
                } else {
                    foldOnRate(b);
                }
                pending.poll();
                pendingSamples -= b.length();
            }
        }

        private void foldOnRate(AnalogBlock b) {
            double binsPerUi = (double) widthBins / uiCount;
            double stepBins = periodFs * bitRateHz / 1e15 * binsPerUi;
            double t0Bins = t0Fs * bitRateHz / 1e15 * binsPerUi;
            t0Bins -= Math.floor(t0Bins / widthBins) * widthBins;
            int n = b.length();
            int i = 0;
            while (i < n) {
                long g = b.firstIndex() + i;
                long nextAnchor = (Math.floorDiv(g, ANCHOR) + 1) * ANCHOR;
                int end = (int) Math.min(n, i + (nextAnchor - g));
                // continue the running phase across a block boundary so that any cut gives the same sums
                double phase = (g % ANCHOR == 0 || g != carryIndex) ? t0Bins + g * stepBins : carryPhase;
                carryPhase = acc.accumulate(b.volts(), b.invalid(), i, end, phase, stepBins);
                carryIndex = b.firstIndex() + end;
                i = end;
            }
        }

        private void foldOnClock(AnalogBlock b) {
            double binsPerUi = (double) widthBins / uiCount;
            int n = b.length();
            int i = 0;
            long g0 = b.firstIndex();
            while (i < n) {
                double t = t0Fs + (g0 + i) * periodFs;
                // drop edges whose following interval ends before t
                while (tail - head >= 2 && edgeTimes[head + 1] <= t) {
                    head++;
                    headIndex++;
                }
                if (tail == head || t < edgeTimes[head]) {
                    // before the first edge: skip up to it
                    int end = n;
                    if (tail > head) {
                        end = (int) Math.min(n, Math.max(i + 1, indexAtOrAfter(edgeTimes[head]) - g0));
                    }
                    unclocked += end - i;
                    i = end;
                    continue;
                }
                if (tail - head < 2) {
                    unclocked += n - i; // after the last edge: no interval end known
                    return;
                }
                long e0 = edgeTimes[head];
                long e1 = edgeTimes[head + 1];
                int end = (int) Math.min(n, Math.max(i + 1, indexAtOrAfter(e1) - g0));
                double span = e1 - e0;
                double binsPerFs = uiPerInterval * binsPerUi / span;
                double base = Math.floorMod(headIndex * uiPerInterval, uiCount) * binsPerUi;
                double phase = (g0 + i == carryIndex && headIndex == carryEdge) ? carryPhase : base + (t - e0) * binsPerFs;
                carryPhase = acc.accumulate(b.volts(), b.invalid(), i, end, phase, periodFs * binsPerFs);
                carryIndex = g0 + end;
                carryEdge = headIndex;
                i = end;
            }
        }

        /** Global index of the first sample at or after time {@code tFs}. */
        private long indexAtOrAfter(long tFs) {
            return (long) Math.ceil((tFs - t0Fs) / periodFs);
        }

        @Override
        public void finish() {
            process(true);
            if (acc == null || acc.inRange() + acc.outOfRange() == 0) {
                throw new org.lanesift.plugin.InputFormatException("eye-diagram '" + ctx.instanceId() + "': no samples to fold"
                        + (samplesSeen == 0 ? " (input 'signal' received none)"
                        : clockMode ? " (" + clockEdges + " clock edges arrived on input 'clock'; at least 2 are needed, or set option bitRateHz)" : ""));
            }
            if (acc.inRange() == 0) {
                throw new org.lanesift.plugin.InputFormatException("eye-diagram '" + ctx.instanceId() + "': all " + acc.outOfRange()
                        + " samples fell outside the voltage range " + Math.round(acc.minVolts() * 1000) + " to "
                        + Math.round((acc.minVolts() + acc.heightBins() / acc.binsPerVolt()) * 1000) + " mV; set option rangeMv");
            }
            double uiFs;
            if (clockMode) {
                double spanFs = clockEdges >= 2 ? (double) (edgeTimes[tail - 1] - firstEdge) : Double.NaN;
                uiFs = spanFs / ((clockEdges - 1) * (double) uiPerInterval);
            } else {
                uiFs = 1e15 / bitRateHz;
            }
            EyeAnalysis e = new EyeAnalysis(acc, uiCount, uiFs, samplePoint, align, offsetUi, thresholdMv, mask);
            String id = ctx.instanceId();
            String title = "eye diagram of " + signalChannel + ": " + acc.inRange() + " samples, "
                    + (clockMode ? "folded on " + clockEdges + " clock edges" : "folded at " + EyeRenderer.fmt(bitRateHz / 1e6) + " Mbit/s");
            byte[] png = EyeRenderer.render(e, title);
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-eye.png", "image/png", png));
            ctx.emit(0, new Artifact(id, firstFs, lastFs, id + "-eye.json", "application/json", json(e, uiFs)));
            boolean unknown = Double.isNaN(e.eyeHeightMv) || Double.isNaN(e.eyeWidthUi);
            boolean open = !unknown && e.eyeHeightMv > 0 && e.eyeWidthUi > 0;
            Annotation.Builder a = Annotation.on(id, unknown ? "eye-unmeasured" : open ? "eye-opening" : "eye-closed")
                    .span(firstFs, lastFs)
                    .label(unknown ? "eye not measurable: " + (e.unmeasured != null ? e.unmeasured
                            : "no crossings of the threshold") : open
                            ? "eye " + EyeRenderer.fmt(e.eyeHeightMv) + " mV x " + EyeRenderer.fmt(e.eyeWidthPs()) + " ps"
                            : "eye closed at the sample point")
                    .severity(open ? Severity.INFO : Severity.WARNING)
                    .number("eyeHeightMv", e.eyeHeightMv, "mV")
                    .number("eyeWidthPs", e.eyeWidthPs(), "ps")
                    .number("eyeWidthUi", e.eyeWidthUi, "UI")
                    .number("uiPs", uiFs / 1000, "ps");
            ctx.annotate(a.build());
            if (mask != null && e.totalMaskHits() > 0) {
                ctx.annotate(Annotation.on(id, "eye-mask-hits").span(firstFs, lastFs).severity(Severity.WARNING)
                        .label(e.totalMaskHits() + " samples inside the eye mask")
                        .number("hits", (double) e.totalMaskHits(), "").build());
            }
            long total = acc.inRange() + acc.outOfRange();
            if (acc.outOfRange() > total / 100) {
                ctx.annotate(Annotation.on(id, "eye-clipped").span(firstFs, lastFs).severity(Severity.WARNING)
                        .label(acc.outOfRange() + " of " + total + " samples outside the plot's voltage range; set rangeMv")
                        .number("outOfRange", (double) acc.outOfRange(), "").build());
            }
        }

        private byte[] json(EyeAnalysis e, double uiFs) {
            JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull().beginObject();
            j.field("instance", ctx.instanceId());
            j.field("plugin", ID);
            j.field("channel", signalChannel);
            j.field("foldedOn", clockMode ? "clock" : "bitRate");
            if (clockMode) {
                j.field("clockEdges", clockEdges);
            } else {
                j.field("bitRateHz", bitRateHz);
            }
            Sourced.of(uiFs / 1000, "ps", clockMode ? Source.measured("clock interval / uiPerClockInterval")
                    : Source.given("option bitRateHz")).field(j, "uiPs");
            j.field("uiCount", uiCount);
            j.field("samples", acc.inRange());
            j.field("samplesOutOfRange", acc.outOfRange());
            j.field("samplesUnclocked", unclocked);
            j.field("widthBins", e.acc.widthBins());
            j.field("heightBins", e.acc.heightBins());
            Source range = ctx.options().getNumbers("rangeMv").isEmpty() ? Source.measured("from the first " + RANGE_SAMPLES + " samples")
                    : Source.given("option rangeMv");
            Sourced.of(e.rowMv(0), "mV", range).field(j, "rangeMinMv");
            Sourced.of(e.rowMv(e.acc.heightBins()), "mV", range).field(j, "rangeMaxMv");
            Sourced.of(1000 / e.acc.binsPerVolt(), "mV", Source.derived("range / heightBins")).field(j, "binMv");
            Sourced.of(uiFs / e.binsPerUi / 1000, "ps", Source.derived("unit interval / bins per UI")).field(j, "binPs");
            Source rails = Source.measured("mean of the rails at the sample point");
            Sourced.of(e.lowMv, "mV", rails).field(j, "lowLevelMv");
            Sourced.of(e.highMv, "mV", rails).field(j, "highLevelMv");
            Sourced.of(e.thresholdMv, "mV", ctx.options().getNumbers("thresholdMv").isEmpty()
                    ? Source.derived("midway between the two levels") : Source.given("option thresholdMv")).field(j, "thresholdMv");
            j.field("aligned", align);
            Sourced.of(e.crossingUi, "UI", Source.measured("where the traces cross the threshold")).field(j, "crossingUi");
            double samplePoint = ctx.options().getDouble("samplePoint");
            Sourced.of(e.samplePointUi, "UI", samplePoint == DEFAULT_SAMPLE_POINT_UI
                    ? Source.assumed("the middle of the unit interval, common practice") : Source.given("option samplePoint"))
                    .field(j, "samplePointUi");
            if (e.unmeasured != null) {
                j.field("unmeasured", e.unmeasured);
            }
            Source eye = Source.measured("empty bins of the eye, see definition");
            Sourced.of(e.eyeHeightMv, "mV", eye).field(j, "eyeHeightMv");
            Sourced.of(e.eyeHeight3SigmaMv, "mV", Source.measured("rail statistics at the sample point, see definition"))
                    .field(j, "eyeHeight3SigmaMv");
            Sourced.of(e.eyeWidthUi, "UI", eye).field(j, "eyeWidthUi");
            Sourced.of(e.eyeWidthPs(), "ps", eye).field(j, "eyeWidthPs");
            j.field("definition", "height: empty bins around the threshold at the sample point (+/-1 column); "
                    + "width: empty bins along the threshold row around the sample point; "
                    + "height3Sigma: (mean - 3 sd) of the upper rail minus (mean + 3 sd) of the lower rail at the sample point");
            if (mask != null) {
                j.name("mask").beginObject();
                j.field("file", ctx.options().getString("maskFile"));
                j.field("hits", e.totalMaskHits());
                j.name("polygons").beginArray();
                for (int p = 0; p < mask.polygons.size(); p++) {
                    j.beginObject().field("name", mask.polygons.get(p).name()).field("hits", e.maskHits[p]).endObject();
                }
                j.endArray();
                j.endObject();
            }
            j.endObject();
            return (j.finish() + "\n").getBytes(StandardCharsets.UTF_8);
        }
    }
}
