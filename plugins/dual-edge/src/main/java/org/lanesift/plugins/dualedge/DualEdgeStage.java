package org.lanesift.plugins.dualedge;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.FindingRef;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;
import org.lanesift.time.Femtos;

/**
 * One running sampler: gathers the clock and lane edges, recovers the clock, plans sample points,
 * finds the phase, samples every lane once all inputs cover the margins' reach, and emits one
 * bit-stream block per lane per call. Keeps only what later bits still need.
 */
final class DualEdgeStage implements Stage {
    private final StageContext ctx;
    private final SamplerConfig cfg;
    private final EdgeQueue clockQ = new EdgeQueue("clock");
    private final EdgeQueue[] laneQ;
    private final LaneSampler[] lanes;
    private final ClockRecovery cr;
    private final SamplePlanner planner;
    private final SampleBuf sb;
    private final AnnotationQueue notes;
    private boolean phaseKnown;
    private boolean phaseIsUi;
    private double phaseUi;
    private double phaseFs;
    private EyeSearch.Window eye;
    private EyeSearch.Window[] laneEyes;
    private int searchedBits;
    private long prevBlockEnd = Long.MIN_VALUE;
    private long emittedBits;
    private double uiSumAll;
    private boolean done;
    /**
     * Sample points the first block holds at least (fewer only when the stream ends before that
     * many): the lanes' skew is judged on the first this many points ({@link #judgeLaneSkew}), so
     * that the judgement does not depend on how the inputs were cut into blocks. The smaller of
     * two passes ({@link #CHUNK} accepted clock edges each) and {@code searchBits}: with autoPhase
     * the first block holds the searched points anyway. Later blocks go out as soon as their
     * points are ready.
     */
    private final int firstBlockPoints;
    /** Whether {@link #askMargins()} has run. */
    private boolean marginsAsked;
    /** Per input (clock, then lanes): its sample grid was judged against the unit interval. */
    private final boolean[] gridJudged;
    /** Per lane: the lane's eye lies so far from the clock's bit centre that its bits may be those of a neighbouring slot. */
    private final boolean[] skewAmbiguous;
    private final boolean[] skewJudged;
    /** Per lane: the lane-skew-ambiguous finding its flagged bits are the consequence of, or null. */
    private final FindingRef[] skewFinding;
    /** A lane's eye centre this far from the sample point (UI) makes its slot ambiguous. */
    static final double AMBIGUOUS_OFFSET_UI = 0.35;
    /** Bits with a transition within reach on both sides needed to judge a lane's eye centre. */
    static final int SKEW_JUDGE_BITS = 64;

    DualEdgeStage(StageContext ctx, SamplerConfig cfg) {
        this.ctx = ctx;
        this.cfg = cfg;
        this.notes = new AnnotationQueue(ctx);
        laneQ = new EdgeQueue[cfg.lanes()];
        lanes = new LaneSampler[cfg.lanes()];
        for (int i = 0; i < cfg.lanes(); i++) {
            laneQ[i] = new EdgeQueue("lane" + i);
            lanes[i] = new LaneSampler(i, laneQ[i], cfg.marginThreshold(), cfg.marginFindings());
        }
        gridJudged = new boolean[cfg.lanes() + 1];
        skewAmbiguous = new boolean[cfg.lanes()];
        skewJudged = new boolean[cfg.lanes()];
        firstBlockPoints = Math.min(2 * CHUNK, cfg.searchBits());
        skewFinding = new FindingRef[cfg.lanes()];
        cr = new ClockRecovery(cfg, clockQ, notes);
        planner = new SamplePlanner(cfg);
        sb = new SampleBuf(cfg.marginThreshold());
        if (!cfg.autoPhase()) {
            phaseKnown = true;
            phaseIsUi = cfg.phaseIsUi();
            phaseUi = cfg.phaseUi();
            phaseFs = cfg.phaseFs();
        }
    }

    @Override
    public void accept(int input, Block block) {
        Edges e = (Edges) block;
        (input == 0 ? clockQ : laneQ[input - 1]).append(e);
        advance(false);
    }

    @Override
    public void finish() {
        if (done) {
            return;
        }
        advance(true);
        done = true;
        for (LaneSampler l : lanes) {
            l.closeRun(notes);
        }
        if (ctx.isConnected(cfg.lanes())) {
            long start = clockQ.started ? clockQ.startFs : 0;
            long end = clockQ.started ? clockQ.endFs : 0;
            for (EdgeQueue q : laneQ) {
                if (q.started) {
                    start = Math.min(start, q.startFs);
                    end = Math.max(end, q.endFs);
                }
            }
            ctx.emit(cfg.lanes(), new Artifact(ctx.instanceId(), start, Math.max(start, end), ctx.instanceId() + "-margins.json",
                    "application/json", report().getBytes(StandardCharsets.UTF_8)));
        }
        notes.flushAll();
    }

    /** Accepted clock edges handled per pass, so that the working arrays stay in the cache. */
    static final int CHUNK = 4096;

    private void advance(boolean finishing) {
        long hClock = clockQ.started ? clockQ.endFs : Long.MIN_VALUE;
        long hData = Long.MAX_VALUE;
        for (EdgeQueue q : laneQ) {
            hData = Math.min(hData, q.started ? q.endFs : Long.MIN_VALUE);
        }
        // look at the clock only a little ahead of the data; the rest waits in the queue
        long limit = hData == Long.MIN_VALUE ? Long.MIN_VALUE
                : cr.hasPeriod() ? satAdd(hData, (long) (4 * cr.periodFs())) : Long.MAX_VALUE;
        boolean more;
        do {
            more = cr.run(hClock, finishing, limit, CHUNK);
            planner.consume(cr, sb, hClock, clockQ.started ? clockQ.endFs : Long.MIN_VALUE);
            if (!phaseKnown) {
                search(hData, finishing);
            }
            if (phaseKnown) {
                sb.applyPhase(phaseIsUi, phaseUi, phaseFs);
                emitReady(hData, finishing && !more);
            }
            discardOld();
        } while (more);
    }

    private static long satAdd(long a, long b) {
        long r = a + b;
        return ((a ^ r) & (b ^ r)) < 0 ? Long.MAX_VALUE : r;
    }

    private void search(long hData, boolean finishing) {
        int m = Math.min(sb.n, cfg.searchBits());
        if (!finishing) {
            if (sb.n < cfg.searchBits()) {
                return;
            }
            long need = sb.nominal[m - 1] + (long) Math.ceil(EyeSearch.REACH_UI * sb.ui[m - 1]);
            if (hData <= need) {
                return;
            }
        }
        phaseKnown = true;
        phaseIsUi = true;
        phaseUi = 0;
        searchedBits = m;
        if (m == 0) {
            return;
        }
        double[] all = new double[1024];
        int allLen = 0;
        int[] len = new int[1];
        laneEyes = new EyeSearch.Window[lanes.length];
        for (int i = 0; i < lanes.length; i++) {
            double[] one = EyeSearch.collect(laneQ[i], sb, m, new double[256], 0, len);
            int n = len[0];
            if (allLen + n > all.length) {
                all = Arrays.copyOf(all, Math.max(all.length * 2, allLen + n));
            }
            System.arraycopy(one, 0, all, allLen, n);
            allLen += n;
            laneEyes[i] = EyeSearch.widest(one, n);
        }
        eye = EyeSearch.widest(all, allLen);
        phaseUi = eye.centreUi();
        long a = sb.nominal[0];
        long b = Math.max(a, sb.nominal[m - 1]);
        notes.add(Annotation.on(ClockRecovery.TRACK, "eye-centre").span(a, b).severity(Severity.INFO)
                .label(String.format(Locale.ROOT, "sampling at %+.3f UI (window %.3f UI)", eye.centreUi(), eye.widthUi()))
                .number("phaseUI", eye.centreUi(), "UI").number("windowUI", eye.widthUi(), "UI")
                .field("transitions", org.lanesift.annotation.Field.integer(eye.transitions(), "")).build());
        if (eye.widthUi() < 2 * cfg.marginThreshold()) {
            notes.add(Annotation.on(ClockRecovery.TRACK, "eye-closed").span(a, b).severity(Severity.ERROR)
                    .label(String.format(Locale.ROOT, "widest transition-free window only %.3f UI", eye.widthUi()))
                    .number("windowUI", eye.widthUi(), "UI").build());
        }
    }

    private void emitReady(long hData, boolean finishing) {
        while (true) {
            int ready;
            int cap = Math.min(sb.n, 2 * CHUNK);
            if (finishing) {
                ready = cap;
            } else {
                ready = 0;
                while (ready < cap && sb.s[ready] + (long) Math.ceil(sb.ui[ready]) < hData) {
                    ready++;
                }
            }
            if (ready == 0 || (emittedBits == 0 && !finishing && ready < firstBlockPoints)) {
                return;
            }
            emit(ready, finishing);
        }
    }

    /**
     * Asks once, at the first block, whether anything downstream reads each lane's per-bit margins
     * (host-api {@code StageContext.wantsBitMargins}); a lane whose margins nobody reads sends its
     * bits without them, and its sampler reuses its margin arrays.
     */
    private void askMargins() {
        marginsAsked = true;
        for (int i = 0; i < lanes.length; i++) {
            lanes[i].keepMargins = ctx.wantsBitMargins(i);
        }
    }

    /**
     * Hands on the first {@code ready} sample points as one block per lane. No loop of its own: the
     * per-point loops are {@link SampleBuf}'s, so that the JIT compiles this method once, when it
     * has been called often enough, instead of compiling it again for every loop that runs long
     * in it (on-stack replacement), each time with the lane samplers inlined.
     */
    private void emit(int ready, boolean finishing) {
        if (!marginsAsked) {
            askMargins();
        }
        SampleBuf.Summary span = sb.summarize(ready);
        long minS = span.minS();
        long maxS = span.maxS();
        double uiSum = span.uiSum();
        long reach = (long) Math.ceil(2 * span.maxUi());
        long[] times = Arrays.copyOf(sb.s, ready);
        long[] edges = Arrays.copyOf(sb.edge, ready);
        long[] falling = sb.fallingBits(ready);
        byte[] slot = cfg.mode() == SamplerConfig.Mode.MULTIPLIED ? Arrays.copyOf(sb.slot, ready) : null;
        long start = Math.max(prevBlockEnd, times[0]);
        long end = Math.max(start, maxS + 1);
        prevBlockEnd = end;
        double meanUi = uiSum / ready;
        judgeGrid(meanUi);
        List<FindingRef> clockBreaks = notes.takeClockBreaks();
        for (int i = 0; i < lanes.length; i++) {
            EdgeQueue q = laneQ[i];
            boolean fast = q.started && minS >= 0 && minS - reach >= q.startFs && (!finishing || maxS + reach < q.endFs)
                    && !(q.hasSpans() && q.spanOverlaps(minS - reach, maxS + reach));
            LaneSampler l = lanes[i];
            l.sample(sb, ready, fast, finishing, notes);
            judgeLaneSkew(i, l, ready, times[0], maxS);
            if (skewAmbiguous[i]) {
                BitSets.setRange(l.flagged, 0, ready);
            }
            BitStream bs = new BitStream(q.channel != null ? q.channel : "lane" + i, start, end, ready, l.values, times, edges,
                    falling, slot, l.keepMargins ? l.setup : null, l.keepMargins ? l.hold : null, l.flagged, meanUi, causes(clockBreaks, skewFinding[i]));
            ctx.emit(i, bs);
        }
        emittedBits += ready;
        uiSumAll += uiSum;
        sb.removePrefix(ready);
    }

    /** The findings a lane's block names as the cause of its flags and clock breaks. */
    private static List<FindingRef> causes(List<FindingRef> clockBreaks, FindingRef skew) {
        if (skew == null) {
            return clockBreaks;
        }
        List<FindingRef> l = new ArrayList<>(clockBreaks);
        l.add(skew);
        return l;
    }

    /**
     * Refuses a logic capture sampled too slowly for the link: once an input has
     * {@link SampleGrid#MIN_EDGES} edges queued, the grid they lie on (if any) must be finer than
     * half a unit interval. Edges on the bit grid itself (grid = one UI: a simulation or an exact
     * generator) lose nothing and pass; a grid of several UI is a capture that lost edges.
     */
    private void judgeGrid(double uiFs) {
        for (int k = 0; k <= lanes.length; k++) {
            EdgeQueue q = k == 0 ? clockQ : laneQ[k - 1];
            if (gridJudged[k] || q.tail - q.head < SampleGrid.MIN_EDGES) {
                continue;
            }
            gridJudged[k] = true;
            double g = SampleGrid.periodFs(q.t, q.head, q.tail);
            if (Double.isNaN(g) || g * SampleGrid.MIN_SAMPLES_PER_UI <= uiFs * (1 + 1e-6)) {
                continue;
            }
            if (Math.abs(g / uiFs - 1) < 0.01) {
                continue; // edges on the bit grid itself: an exact source (a simulation), nothing lost
            }
            // the clock itself is measured on the same coarse grid: a clock with a period below two grid
            // steps shows as a slower one (aliasing, sampling theorem; common practice), so the unit
            // interval derived from it is a fact only if the period measured is the clock's own
            double periodFs = uiFs * cfg.uiPerPeriod();
            double minRate = SampleGrid.MIN_SAMPLES_PER_UI * 1e15 / uiFs;
            throw new org.lanesift.plugin.InputFormatException(String.format(Locale.ROOT,
                    "input '%s' (channel '%s'): its edges lie on a %s sample grid (%s), too coarse for this link;"
                            + " the clock period measured on that grid is %s (%d unit intervals per period: %s each only if that"
                            + " period is the clock's own), but on this grid a clock faster than one period per 2 samples (%s)"
                            + " shows as a slower one, so the link's unit interval cannot be known from this capture; rule: a logic capture needs at least %.0f"
                            + " samples per unit interval (Ts <= UI / 2) to place every bit, so at least %s for the period measured"
                            + " and more if the clock is faster than it appears: capture again faster, or capture the legs as analog",
                    q.port, q.channel, Femtos.format(g), rate(1e15 / g), Femtos.format(periodFs), cfg.uiPerPeriod(),
                    Femtos.format(uiFs), Femtos.format(2 * g), SampleGrid.MIN_SAMPLES_PER_UI, rate(minRate)));
        }
    }

    /**
     * Judges once where a lane's eye sits against the sample point: half the difference of setup
     * and hold margin, averaged over the bits of this block that have a transition within reach on
     * both sides, is the offset of the lane's transitions from the mid-points between sample points.
     * On the first block only its first {@link #firstBlockPoints} sample points count, and the
     * first block holds at least that many however the inputs were cut, so the judgement does not
     * depend on the cuts when the lane has {@value #SKEW_JUDGE_BITS} such bits among them; a lane
     * with fewer (idle at the start) is judged on the first later block that has them.
     * A skew s of the lane against the clock shows as s wrapped into [-0.5, 0.5) UI: beyond
     * {@value #AMBIGUOUS_OFFSET_UI} UI the lane may equally be skewed by s or by s - 1 UI the
     * other way, that is by more than half a UI, and then every bit belongs to the neighbouring
     * slot and still shows wide margins. Such a lane's bits are flagged (the decode is marked suspect)
     * and one warning names it.
     */
    private void judgeLaneSkew(int lane, LaneSampler l, int ready, long a, long b) {
        if (skewJudged[lane]) {
            return;
        }
        double sum = 0;
        int n = 0;
        int upTo = emittedBits == 0 ? Math.min(ready, firstBlockPoints) : ready;
        for (int i = 0; i < upTo; i++) {
            long su = l.setup[i];
            long ho = l.hold[i];
            if (su != LaneSampler.UNKNOWN && ho != LaneSampler.UNKNOWN) {
                sum += 0.5 * (su - ho) / sb.ui[i];
                n++;
            }
        }
        if (n < SKEW_JUDGE_BITS) {
            return;
        }
        skewJudged[lane] = true;
        double offsetUi = sum / n;
        if (Math.abs(offsetUi) > AMBIGUOUS_OFFSET_UI) {
            skewAmbiguous[lane] = true;
            // one finding for the lane: its margin runs (this block's held ones and all later) are not annotated
            l.quiet = true;
            notes.withdraw(l.track, "margin-low");
            String name = laneQ[lane].channel != null ? laneQ[lane].channel : "lane" + lane;
            double other = offsetUi > 0 ? offsetUi - 1 : offsetUi + 1;
            notes.add(Annotation.on(lanes[lane].track, "lane-skew-ambiguous").span(a, Math.max(a, b)).severity(Severity.ERROR)
                    .label(String.format(Locale.ROOT, "%s: transitions %+.2f UI from the sample point's mid-points; skewed by %+.2f or"
                            + " %+.2f UI against the clock, its bits may belong to the neighbouring slot: bits flagged", name,
                            offsetUi, offsetUi, other))
                    .number("offsetUI", offsetUi, "UI").text("lane", name).build());
            skewFinding[lane] = new FindingRef(ctx.instanceId(), "lane-skew-ambiguous", a, FindingRef.Effect.FLAGGED_BITS, a,
                    Long.MAX_VALUE);
        }
    }

    private static String rate(double perSecond) {
        return NumberStyle.shortest().format(Math.round(perSecond / 1e4) / 100.0) + " MS/s";
    }

    private static long sat(long a, long b) {
        long r = a - b;
        return ((a ^ b) & (a ^ r)) < 0 ? Long.MIN_VALUE : r;
    }

    /** Without a clock period, lane transitions older than this before the clock's frontier are dropped. */
    static final long NO_CLOCK_KEEP_FS = 1_000_000_000_000L; // 1 ms

    private void discardOld() {
        if (!cr.hasPeriod()) {
            // no clock yet: no sample can reach back further than one UI before the first clock edge
            // still to come; without a period, keep a generous 1 ms so memory stays bounded
            if (clockQ.started) {
                long keep = sat(cr.frontierFs(clockQ.endFs), NO_CLOCK_KEEP_FS);
                if (keep != Long.MIN_VALUE) {
                    for (EdgeQueue q : laneQ) {
                        q.discardBeforeTime(keep);
                    }
                }
            }
            return;
        }
        long from = Long.MAX_VALUE;
        if (sb.n > 0) {
            from = Math.min(from, sb.nominal[0]);
            if (sb.applied > 0) {
                from = Math.min(from, sb.s[0]);
            }
        }
        from = Math.min(from, planner.frontierFs());
        from = Math.min(from, cr.frontierFs(clockQ.endFs));
        long last = cr.lastAcceptedFs();
        long slack = (long) (2 * cr.periodFs() + (phaseIsUi ? Math.abs(phaseUi) * cr.periodFs() : Math.abs(phaseFs)));
        long keep = sat(from, slack);
        if (keep != Long.MIN_VALUE) {
            for (EdgeQueue q : laneQ) {
                q.discardBeforeTime(keep);
            }
        }
        long safe = Math.min(keep, last == Long.MIN_VALUE ? Long.MIN_VALUE : sat(last, slack));
        for (LaneSampler l : lanes) {
            safe = Math.min(safe, l.openRunStart());
        }
        notes.flush(safe);
    }

    private String report() {
        JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull();
        j.beginObject();
        j.name("instance").value(ctx.instanceId());
        j.name("plugin").value(DualEdgePlugin.ID);
        j.name("mode").value(cfg.mode().option);
        j.name("laneCount").value(cfg.lanes());
        if (cfg.mode() == SamplerConfig.Mode.MULTIPLIED) {
            j.name("slots").value(cfg.slots());
            j.name("clockPattern").value(cfg.pattern());
        }
        Sourced.of(cfg.marginThreshold(), "UI", cfg.marginThreshold() == DualEdgePlugin.DEFAULT_MARGIN_THRESHOLD_UI
                ? Source.assumed("0.15 UI, common practice") : Source.given("option marginThreshold")).field(j, "marginThresholdUI");
        Sourced.of(1.0, "UI", Source.derived("by construction: a margin is measured up to one unit interval")).field(j, "marginReachUI");
        double meanUi = emittedBits > 0 ? uiSumAll / emittedBits : Double.NaN;
        Sourced.of(meanUi, "fs", Source.measured("mean unit interval of the sampled bits")).field(j, "unitIntervalFs");
        j.name("bitsPerLane").value(emittedBits);
        j.name("clock").beginObject();
        j.name("channel").value(clockQ.channel);
        j.name("acceptedEdges").value(cr.acceptedEdges());
        j.name("glitches").value(cr.glitches());
        j.name("dropouts").value(cr.dropouts());
        j.name("restarts").value(cr.restarts());
        j.name("periodFs").beginObject();
        j.name("mean").value(cr.periodMean());
        j.name("std").value(cr.periodStd());
        j.name("min").value(cr.stats().periodMinFs());
        j.name("max").value(cr.stats().periodMaxFs());
        j.name("intervals").value(cr.stats().intervals());
        j.endObject();
        Sourced.of(cr.frequencyHz(), "Hz", Source.measured("1 / mean clock period")).field(j, "frequencyHz");
        j.name("duty").beginObject();
        j.name("mean").value(cr.stats().dutyMean());
        j.name("min").value(cr.stats().dutyMin());
        j.name("max").value(cr.stats().dutyMax());
        j.name("atAcquisition").value(cr.acquiredDuty());
        j.endObject();
        if (cfg.mode() == SamplerConfig.Mode.MULTIPLIED) {
            j.name("inverted").value(cr.pattern().inverted());
            j.name("slot0").value(cr.pattern().verdict());
            j.name("pixels").value(planner.pixels);
            j.name("pixelsDroppedAtDropouts").value(planner.pixelsDropped);
        }
        j.endObject();
        j.name("phase").beginObject();
        j.name("alignment").value(cfg.mode() == SamplerConfig.Mode.MULTIPLIED ? "slot-centre" : cfg.edgeAligned() ? "edge" : "center");
        Source given = cfg.autoPhase() ? Source.measured("centre of the widest transition-free window (autoPhase)")
                : phaseIsUi && phaseUi == 0 ? Source.assumed("0 UI, the sample point the alignment gives") : Source.given("option phase");
        Source other = cfg.autoPhase() ? given : Source.derived("the phase times the mean unit interval");
        if (phaseIsUi) {
            Sourced.of(phaseUi, "UI", given).field(j, "phaseUI");
            Sourced.of(phaseUi * meanUi, "fs", other).field(j, "phaseFs");
        } else {
            Sourced.of(phaseFs, "fs", given).field(j, "phaseFs");
            Sourced.of(phaseFs / meanUi, "UI", other).field(j, "phaseUI");
        }
        if (cfg.autoPhase()) {
            j.name("search").beginObject();
            j.name("bits").value(searchedBits);
            if (eye != null) {
                writeWindow(j, eye);
                j.name("perLane").beginArrayInline();
                for (int i = 0; i < laneEyes.length; i++) {
                    j.beginObject();
                    j.name("lane").value(i);
                    writeWindow(j, laneEyes[i]);
                    j.endObject();
                }
                j.endArray();
            }
            j.endObject();
        }
        j.endObject();
        j.name("lanes").beginArrayInline();
        for (int i = 0; i < lanes.length; i++) {
            LaneSampler l = lanes[i];
            MarginStats st = l.stats;
            st.merge();
            j.beginObject();
            j.name("lane").value(i);
            j.name("channel").value(laneQ[i].channel);
            j.name("bits").value(st.bits);
            j.name("flagged").value(st.flagged);
            j.name("unknownSamples").value(st.unknown);
            j.name("flaggedRuns").value(st.lowRuns);
            st.writeMargin(j, "setup", st.setupHist, st.setupKnown(), st.minSetupFs, st.minSetupUi, meanUi);
            st.writeMargin(j, "hold", st.holdHist, st.holdKnown(), st.minHoldFs, st.minHoldUi, meanUi);
            j.endObject();
        }
        j.endArray();
        j.endObject();
        return j.finish() + "\n";
    }

    private static void writeWindow(JsonWriter j, EyeSearch.Window w) {
        Source found = Source.measured("transition-free window of the searched bits");
        Sourced.of(w.centreUi(), "UI", found).field(j, "centreUI");
        Sourced.of(w.widthUi(), "UI", found).field(j, "windowUI");
        Sourced.of(w.leftUi(), "UI", found).field(j, "leftUI");
        Sourced.of(w.rightUi(), "UI", found).field(j, "rightUI");
        j.name("transitions").value(w.transitions());
    }
}
