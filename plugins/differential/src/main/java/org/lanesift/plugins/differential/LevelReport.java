package org.lanesift.plugins.differential;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * The checked quantities of a span, and the {@code <instance>-levels.json} report: the capture's
 * levels and checks, and up to {@link #MAX_WINDOWS} windows (beyond that neighbours are merged in
 * pairs, doubling the reported window length).
 */
final class LevelReport {
    /**
     * Most windows kept for the report; beyond that neighbours are merged. The report is read by a
     * person: 32 rows show how the levels drift over a capture of any length (16 to 32 of them once
     * merging starts), where the former 2048 made a 1 GB capture's report about 1 MB of rows of
     * about 2 KB each. Level findings are judged per window of {@code windowSamples} as before
     * ({@link WindowFindings}); only the report's rows are merged.
     */
    static final int MAX_WINDOWS = 32;

    /**
     * The run-wide facts the report starts with.
     *
     * @param instance          instance id
     * @param periodFs          sample period
     * @param originFs          time of the first sample
     * @param learned           what the warm-up decided (or the given threshold)
     * @param invalidRuns       runs of invalid samples
     * @param invalidSamples    invalid samples
     */
    record Header(String instance, double periodFs, long originFs, WarmupLearner.Result learned, long invalidRuns,
                  long invalidSamples) {
    }

    private final Settings s;
    private final boolean twoLegs;
    private final List<LevelAcc> windows = new ArrayList<>();
    private LevelAcc open;
    private int openCount;
    private int merge = 1;

    LevelReport(Settings s) {
        this.s = s;
        this.twoLegs = s.mode == Settings.Mode.PAIR;
    }

    /** Adds a finished window. */
    void add(LevelAcc w) {
        if (open == null) {
            open = new LevelAcc(w.startIndex);
            openCount = 0;
        }
        open.merge(w);
        openCount++;
        if (openCount < merge) {
            return;
        }
        windows.add(open);
        open = null;
        if (windows.size() >= MAX_WINDOWS) {
            List<LevelAcc> merged = new ArrayList<>();
            for (int i = 0; i + 1 < windows.size(); i += 2) {
                LevelAcc m = windows.get(i);
                m.merge(windows.get(i + 1));
                merged.add(m);
            }
            windows.clear();
            windows.addAll(merged);
            merge *= 2;
        }
    }

    /** Closes the window being merged, at the end. */
    void close() {
        if (open != null) {
            windows.add(open);
            open = null;
        }
    }

    /** The checked quantities of a span, by name, in volts. */
    static Map<String, Double> quantities(Settings s, LevelAcc w) {
        Map<String, Double> q = new LinkedHashMap<>();
        double hi = w.count(1) >= LevelTracker.MIN_LEVEL_SAMPLES ? w.mean(1) : Double.NaN;
        double lo = w.count(0) >= LevelTracker.MIN_LEVEL_SAMPLES ? w.mean(0) : Double.NaN;
        switch (s.mode) {
            case PAIR, DIFFERENTIAL -> {
                q.put("vod-high", Math.abs(hi));
                q.put("vod-low", Math.abs(lo));
                q.put("delta-vod", Math.abs(Math.abs(hi) - Math.abs(lo)));
                q.put("vid-high", hi);
                q.put("vid-low", -lo);
                if (s.mode == Settings.Mode.PAIR) {
                    q.put("vos", w.count(0) + w.count(1) >= LevelTracker.MIN_LEVEL_SAMPLES ? w.cmMean() : Double.NaN);
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

    private void levelsJson(JsonWriter j, LevelAcc a, Comparator cmp) {
        double hi = a.mean(1);
        double lo = a.mean(0);
        double swing = hi - lo;
        Source level = Source.measured("mean of the settled samples");
        Source peak = Source.measured("extreme sample beyond the settled level");
        j.field("startFs", cmp.timeAt(a.startIndex, 0)).field("endFs", cmp.timeAt(a.endIndex, 0))
                .field("samples", a.samples).field("invalidSamples", a.invalid)
                .field("settledHigh", a.n[1]).field("settledLow", a.n[0])
                .field("highLevelFromSettled", a.settled(1)).field("lowLevelFromSettled", a.settled(0));
        sourced(j, "highLevelVolts", hi, "V", level);
        sourced(j, "lowLevelVolts", lo, "V", level);
        sourced(j, "highSpreadVolts", a.spread(1), "V", Source.measured("standard deviation of the settled samples"));
        sourced(j, "lowSpreadVolts", a.spread(0), "V", Source.measured("standard deviation of the settled samples"));
        sourced(j, "overshootVolts", a.max[1] - hi, "V", peak);
        sourced(j, "undershootVolts", lo - a.min[0], "V", peak);
        sourced(j, "overshootPercent", 100 * (a.max[1] - hi) / swing, "%", Source.derived("overshoot / (high - low level)"));
        sourced(j, "undershootPercent", 100 * (lo - a.min[0]) / swing, "%", Source.derived("undershoot / (high - low level)"));
        if (twoLegs) {
            Source cm = Source.measured("(P + N) / 2 of the settled samples");
            sourced(j, "commonModeVolts", a.cmMean(), "V", cm);
            sourced(j, "commonModeSpreadVolts", a.cmSpread(), "V", cm);
            sourced(j, "commonModeHighVolts", a.cmMean(1), "V", cm);
            sourced(j, "commonModeLowVolts", a.cmMean(0), "V", cm);
        }
        j.name("quantities").beginObject();
        for (Map.Entry<String, Double> e : quantities(s, a).entrySet()) {
            sourced(j, e.getKey(), e.getValue(), "V", Source.measured("from the settled levels"));
        }
        j.endObject();
    }

    private static void sourced(JsonWriter j, String name, double value, String unit, Source source) {
        Sourced.of(value, unit, source).field(j, name);
    }

    /** Where the warm-up threshold and hysteresis come from, after {@link WarmupLearner.Result#source()}. */
    private static Source thresholdSource(String learned) {
        return switch (learned) {
            case "given" -> Source.given("the thresholdVolts and hysteresis options");
            case "learned" -> Source.measured("learned from the levels of the warm-up samples");
            default -> Source.assumed("no two levels in the warm-up samples; the fallback threshold and hysteresis");
        };
    }

    /**
     * The report as JSON text.
     *
     * @param h       run-wide facts
     * @param cmp     the comparator at the end of the stream
     * @param capture the whole capture's statistics
     * @param q       the capture's quantities
     * @return the JSON
     */
    String json(Header h, Comparator cmp, LevelAcc capture, Map<String, Double> q) {
        JsonWriter j = JsonWriter.compact().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull();
        j.beginObject();
        j.field("instance", h.instance()).field("channel", s.channel).field("mode", s.modeName())
                .field("levelProfile", s.profile.id).field("startFs", h.originFs())
                .field("samples", cmp.nextIndex()).field("transitions", cmp.transitionsTotal())
                .field("thresholdSource", h.learned().source());
        Source initial = thresholdSource(h.learned().source());
        Source tracked = "given".equals(h.learned().source()) ? initial
                : Source.measured("tracked from the levels by the adaptive threshold");
        sourced(j, "samplePeriodFs", h.periodFs(), "fs", Source.given("the capture's sample rate"));
        sourced(j, "initialThresholdVolts", h.learned().thresholdVolts(), "V", initial);
        sourced(j, "initialHysteresisVolts", h.learned().hysteresisVolts(), "V", initial);
        sourced(j, "finalThresholdVolts", cmp.threshold(), "V", tracked);
        sourced(j, "finalHysteresisVolts", cmp.hysteresis(), "V", tracked);
        j.field("inverted", cmp.invert()).field("invalidRuns", h.invalidRuns()).field("invalidSamples", h.invalidSamples())
                .field("windowSamples", (long) s.windowSamples * merge).field("statsStride", s.statsStride);
        j.name("capture").beginObject();
        levelsJson(j, capture, cmp);
        j.endObject();
        j.name("checks").beginArray();
        for (LevelProfile.Check ch : s.profile.checks) {
            Double v = q.get(ch.quantity());
            if (v == null) {
                continue;
            }
            j.beginObject().field("quantity", ch.quantity()).field("what", ch.what());
            sourced(j, "valueVolts", v, "V", Source.measured("from the settled levels"));
            sourced(j, "minVolts", ch.min(), "V", ch.from());
            sourced(j, "maxVolts", ch.max(), "V", ch.from());
            j.field("verdict", ch.judge(v).name().toLowerCase(Locale.ROOT)).endObject();
        }
        j.endArray();
        j.name("windows").beginArray();
        for (LevelAcc w : windows) {
            j.beginObject();
            levelsJson(j, w, cmp);
            j.endObject();
        }
        j.endArray();
        j.endObject();
        return j.finish();
    }
}
