package org.lanesift.plugins.differential;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.plugin.StageContext;

/**
 * Judges each finished window's levels against the level profile and merges consecutive windows
 * with the same finding for one quantity into one {@code level-out-of-range} or
 * {@code level-near-limit} annotation spanning them, with the worst value seen. The two states of
 * one quantity ({@code <name>-high} and {@code <name>-low} with the same limits, such as
 * {@code vod-high} and {@code vod-low}) are one check: a driver whose swing is out of range is one
 * fault, so it gives one finding naming both states' worst values (quantity
 * {@code vod-high+vod-low}, fields {@code highVolts} and {@code lowVolts}); a run where only one
 * state is off names that state alone, as before. It remembers the gravest finding it made per
 * quantity, so the capture-wide check at the end does not name the same fault a second time.
 */
final class WindowFindings {
    /** One check, or the two states of one quantity judged together. */
    private record Group(String key, LevelProfile.Check first, LevelProfile.Check second) {
    }

    /** An open run of consecutive windows with the same finding for one group. */
    private static final class Run {
        final Group group;
        final Severity severity;
        final long startFs;
        long endFs;
        /** Worst value per member of the group, NaN while that member was never off. */
        final double[] worst = {Double.NaN, Double.NaN};
        int windows;

        Run(Group group, Severity severity, long startFs, long endFs) {
            this.group = group;
            this.severity = severity;
            this.startFs = startFs;
            this.endFs = endFs;
        }
    }

    private final StageContext ctx;
    private final Settings s;
    private final String levelsTrack;
    private final List<Group> groups = new ArrayList<>();
    private final Map<String, Run> runs = new LinkedHashMap<>();
    /** The gravest severity annotated so far, per quantity. */
    private final Map<String, Severity> named = new LinkedHashMap<>();

    WindowFindings(StageContext ctx, Settings s, String levelsTrack) {
        this.ctx = ctx;
        this.s = s;
        this.levelsTrack = levelsTrack;
        List<LevelProfile.Check> checks = s.profile.checks;
        List<String> paired = new ArrayList<>();
        for (LevelProfile.Check ch : checks) {
            if (paired.contains(ch.quantity())) {
                continue;
            }
            LevelProfile.Check partner = null;
            if (ch.quantity().endsWith("-high")) {
                String low = ch.quantity().substring(0, ch.quantity().length() - 5) + "-low";
                for (LevelProfile.Check o : checks) {
                    if (o.quantity().equals(low) && Double.compare(o.min(), ch.min()) == 0 && Double.compare(o.max(), ch.max()) == 0) {
                        partner = o;
                    }
                }
            }
            if (partner != null) {
                paired.add(partner.quantity());
                groups.add(new Group(ch.quantity() + "+" + partner.quantity(), ch, partner));
            } else {
                groups.add(new Group(ch.quantity(), ch, null));
            }
        }
    }

    /**
     * Judges one window.
     *
     * @param q  its quantities, volts, by name
     * @param t0 window start, fs
     * @param t1 window end, fs
     */
    void judge(Map<String, Double> q, long t0, long t1) {
        for (Group g : groups) {
            Double v0 = q.get(g.first.quantity());
            Double v1 = g.second == null ? null : q.get(g.second.quantity());
            Severity s0 = v0 == null ? null : g.first.judge(v0);
            Severity s1 = v1 == null ? null : g.second.judge(v1);
            Severity sev = graver(s0, s1);
            Run r = runs.get(g.key);
            if (sev == null || sev == Severity.INFO) {
                if (r != null) {
                    emit(r);
                    runs.remove(g.key);
                }
                continue;
            }
            if (r == null || r.severity != sev || r.endFs != t0) {
                if (r != null) {
                    emit(r);
                }
                r = new Run(g, sev, t0, t1);
                r.windows = 0;
                runs.put(g.key, r);
            }
            r.endFs = t1;
            r.windows++;
            // a state is named when it is off at all (near the limit or outside) in a window of the run
            if (s0 != null && s0 != Severity.INFO) {
                r.worst[0] = worse(g.first, r.worst[0], v0);
            }
            if (s1 != null && s1 != Severity.INFO) {
                r.worst[1] = worse(g.second, r.worst[1], v1);
            }
        }
    }

    private static String verdict(Severity s) {
        return s == Severity.ERROR ? "outside" : "near the limit of";
    }

    private static Severity graver(Severity a, Severity b) {
        return a == null ? b : b == null ? a : a.compareTo(b) >= 0 ? a : b;
    }

    private static double worse(LevelProfile.Check ch, double held, double v) {
        return Double.isNaN(held) || distance(ch, v) > distance(ch, held) ? v : held;
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
        Group g = r.group;
        boolean both = !Double.isNaN(r.worst[0]) && !Double.isNaN(r.worst[1]);
        LevelProfile.Check ch = both || !Double.isNaN(r.worst[0]) ? g.first : g.second;
        double worst = both ? (distance(g.first, r.worst[0]) >= distance(g.second, r.worst[1]) ? r.worst[0] : r.worst[1])
                : !Double.isNaN(r.worst[0]) ? r.worst[0] : r.worst[1];
        String verb = err ? "outside" : "near the limit of";
        Annotation.Builder b = Annotation.on(levelsTrack, err ? "level-out-of-range" : "level-near-limit").span(r.startFs, r.endFs)
                .severity(r.severity);
        if (both) {
            // one fault seen in both states of the quantity: one finding naming both values, each with its verdict
            Severity v0 = g.first.judge(r.worst[0]);
            Severity v1 = g.second.judge(r.worst[1]);
            named.merge(g.first.quantity(), v0, WindowFindings::graver);
            named.merge(g.second.quantity(), v1, WindowFindings::graver);
            b.label(v0 == v1
                    ? String.format(Locale.ROOT, "%s %.1f mV and %s %.1f mV %s %s", g.first.quantity(), r.worst[0] * 1e3,
                            g.second.quantity(), r.worst[1] * 1e3, verb, ch.limits())
                    : String.format(Locale.ROOT, "%s %.1f mV %s and %s %.1f mV %s %s", g.first.quantity(), r.worst[0] * 1e3,
                            verdict(v0), g.second.quantity(), r.worst[1] * 1e3, verdict(v1), ch.limits()))
                    .field("quantity", Field.enumValue(g.key)).number("worstVolts", worst, "V")
                    .number("highVolts", r.worst[0], "V").number("lowVolts", r.worst[1], "V");
        } else {
            named.merge(ch.quantity(), r.severity, WindowFindings::graver);
            b.label(String.format(Locale.ROOT, "%s %.1f mV %s %s", ch.quantity(), worst * 1e3, verb, ch.limits()))
                    .field("quantity", Field.enumValue(ch.quantity())).number("worstVolts", worst, "V");
        }
        ctx.annotate(b.number("minVolts", ch.min(), "V").number("maxVolts", ch.max(), "V")
                .field("windows", Field.integer(r.windows, "")).text("source", ch.source()).build());
    }
}
