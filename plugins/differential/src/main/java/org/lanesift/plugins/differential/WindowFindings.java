package org.lanesift.plugins.differential;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.plugin.StageContext;

/**
 * Judges each finished window's levels against the level profile and merges consecutive windows
 * with the same finding for one quantity into one {@code level-out-of-range} or
 * {@code level-near-limit} annotation spanning them, with the worst value seen. It remembers the
 * gravest finding it made per quantity, so the capture-wide check at the end does not name the
 * same fault a second time.
 */
final class WindowFindings {
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

    private final StageContext ctx;
    private final Settings s;
    private final String levelsTrack;
    private final Map<String, Run> runs = new LinkedHashMap<>();
    /** The gravest severity annotated so far, per quantity. */
    private final Map<String, Severity> named = new LinkedHashMap<>();

    WindowFindings(StageContext ctx, Settings s, String levelsTrack) {
        this.ctx = ctx;
        this.s = s;
        this.levelsTrack = levelsTrack;
    }

    /**
     * Judges one window.
     *
     * @param q  its quantities, volts, by name
     * @param t0 window start, fs
     * @param t1 window end, fs
     */
    void judge(Map<String, Double> q, long t0, long t1) {
        for (LevelProfile.Check ch : s.profile.checks) {
            Double v = q.get(ch.quantity());
            Severity sev = v == null ? null : ch.judge(v);
            Run r = runs.get(ch.quantity());
            if (sev == null || sev == Severity.INFO) {
                if (r != null) {
                    emit(r);
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
                    emit(r);
                }
                runs.put(ch.quantity(), new Run(ch, sev, t0, t1, v));
            }
        }
    }

    /** Annotates the runs still open, at the end. */
    void finish() {
        for (Run r : runs.values()) {
            emit(r);
        }
        runs.clear();
    }

    /**
     * Whether a window finding of at least this severity was annotated for a quantity.
     *
     * @param quantity the check's quantity
     * @param sev      the severity
     * @return true when a run of windows already named it
     */
    boolean named(String quantity, Severity sev) {
        Severity n = named.get(quantity);
        return n != null && n.compareTo(sev) >= 0;
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

    private void emit(Run r) {
        if (!s.levelReport) {
            return;
        }
        boolean err = r.severity == Severity.ERROR;
        named.merge(r.check.quantity(), r.severity, (a, b) -> a.compareTo(b) >= 0 ? a : b);
        ctx.annotate(Annotation.on(levelsTrack, err ? "level-out-of-range" : "level-near-limit").span(r.startFs, r.endFs)
                .severity(r.severity)
                .label(String.format(Locale.ROOT, "%s %.1f mV %s %s", r.check.quantity(), r.worst * 1e3,
                        err ? "outside" : "near the limit of", r.check.limits()))
                .field("quantity", Field.enumValue(r.check.quantity())).number("worstVolts", r.worst, "V")
                .number("minVolts", r.check.min(), "V").number("maxVolts", r.check.max(), "V")
                .field("windows", Field.integer(r.windows, "")).text("source", r.check.source()).build());
    }
}
