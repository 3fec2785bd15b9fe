package org.lanesift.plugins.differential;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.BitSets;
import org.lanesift.kit.TwoLevelFinder;
import org.lanesift.kit.TwoLevels;
import org.lanesift.plugin.StageContext;

/**
 * Holds the first {@code warmupSamples} samples back, learns the levels from them with the shared
 * {@link TwoLevelFinder}, and chooses the initial threshold and hysteresis (given, learned, or a
 * fallback when the warm-up shows one level or no valid sample); checks the leg polarity when asked.
 */
final class WarmupLearner {
    /**
     * What the warm-up decided.
     *
     * @param thresholdVolts  initial threshold
     * @param hysteresisVolts initial hysteresis
     * @param source          {@code given}, {@code learned} or {@code fallback}
     */
    record Result(double thresholdVolts, double hysteresisVolts, String source) {
    }

    private final StageContext ctx;
    private final Settings s;
    private final String levelsTrack;
    private final List<Chunk> warm = new ArrayList<>();
    private long warmCount;

    WarmupLearner(StageContext ctx, Settings s, String levelsTrack) {
        this.ctx = ctx;
        this.s = s;
        this.levelsTrack = levelsTrack;
    }

    /** Holds a copy of a chunk back (its blocks may be lent and recycled); true once the warm-up is full. */
    boolean add(Chunk c) {
        float[] a = Arrays.copyOfRange(c.a(), c.ao(), c.ao() + c.len());
        float[] b = c.b() == null ? null : Arrays.copyOfRange(c.b(), c.bo(), c.bo() + c.len());
        warm.add(new Chunk(a, 0, b, 0, c.len(), c.inv()));
        warmCount += c.len();
        return warmCount >= s.warmupSamples;
    }

    /** The chunks held back, in order; the learner forgets them. */
    List<Chunk> drain() {
        List<Chunk> todo = new ArrayList<>(warm);
        warm.clear();
        return todo;
    }

    /**
     * Learns from the chunks held back.
     *
     * @param cmp      the comparator (its time base; its polarity may be corrected)
     * @param originFs time of the stream's first sample
     * @param tracker  receives the learned levels
     * @return the initial threshold and hysteresis
     */
    Result learn(Comparator cmp, long originFs, LevelTracker tracker) {
        int want = (int) Math.min(warmCount, s.warmupSamples);
        float[] v = new float[want];
        int nv = 0;
        int seen = 0;
        for (Chunk c : warm) {
            for (int i = 0; i < c.len() && seen < want; i++, seen++) {
                if (c.inv() != null && BitSets.get(c.inv(), i)) {
                    continue;
                }
                float d = c.b() == null ? c.a()[c.ao() + i] : c.a()[c.ao() + i] - c.b()[c.bo() + i];
                if (Float.isFinite(d)) {
                    v[nv++] = d;
                }
            }
        }
        double thr;
        double hys;
        String source;
        long t0 = originFs;
        long t1 = cmp.timeAt(want, 0);
        if (nv == 0) {
            thr = Double.isNaN(s.thresholdVolts) ? (s.mode == Settings.Mode.SINGLE ? s.referenceVolts : 0) : s.thresholdVolts;
            thr = Double.isNaN(thr) ? 0 : thr;
            hys = Double.isNaN(s.hysteresisVolts) ? 0 : s.hysteresisVolts;
            source = "fallback";
            ctx.annotate(Annotation.on(levelsTrack, "threshold-fallback").span(t0, t1).severity(Severity.WARNING)
                    .label("no valid samples to learn levels from").number("thresholdVolts", thr, "V")
                    .number("hysteresisVolts", hys, "V").build());
        } else {
            TwoLevels lv = TwoLevelFinder.find(v, nv);
            double swing = lv.twoLevels() ? lv.swing() : lv.max() - lv.min();
            if (lv.twoLevels()) {
                tracker.learned(lv.low(), lv.high());
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
            source = s.autoThreshold() ? (lv.twoLevels() ? "learned" : "fallback") : "given";
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
                new SwapDetector(ctx, s, levelsTrack, cmp).detect(v, nv, thr, hys, t0, t1);
            }
        }
        return new Result(thr, hys, source);
    }
}
