package org.lanesift.plugins.differential;

import java.nio.charset.StandardCharsets;
import java.util.Locale;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The stage for analog modes: the {@link LegAligner} lines the legs up, the {@link WarmupLearner}
 * learns the levels, the {@link Comparator} runs chunk by chunk, windowed {@link LevelAcc}
 * statistics feed the {@link LevelTracker} (drift), the {@link WindowFindings} (level checks) and
 * the {@link LevelReport}; {@link InvalidRuns} annotates invalid input; {@link PairSignals} gives
 * P-N and (P+N)/2 when asked for. Reads received blocks only during {@link #accept} (they may be
 * lent: host-api {@code Block}, "Ownership"); what it needs later is copied.
 */
final class AnalogStage implements Stage, LegAligner.Sink {
    static final int OUT_EDGES = 0;
    static final int OUT_LOGIC = 1;
    static final int OUT_REPORT = 2;
    /** Most windows kept for the report; beyond that neighbours are merged. */
    static final int MAX_REPORT_WINDOWS = LevelReport.MAX_WINDOWS;
    private static final float[] NO_VOLTS = new float[0];
    private static final long[] NO_BITS = new long[0];

    private final StageContext ctx;
    private final Settings s;
    private final String levelsTrack;
    private final LegAligner legs;
    private final WarmupLearner learner;
    private final LevelTracker tracker;
    private final WindowFindings findings;
    private final LevelReport report;
    private final InvalidRuns invalid;
    /** The optional analog outputs P-N and (P+N)/2; null unless mode pair asks for one. */
    private final PairSignals pair;

    private double periodFs = Double.NaN;
    private double adaptSamples;
    private long originFs;
    /** Capture sample number of the first aligned sample (of leg p), for the analog outputs. */
    private long originIndex;
    private Comparator cmp;
    private boolean learning;
    private WarmupLearner.Result initial = new WarmupLearner.Result(Double.NaN, Double.NaN, "");

    private LevelAcc window;
    private final LevelAcc capture = new LevelAcc(0);
    private boolean finished;

    AnalogStage(StageContext ctx, Settings s) {
        this.ctx = ctx;
        this.s = s;
        this.levelsTrack = s.channel + ".levels";
        this.legs = new LegAligner(s.mode == Settings.Mode.PAIR);
        this.learner = new WarmupLearner(ctx, s, levelsTrack);
        this.tracker = new LevelTracker(s);
        this.findings = new WindowFindings(ctx, s, levelsTrack);
        this.report = new LevelReport(s);
        this.invalid = new InvalidRuns(ctx, s.channel);
        this.learning = s.needsWarmup();
        this.pair = s.diffOutput || s.commonOutput ? new PairSignals(ctx, s.channel) : null;
    }

    @Override
    public void accept(int input, Block block) {
        AnalogBlock b = (AnalogBlock) block;
        if (Double.isNaN(periodFs)) {
            periodFs = b.periodFs();
            adaptSamples = s.adaptSamples(periodFs);
        }
        if (b.length() == 0) {
            return;
        }
        legs.add(input, b, periodFs);
        legs.pump(periodFs, this);
        // nothing may refer to a received block's arrays once accept returns (they may be lent):
        // the comparator keeps the tail of its last chunk as history when the next chunk begins, so
        // an empty chunk makes it do that now; then the legs still waiting are copied
        if (cmp != null) {
            cmp.beginChunk(NO_VOLTS, 0, null, 0, 0, null, NO_BITS);
        }
        legs.detach();
    }

    @Override
    public void start(AnalogBlock first, int offset) {
        if (cmp != null) {
            return;
        }
        originFs = first.startFs() + Math.round(offset * periodFs);
        originIndex = first.firstIndex() + offset;
        invalid.origin(originIndex);
        cmp = new Comparator(originFs, periodFs, s.cubic, invalid);
        cmp.setInvert(s.invert);
        window = new LevelAcc(0);
        if (!learning) {
            cmp.setThreshold(s.givenThresholdVolts(), s.hysteresisVolts, 0);
            initial = new WarmupLearner.Result(s.givenThresholdVolts(), s.hysteresisVolts, "given");
        }
    }

    @Override
    public void feed(Chunk c) {
        if (learning) {
            if (learner.add(c)) {
                learn();
            }
            return;
        }
        process(c);
    }

    private void learn() {
        learning = false;
        initial = learner.learn(cmp, originFs, tracker);
        cmp.setThreshold(initial.thresholdVolts(), initial.hysteresisVolts(), 0);
        for (Chunk c : learner.drain()) {
            process(c);
        }
    }

    // ---------------------------------------------------------------- processing

    private void process(Chunk c) {
        long base = cmp.nextIndex();
        long[] bits = new long[BitSets.words(c.len())];
        cmp.beginChunk(c.a(), c.ao(), c.b(), c.bo(), c.len(), c.inv(), bits);
        int windowSamples = s.windowSamples;
        int pos = 0;
        if (!s.levelReport && !s.autoThreshold() && !s.autoHysteresis()) {
            // no report and nothing learned to follow: the windows' statistics would go unused
            cmp.runSegment(0, c.len());
            pos = c.len();
        }
        while (pos < c.len()) {
            long abs = base + pos;
            long winEnd = (abs / windowSamples + 1) * windowSamples;
            int e = (int) Math.min(c.len(), pos + (winEnd - abs));
            float thr = cmp.threshold();
            float half = cmp.hysteresis() / 2;
            float settled = Math.max(half, tracker.settledHalfBand());
            cmp.runSegment(pos, e);
            window.add(c.a(), c.ao(), c.b(), c.bo(), base, pos, e, bits, cmp.chunkInvalid(), thr, half, settled, s.statsStride,
                    s.profile.levelMaxAbsVolts());
            pos = e;
            if (base + e == winEnd) {
                endWindow();
            }
        }
        long[] inv = cmp.chunkInvalid();
        if (ctx.isConnected(OUT_LOGIC)) {
            if (cmp.invert()) {
                for (int w = 0; w < bits.length; w++) {
                    bits[w] = ~bits[w];
                }
                if ((c.len() & 63) != 0) {
                    bits[bits.length - 1] &= (1L << c.len()) - 1;
                }
            }
            ctx.emit(OUT_LOGIC, new LogicBlock(s.channel, base, cmp.timeAt(base, 0), periodFs, bits, c.len(), inv));
        }
        if (pair != null && pair.wanted()) {
            pair.emit(c, originIndex + base, cmp.timeAt(base, 0), periodFs, inv);
        }
        Edges e = cmp.takeEdges(s.channel, false);
        if (e != null) {
            ctx.emit(OUT_EDGES, e);
        }
    }

    private void endWindow() {
        LevelAcc w = window;
        window = new LevelAcc(w.endIndex);
        if (w.samples == 0) {
            return;
        }
        capture.merge(w);
        report.add(w);
        findings.judge(LevelReport.quantities(s, w), cmp.timeAt(w.startIndex, 0), cmp.timeAt(w.endIndex, 0));
        tracker.adapt(w, adaptSamples, cmp);
    }

    // ---------------------------------------------------------------- end of stream

    @Override
    public void finish() {
        if (finished) {
            return;
        }
        finished = true;
        legs.dropIfUnaligned();
        if (cmp == null) {
            return;
        }
        if (learning) {
            learn();
        }
        int rest = legs.legWithLeftovers();
        if (rest >= 0) {
            int other = 1 - rest;
            long extra = legs.leftovers(rest);
            // information, not a warning: it says which samples were not used, and it comes from the
            // processing upstream (a leg deskew ends each channel at its own kernel margin), never
            // from the signal; the channels of one capture file have equal lengths
            ctx.annotate(Annotation.on(s.channel, "legs-unequal-length").span(cmp.timeAt(cmp.nextIndex(), 0),
                            cmp.timeAt(cmp.nextIndex() + extra, 0)).severity(Severity.INFO)
                    .label("leg '" + legs.inputName(rest) + "' has " + extra + " samples more than leg '" + legs.inputName(other)
                            + "'; they were not used")
                    .field("samples", Field.integer(extra, "")).build());
        }
        if (window.samples > 0) {
            endWindow();
        }
        report.close();
        findings.finish();
        Edges e = cmp.takeEdges(s.channel, true);
        if (e != null) {
            ctx.emit(OUT_EDGES, e);
        }
        long t0 = originFs;
        long t1 = cmp.timeAt(cmp.nextIndex(), 0);
        invalid.finish(t0, t1);
        if (!s.levelReport) {
            return;
        }
        Map<String, Double> q = LevelReport.quantities(s, capture);
        for (LevelProfile.Check ch : s.profile.checks) {
            Double v = q.get(ch.quantity());
            Severity sev = v == null ? null : ch.judge(v);
            if (sev == null) {
                continue;
            }
            // the capture-wide value of a quantity the windows already named is information: one fault, one finding
            boolean named = sev != Severity.INFO && findings.named(ch.quantity(), sev);
            Annotation.Builder b = Annotation.on(levelsTrack, "level-check").span(t0, t1).severity(named ? Severity.INFO : sev)
                    .label(String.format(Locale.ROOT, "%s %.1f mV, limit %s%s", ch.quantity(), v * 1e3, ch.limits(),
                            named ? " (named above for its windows)" : ""))
                    .field("quantity", Field.enumValue(ch.quantity())).number("valueVolts", v, "V")
                    .number("minVolts", ch.min(), "V").number("maxVolts", ch.max(), "V").text("source", ch.source());
            if (named) {
                b.field("verdict", Field.enumValue(sev.name().toLowerCase(Locale.ROOT)));
            }
            ctx.annotate(b.build());
        }
        ctx.annotate(Annotation.on(levelsTrack, "level-summary").span(t0, t1).severity(Severity.INFO)
                .label(String.format(Locale.ROOT, "levels %.3f / %.3f V, %d transitions", capture.mean(0), capture.mean(1),
                        cmp.transitionsTotal()))
                .number("lowLevelVolts", capture.mean(0), "V").number("highLevelVolts", capture.mean(1), "V")
                .number("commonModeVolts", capture.cmMean(), "V")
                .field("transitions", Field.integer(cmp.transitionsTotal(), "")).build());
        if (!ctx.isConnected(OUT_REPORT)) {
            return; // nothing reads the report (no wire, tap or host that wants it): its text is not made
        }
        LevelReport.Header h = new LevelReport.Header(ctx.instanceId(), periodFs, originFs, initial, invalid.count(), invalid.samples());
        byte[] json = report.json(h, cmp, capture, q).getBytes(StandardCharsets.UTF_8);
        ctx.emit(OUT_REPORT, new Artifact(s.channel, t0, t1, ctx.instanceId() + "-levels.json", "application/json", json));
    }
}
