package org.lanesift.plugins.differential;

import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
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
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The stage for analog modes: aligns the legs, learns the levels over a warm-up, runs the
 * comparator chunk by chunk, keeps windowed level statistics, checks them against the level
 * profile and writes the report.
 */
final class AnalogStage implements Stage {
    static final int OUT_EDGES = 0;
    static final int OUT_LOGIC = 1;
    static final int OUT_REPORT = 2;
    /** Most windows kept for the report; beyond that neighbours are merged. */
    static final int MAX_REPORT_WINDOWS = 2048;
    /** Most gap annotations; later gaps are only counted. */
    static final int MAX_GAP_ANNOTATIONS = 1000;
    /** Fewest settled samples per state for a window's levels to count. */
    static final long MIN_LEVEL_SAMPLES = 8;
    /** Samples count as settled on a level when at least this fraction of the way from the threshold to it. */
    static final double SETTLED_FRACTION = 0.7;

    private record Chunk(float[] a, int ao, float[] b, int bo, int len, long[] inv) {
    }

    private final StageContext ctx;
    private final Settings s;
    private final boolean twoLegs;
    private final String levelsTrack;
    private final List<ArrayDeque<AnalogBlock>> queues = new ArrayList<>();
    private final int[] headOffset;
    private final long[] expectedStart;
    private final String[] inputNames;
    private final boolean[] seen;
    private final long[] firstStart;
    private boolean aligned;
    private long skip = -1;
    private int skipLeg;

    private double periodFs = Double.NaN;
    private long originFs;
    private Comparator cmp;

    private boolean learning;
    private final List<Chunk> warm = new ArrayList<>();
    private long warmCount;

    private double levelLow = Double.NaN;
    private double levelHigh = Double.NaN;
    private boolean levelsLearned;
    /** Capture index of the stream's first sample, so that reported sample numbers count from the capture start. */
    private long originIndex;
    private double initialThreshold = Double.NaN;
    private double initialHysteresis = Double.NaN;
    private String thresholdSource = "";
    private double adaptSamples;

    private LevelAcc window;
    private final LevelAcc capture = new LevelAcc(0);
    private final List<LevelAcc> reportWindows = new ArrayList<>();
    private LevelAcc reportOpen;
    private int reportOpenCount;
    private int reportMerge = 1;
    private final Map<String, Run> runs = new LinkedHashMap<>();

    private long gapCount;
    private long gapSamples;
    private boolean finished;

    /** An open run of consecutive windows with the same finding for one quantity. */
    private static final class Run {
        final LevelProfile.Check check;
        final Severity severity;
        final long startFs;
        long endFs;
        double worst;
        int windows;

        Run(LevelProfile.Check check, Severity severity, long startFs, long endFs, double v) {
            this.check = check;
            this.severity = severity;
            this.startFs = startFs;
            this.endFs = endFs;
            this.worst = v;
            this.windows = 1;
        }
    }

    AnalogStage(StageContext ctx, Settings s) {
        this.ctx = ctx;
        this.s = s;
        this.twoLegs = s.mode == Settings.Mode.PAIR;
        int inputs = twoLegs ? 2 : 1;
        for (int i = 0; i < inputs; i++) {
            queues.add(new ArrayDeque<>());
        }
        headOffset = new int[inputs];
        expectedStart = new long[inputs];
        seen = new boolean[inputs];
        firstStart = new long[inputs];
        inputNames = twoLegs ? new String[] {"p", "n"} : new String[] {"in"};
        levelsTrack = s.channel + ".levels";
        learning = s.needsWarmup();
        aligned = !twoLegs;
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
        if (seen[input] && Math.abs(b.startFs() - expectedStart[input]) > periodFs / 2) {
            throw new IllegalArgumentException("input '" + inputNames[input] + "': block starts at " + b.startFs()
                    + " fs but the previous block ended at " + expectedStart[input]
                    + " fs; blocks of a channel must follow each other without gaps (mark missing samples invalid)");
        }
        if (!seen[input]) {
            seen[input] = true;
            firstStart[input] = b.startFs();
        }
        expectedStart[input] = b.startFs() + Math.round(b.length() * b.periodFs());
        queues.get(input).add(b);
        pump();
    }

    private void pump() {
        if (!aligned) {
            if (!seen[0] || !seen[1]) {
                return;
            }
            if (skip < 0) {
                // drop leading samples of the leg that started earlier so both share sample times
                long diff = firstStart[0] - firstStart[1];
                skip = Math.round(Math.abs(diff) / periodFs);
                skipLeg = diff > 0 ? 1 : 0;
            }
            ArrayDeque<AnalogBlock> q = queues.get(skipLeg);
            while (skip > 0 && !q.isEmpty()) {
                AnalogBlock h = q.peek();
                int take = (int) Math.min(skip, h.length() - headOffset[skipLeg]);
                headOffset[skipLeg] += take;
                skip -= take;
                if (headOffset[skipLeg] == h.length()) {
                    q.poll();
                    headOffset[skipLeg] = 0;
                }
            }
            if (skip > 0) {
                return;
            }
            aligned = true;
        }
        while (true) {
            AnalogBlock a = queues.get(0).peek();
            if (a == null) {
                return;
            }
            if (!twoLegs) {
                int off = headOffset[0];
                int len = a.length() - off;
                start(a, off);
                feed(new Chunk(a.volts(), off, null, 0, len, slice(a.invalid(), off, len, null, 0)));
                queues.get(0).poll();
                headOffset[0] = 0;
                continue;
            }
            AnalogBlock b = queues.get(1).peek();
            if (b == null) {
                return;
            }
            int ao = headOffset[0];
            int bo = headOffset[1];
            int len = Math.min(a.length() - ao, b.length() - bo);
            start(a, ao);
            feed(new Chunk(a.volts(), ao, b.volts(), bo, len, slice(a.invalid(), ao, len, b.invalid(), bo)));
            headOffset[0] += len;
            headOffset[1] += len;
            if (headOffset[0] == a.length()) {
                queues.get(0).poll();
                headOffset[0] = 0;
            }
            if (headOffset[1] == b.length()) {
                queues.get(1).poll();
                headOffset[1] = 0;
            }
        }
    }

    private void start(AnalogBlock first, int offset) {
        if (cmp != null) {
            return;
        }
        originFs = first.startFs() + Math.round(offset * periodFs);
        originIndex = first.firstIndex() + offset;
        cmp = new Comparator(originFs, periodFs, s.cubic, this::gap);
        cmp.setInvert(s.invert);
        window = new LevelAcc(0);
        if (!learning) {
            cmp.setThreshold(s.thresholdVolts, s.hysteresisVolts, 0);
            initialThreshold = s.thresholdVolts;
            initialHysteresis = s.hysteresisVolts;
            thresholdSource = "given";
        }
    }

    /** Copies {@code len} bits of two masks from bit offsets into one chunk-aligned mask, or null if none are set. */
    static long[] slice(long[] x, int xo, int len, long[] y, int yo) {
        boolean ax = x != null && BitSets.any(x, xo, xo + len);
        boolean ay = y != null && BitSets.any(y, yo, yo + len);
        if (!ax && !ay) {
            return null;
        }
        long[] out = new long[BitSets.words(len)];
        if (ax) {
            orShifted(out, x, xo, len);
        }
        if (ay) {
            orShifted(out, y, yo, len);
        }
        return out;
    }

    static void orShifted(long[] dst, long[] src, int from, int len) {
        int words = BitSets.words(len);
        int sw = from >>> 6;
        int sh = from & 63;
        for (int w = 0; w < words; w++) {
            long lo = sw + w < src.length ? src[sw + w] : 0;
            long v = lo >>> sh;
            if (sh != 0 && sw + w + 1 < src.length) {
                v |= src[sw + w + 1] << (64 - sh);
            }
            dst[w] |= v;
        }
        if ((len & 63) != 0) {
            dst[words - 1] &= (1L << len) - 1;
        }
    }

    private void feed(Chunk c) {
        if (learning) {
            warm.add(c);
            warmCount += c.len;
            if (warmCount >= s.warmupSamples) {
                learn();
            }
            return;
        }
        process(c);
    }

    // ---------------------------------------------------------------- learning

    private void learn() {
        learning = false;
        int want = (int) Math.min(warmCount, s.warmupSamples);
        float[] v = new float[want];
        int nv = 0;
        int seen = 0;
        for (Chunk c : warm) {
            for (int i = 0; i < c.len && seen < want; i++, seen++) {
                if (c.inv != null && BitSets.get(c.inv, i)) {
                    continue;
                }
                float d = c.b == null ? c.a[c.ao + i] : c.a[c.ao + i] - c.b[c.bo + i];
                if (Float.isFinite(d)) {
                    v[nv++] = d;
                }
            }
        }
        double thr;
        double hys;
        long t0 = originFs;
        long t1 = cmp.timeAt(want, 0);
        if (nv == 0) {
            thr = Double.isNaN(s.thresholdVolts) ? (s.mode == Settings.Mode.SINGLE ? s.referenceVolts : 0) : s.thresholdVolts;
            thr = Double.isNaN(thr) ? 0 : thr;
            hys = Double.isNaN(s.hysteresisVolts) ? 0 : s.hysteresisVolts;
            thresholdSource = "fallback";
            ctx.annotate(Annotation.on(levelsTrack, "threshold-fallback").span(t0, t1).severity(Severity.WARNING)
                    .label("no valid samples to learn levels from").number("thresholdVolts", thr, "V")
                    .number("hysteresisVolts", hys, "V").build());
        } else {
            LevelFinder.Levels lv = LevelFinder.find(v, nv);
            double swing = lv.twoLevels() ? lv.swing() : lv.max() - lv.min();
            if (lv.twoLevels()) {
                levelLow = lv.low();
                levelHigh = lv.high();
                levelsLearned = true;
            }
            if (s.mode == Settings.Mode.SINGLE) {
                thr = switch (s.reference) {
                    case FIXED -> s.referenceVolts;
                    case MEDIAN -> lv.median();
                    case MID_LEVEL -> lv.twoLevels() ? lv.mid() : lv.median();
                };
            } else if (!Double.isNaN(s.thresholdVolts)) {
                thr = s.thresholdVolts;
            } else {
                thr = lv.twoLevels() ? lv.mid() : 0;
            }
            hys = Double.isNaN(s.hysteresisVolts) ? s.hysteresisFraction * swing : s.hysteresisVolts;
            thresholdSource = s.autoThreshold() ? (lv.twoLevels() ? "learned" : "fallback") : "given";
            Annotation.Builder ab = Annotation.on(levelsTrack, lv.twoLevels() ? "threshold-learned" : "threshold-fallback")
                    .span(t0, t1).severity(lv.twoLevels() ? Severity.INFO : Severity.WARNING)
                    .label(lv.twoLevels()
                            ? String.format(Locale.ROOT, "levels %.3f / %.3f V, threshold %.3f V", lv.low(), lv.high(), thr)
                            : String.format(Locale.ROOT, "one level only in the first %d samples; threshold %.3f V", want, thr))
                    .number("thresholdVolts", thr, "V").number("hysteresisVolts", hys, "V")
                    .number("lowLevelVolts", lv.low(), "V").number("highLevelVolts", lv.high(), "V")
                    .field("warmupSamples", Field.integer(want, "samples"));
            ctx.annotate(ab.build());
            if (s.detectSwap) {
                detectSwap(v, nv, thr, hys, t0, t1);
            }
        }
        initialThreshold = thr;
        initialHysteresis = hys;
        cmp.setThreshold(thr, hys, 0);
        List<Chunk> todo = new ArrayList<>(warm);
        warm.clear();
        for (Chunk c : todo) {
            process(c);
        }
    }

    private void detectSwap(float[] v, int n, double thr, double hys, long t0, long t1) {
        double up = thr + hys / 2;
        double lo = thr - hys / 2;
        boolean high = v[0] > thr;
        long highCount = 0;
        int transitions = 0;
        int run = 0;
        int longest = 0;
        boolean longestLevel = high;
        for (int i = 0; i < n; i++) {
            boolean nh = high ? v[i] >= lo : v[i] > up;
            if (nh != high) {
                transitions++;
                high = nh;
                run = 0;
            }
            run++;
            if (run > longest) {
                longest = run;
                longestLevel = high;
            }
            if (high) {
                highCount++;
            }
        }
        double frac = (double) highCount / n;
        Boolean swapped;
        String why;
        if (s.swapPattern == Settings.SwapPattern.CLOCK_1100011) {
            // the 7:1 clock lane is high for slots 0-1 and 5-6: 4/7 of the time (docs/reference-facts.md#pixel-link-clock-and-slot-mappings)
            if (transitions < 8) {
                swapped = null;
                why = "too few clock edges in the warm-up (" + transitions + ")";
            } else {
                double dTrue = Math.abs(frac - 4.0 / 7);
                double dSwap = Math.abs(frac - 3.0 / 7);
                swapped = Math.min(dTrue, dSwap) < 1.0 / 28 ? Boolean.valueOf(dSwap < dTrue) : null;
                why = String.format(Locale.ROOT, "high %.1f %% of the time, expected 57.1 %% (4 of 7 slots)", 100 * frac);
            }
        } else {
            boolean want = s.swapPattern == Settings.SwapPattern.IDLE_HIGH;
            swapped = longestLevel != want;
            why = "longest steady run (" + longest + " samples) is " + (longestLevel ? "high" : "low")
                    + ", the idle level should be " + (want ? "high" : "low");
        }
        if (swapped == null) {
            ctx.annotate(Annotation.on(levelsTrack, "swap-undetermined").span(t0, t1).severity(Severity.WARNING)
                    .label("cannot tell whether the legs are swapped").text("reason", why).build());
        } else if (swapped) {
            cmp.setInvert(!cmp.invert());
            ctx.annotate(Annotation.on(levelsTrack, "legs-swapped").span(t0, t1).severity(Severity.WARNING)
                    .label("legs look swapped; output polarity corrected").text("reason", why)
                    .number("highFraction", frac, "").build());
        } else {
            ctx.annotate(Annotation.on(levelsTrack, "polarity-checked").span(t0, t1).severity(Severity.INFO)
                    .label("leg polarity matches the expected pattern").text("reason", why)
                    .number("highFraction", frac, "").build());
        }
    }

    // ---------------------------------------------------------------- processing

    private void process(Chunk c) {
        long base = cmp.nextIndex();
        long[] bits = new long[BitSets.words(c.len)];
        cmp.beginChunk(c.a, c.ao, c.b, c.bo, c.len, c.inv, bits);
        int W = s.windowSamples;
        int pos = 0;
        if (!s.levelReport && !s.autoThreshold() && !s.autoHysteresis()) {
            // no report and nothing learned to follow: the windows' statistics would go unused
            cmp.runSegment(0, c.len);
            pos = c.len;
        }
        while (pos < c.len) {
            long abs = base + pos;
            long winEnd = (abs / W + 1) * W;
            int e = (int) Math.min(c.len, pos + (winEnd - abs));
            float thr = cmp.threshold();
            float half = cmp.hysteresis() / 2;
            float settled = Math.max(half, settledHalfBand());
            cmp.runSegment(pos, e);
            window.add(c.a, c.ao, c.b, c.bo, base, pos, e, bits, cmp.chunkInvalid(), thr, half, settled, s.statsStride);
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
                if ((c.len & 63) != 0) {
                    bits[bits.length - 1] &= (1L << c.len) - 1;
                }
            }
            ctx.emit(OUT_LOGIC, new LogicBlock(s.channel, base, cmp.timeAt(base, 0), periodFs, bits, c.len, inv));
        }
        Edges e = cmp.takeEdges(s.channel, false);
        if (e != null) {
            ctx.emit(OUT_EDGES, e);
        }
    }

    /**
     * Half-width of the band around the threshold outside which samples count as settled on a
     * level: {@link #SETTLED_FRACTION} of the way from the threshold to the learned levels, so that
     * samples on an edge do not pull the levels in. A window with too few settled samples of a
     * level (the levels dropped suddenly) takes that level from every sample outside the
     * hysteresis band instead.
     */
    private float settledHalfBand() {
        return levelsLearned ? (float) (SETTLED_FRACTION * (levelHigh - levelLow) / 2) : 0f;
    }

    private void endWindow() {
        LevelAcc w = window;
        window = new LevelAcc(w.endIndex);
        if (w.samples == 0) {
            return;
        }
        capture.merge(w);
        addReportWindow(w);
        long t0 = cmp.timeAt(w.startIndex, 0);
        long t1 = cmp.timeAt(w.endIndex, 0);
        Map<String, Double> q = quantities(w);
        for (LevelProfile.Check ch : s.profile.checks) {
            Double v = q.get(ch.quantity());
            Severity sev = v == null ? null : ch.judge(v);
            Run r = runs.get(ch.quantity());
            if (sev == null || sev == Severity.INFO) {
                if (r != null) {
                    emitRun(r);
                    runs.remove(ch.quantity());
                }
                continue;
            }
            if (r != null && r.severity == sev && r.endFs == t0) {
                r.endFs = t1;
                r.windows++;
                if (distance(ch, v) > distance(ch, r.worst)) {
                    r.worst = v;
                }
            } else {
                if (r != null) {
                    emitRun(r);
                }
                runs.put(ch.quantity(), new Run(ch, sev, t0, t1, v));
            }
        }
        adapt(w);
    }

    /** How far a value sits from the middle of a check's band, in volts past its nearest limit (larger is worse). */
    private static double distance(LevelProfile.Check ch, double v) {
        double d = Double.NEGATIVE_INFINITY;
        if (!Double.isNaN(ch.min())) {
            d = Math.max(d, ch.min() - v);
        }
        if (!Double.isNaN(ch.max())) {
            d = Math.max(d, v - ch.max());
        }
        return d;
    }

    private void emitRun(Run r) {
        if (!s.levelReport) {
            return;
        }
        boolean err = r.severity == Severity.ERROR;
        ctx.annotate(Annotation.on(levelsTrack, err ? "level-out-of-range" : "level-near-limit").span(r.startFs, r.endFs)
                .severity(r.severity)
                .label(String.format(Locale.ROOT, "%s %.1f mV %s %s", r.check.quantity(), r.worst * 1e3,
                        err ? "outside" : "near the limit of", r.check.limits()))
                .field("quantity", Field.enumValue(r.check.quantity())).number("worstVolts", r.worst, "V")
                .number("minVolts", r.check.min(), "V").number("maxVolts", r.check.max(), "V")
                .field("windows", Field.integer(r.windows, "")).text("source", r.check.source()).build());
    }

    private void adapt(LevelAcc w) {
        if (!w.hasBothLevels(MIN_LEVEL_SAMPLES)) {
            return;
        }
        boolean thrAuto = s.autoThreshold() && !(s.mode == Settings.Mode.SINGLE && s.reference == Settings.Reference.MEDIAN);
        boolean hysAuto = s.autoHysteresis();
        double lo = w.mean(0);
        double hi = w.mean(1);
        if (!levelsLearned) {
            levelLow = lo;
            levelHigh = hi;
            levelsLearned = true;
        } else if (adaptSamples > 0) {
            double alpha = 1 - Math.exp(-(w.endIndex - w.startIndex) / adaptSamples);
            levelLow += alpha * (lo - levelLow);
            levelHigh += alpha * (hi - levelHigh);
        } else {
            return;
        }
        if (!thrAuto && !hysAuto) {
            return;
        }
        double thr = thrAuto ? 0.5 * (levelLow + levelHigh) : cmp.threshold();
        double hys = hysAuto ? s.hysteresisFraction * (levelHigh - levelLow) : cmp.hysteresis();
        if ((float) thr != cmp.threshold() || (float) (thr + hys / 2) - (float) (thr - hys / 2) != cmp.hysteresis()) {
            cmp.setThreshold(thr, hys, w.endIndex);
        }
    }

    private void addReportWindow(LevelAcc w) {
        if (reportOpen == null) {
            reportOpen = new LevelAcc(w.startIndex);
            reportOpenCount = 0;
        }
        reportOpen.merge(w);
        reportOpenCount++;
        if (reportOpenCount < reportMerge) {
            return;
        }
        reportWindows.add(reportOpen);
        reportOpen = null;
        if (reportWindows.size() >= MAX_REPORT_WINDOWS) {
            List<LevelAcc> merged = new ArrayList<>();
            for (int i = 0; i + 1 < reportWindows.size(); i += 2) {
                LevelAcc m = reportWindows.get(i);
                m.merge(reportWindows.get(i + 1));
                merged.add(m);
            }
            reportWindows.clear();
            reportWindows.addAll(merged);
            reportMerge *= 2;
        }
    }

    /** The checked quantities of a span, by name, in volts. */
    Map<String, Double> quantities(LevelAcc w) {
        Map<String, Double> q = new LinkedHashMap<>();
        double hi = w.count(1) >= MIN_LEVEL_SAMPLES ? w.mean(1) : Double.NaN;
        double lo = w.count(0) >= MIN_LEVEL_SAMPLES ? w.mean(0) : Double.NaN;
        switch (s.mode) {
            case PAIR, DIFFERENTIAL -> {
                q.put("vod-high", Math.abs(hi));
                q.put("vod-low", Math.abs(lo));
                q.put("delta-vod", Math.abs(Math.abs(hi) - Math.abs(lo)));
                q.put("vid-high", hi);
                q.put("vid-low", -lo);
                if (s.mode == Settings.Mode.PAIR) {
                    q.put("vos", w.count(0) + w.count(1) >= MIN_LEVEL_SAMPLES ? w.cmMean() : Double.NaN);
                    q.put("delta-vos", Math.abs(w.cmMean(1) - w.cmMean(0)));
                }
            }
            default -> {
                q.put("vod", hi - lo);
                q.put("vos", 0.5 * (hi + lo));
                q.put("lp-high", hi);
                q.put("lp-low", lo);
            }
        }
        q.values().removeIf(v -> Double.isNaN(v));
        return q;
    }

    private void gap(long startIndex, long endIndex, long startFs, long endFs, boolean levelChanged) {
        gapCount++;
        gapSamples += endIndex - startIndex;
        if (gapCount > MAX_GAP_ANNOTATIONS) {
            return;
        }
        ctx.annotate(Annotation.on(s.channel, "input-invalid").span(startFs, endFs).severity(Severity.WARNING)
                .label((endIndex - startIndex) + " invalid input samples: no edges here")
                .field("firstSample", Field.integer(originIndex + startIndex, "")).field("samples", Field.integer(endIndex - startIndex, ""))
                .field("levelChanged", Field.enumValue(levelChanged ? "yes" : "no")).build());
    }

    // ---------------------------------------------------------------- end of stream

    @Override
    public void finish() {
        if (finished) {
            return;
        }
        finished = true;
        if (!aligned && twoLegs) {
            // one leg never caught up with the other: nothing to compare
            queues.get(0).clear();
            queues.get(1).clear();
        }
        if (cmp == null) {
            return;
        }
        if (learning) {
            learn();
        }
        if (twoLegs && (!queues.get(0).isEmpty() || !queues.get(1).isEmpty())) {
            int rest = queues.get(0).isEmpty() ? 1 : 0; // the leg with samples left over
            int other = 1 - rest;
            long extra = 0;
            for (AnalogBlock b : queues.get(rest)) {
                extra += b.length();
            }
            extra -= headOffset[rest];
            ctx.annotate(Annotation.on(s.channel, "legs-unequal-length").span(cmp.timeAt(cmp.nextIndex(), 0),
                            cmp.timeAt(cmp.nextIndex() + extra, 0)).severity(Severity.WARNING)
                    .label("leg '" + inputNames[rest] + "' has " + extra + " samples more than leg '" + inputNames[other]
                            + "'; they were not used")
                    .field("samples", Field.integer(extra, "")).build());
        }
        if (window.samples > 0) {
            endWindow();
        }
        if (reportOpen != null) {
            reportWindows.add(reportOpen);
            reportOpen = null;
        }
        for (Run r : runs.values()) {
            emitRun(r);
        }
        runs.clear();
        Edges e = cmp.takeEdges(s.channel, true);
        if (e != null) {
            ctx.emit(OUT_EDGES, e);
        }
        long t0 = originFs;
        long t1 = cmp.timeAt(cmp.nextIndex(), 0);
        if (gapCount > MAX_GAP_ANNOTATIONS) {
            ctx.annotate(Annotation.on(s.channel, "input-invalid-summary").span(t0, t1).severity(Severity.WARNING)
                    .label(gapCount + " runs of invalid samples, " + (gapCount - MAX_GAP_ANNOTATIONS) + " not annotated singly")
                    .field("runs", Field.integer(gapCount, "")).field("samples", Field.integer(gapSamples, "")).build());
        }
        if (!s.levelReport) {
            return;
        }
        Map<String, Double> q = quantities(capture);
        List<String[]> verdicts = new ArrayList<>();
        for (LevelProfile.Check ch : s.profile.checks) {
            Double v = q.get(ch.quantity());
            Severity sev = v == null ? null : ch.judge(v);
            if (sev == null) {
                continue;
            }
            verdicts.add(new String[] {ch.quantity(), sev.name().toLowerCase(Locale.ROOT)});
            ctx.annotate(Annotation.on(levelsTrack, "level-check").span(t0, t1).severity(sev)
                    .label(String.format(Locale.ROOT, "%s %.1f mV, limit %s", ch.quantity(), v * 1e3, ch.limits()))
                    .field("quantity", Field.enumValue(ch.quantity())).number("valueVolts", v, "V")
                    .number("minVolts", ch.min(), "V").number("maxVolts", ch.max(), "V").text("source", ch.source()).build());
        }
        ctx.annotate(Annotation.on(levelsTrack, "level-summary").span(t0, t1).severity(Severity.INFO)
                .label(String.format(Locale.ROOT, "levels %.3f / %.3f V, %d transitions", capture.mean(0), capture.mean(1),
                        cmp.transitionsTotal()))
                .number("lowLevelVolts", capture.mean(0), "V").number("highLevelVolts", capture.mean(1), "V")
                .number("commonModeVolts", capture.cmMean(), "V")
                .field("transitions", Field.integer(cmp.transitionsTotal(), "")).build());
        byte[] json = report(q).getBytes(StandardCharsets.UTF_8);
        ctx.emit(OUT_REPORT, new Artifact(s.channel, t0, t1, ctx.instanceId() + "-levels.json", "application/json", json));
    }

    private void levelsJson(JsonWriter j, LevelAcc a) {
        double hi = a.mean(1);
        double lo = a.mean(0);
        double swing = hi - lo;
        j.field("startFs", cmp.timeAt(a.startIndex, 0)).field("endFs", cmp.timeAt(a.endIndex, 0))
                .field("samples", a.samples).field("invalidSamples", a.invalid)
                .field("settledHigh", a.n[1]).field("settledLow", a.n[0])
                .field("highLevelFromSettled", a.settled(1)).field("lowLevelFromSettled", a.settled(0))
                .field("highLevelVolts", hi).field("lowLevelVolts", lo)
                .field("highSpreadVolts", a.spread(1)).field("lowSpreadVolts", a.spread(0))
                .field("overshootVolts", a.max[1] - hi).field("undershootVolts", lo - a.min[0])
                .field("overshootPercent", 100 * (a.max[1] - hi) / swing).field("undershootPercent", 100 * (lo - a.min[0]) / swing);
        if (twoLegs) {
            j.field("commonModeVolts", a.cmMean()).field("commonModeSpreadVolts", a.cmSpread())
                    .field("commonModeHighVolts", a.cmMean(1)).field("commonModeLowVolts", a.cmMean(0));
        }
        j.name("quantities").beginObject();
        for (Map.Entry<String, Double> e : quantities(a).entrySet()) {
            j.field(e.getKey(), e.getValue());
        }
        j.endObject();
    }

    private String report(Map<String, Double> q) {
        JsonWriter j = JsonWriter.compact().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull();
        j.beginObject();
        j.field("instance", ctx.instanceId()).field("channel", s.channel).field("mode", s.modeName())
                .field("levelProfile", s.profile.id).field("samplePeriodFs", periodFs).field("startFs", originFs)
                .field("samples", cmp.nextIndex()).field("transitions", cmp.transitionsTotal())
                .field("thresholdSource", thresholdSource)
                .field("initialThresholdVolts", initialThreshold).field("initialHysteresisVolts", initialHysteresis)
                .field("finalThresholdVolts", cmp.threshold()).field("finalHysteresisVolts", cmp.hysteresis())
                .field("inverted", cmp.invert()).field("invalidRuns", gapCount).field("invalidSamples", gapSamples)
                .field("windowSamples", (long) s.windowSamples * reportMerge).field("statsStride", s.statsStride);
        j.name("capture").beginObject();
        levelsJson(j, capture);
        j.endObject();
        j.name("checks").beginArray();
        for (LevelProfile.Check ch : s.profile.checks) {
            Double v = q.get(ch.quantity());
            if (v == null) {
                continue;
            }
            j.beginObject().field("quantity", ch.quantity()).field("what", ch.what()).field("valueVolts", v)
                    .field("minVolts", ch.min()).field("maxVolts", ch.max())
                    .field("verdict", ch.judge(v).name().toLowerCase(Locale.ROOT)).field("source", ch.source()).endObject();
        }
        j.endArray();
        j.name("windows").beginArray();
        for (LevelAcc w : reportWindows) {
            j.beginObject();
            levelsJson(j, w);
            j.endObject();
        }
        j.endArray();
        j.endObject();
        return j.finish();
    }
}
