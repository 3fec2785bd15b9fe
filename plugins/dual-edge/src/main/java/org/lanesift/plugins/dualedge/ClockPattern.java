package org.lanesift.plugins.dualedge;

import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;

/**
 * On a multiplied clock (N slots per period, {@code highSlots} of them high), decides from the duty
 * cycle measured at each acquisition whether the clock lane is inverted, and so which edge slot 0
 * follows. A duty nearer {@code (N - highSlots) / N} than {@code highSlots / N} means inverted; a
 * duty more than 0.3 slot from both is reported and taken as it falls. The verdict is re-made at
 * every acquisition, and an annotation is added only when it first forms or changes.
 */
final class ClockPattern {
    private final SamplerConfig cfg;
    private final AnnotationQueue notes;
    private boolean inverted;
    private boolean decided;
    private String verdict = "";

    ClockPattern(SamplerConfig cfg, AnnotationQueue notes) {
        this.cfg = cfg;
        this.notes = notes;
    }

    /** Whether the clock lane was found inverted at the latest decision. */
    boolean inverted() {
        return inverted;
    }

    /** The latest decision in words, empty before the first. */
    String verdict() {
        return verdict;
    }

    /**
     * Decides from one acquisition's duty cycle.
     *
     * @param duty measured duty cycle, NaN when not measurable
     * @param at   time of the acquisition, fs
     */
    void decide(double duty, long at) {
        int n = cfg.slots();
        double expect = cfg.highSlots() / (double) n;
        double inv = 1 - expect;
        boolean wasInverted = inverted;
        boolean firstDecision = !decided;
        String ratio = cfg.highSlots() + "/" + n;
        String invRatio = (n - cfg.highSlots()) + "/" + n;
        if (Double.isNaN(duty)) {
            if (firstDecision) {
                verdict = "duty cycle not measurable: clock taken as not inverted";
                notes.add(Annotation.on(ClockRecovery.TRACK, "clock-duty-unexpected").span(at, at).severity(Severity.WARNING)
                        .label("duty cycle not measurable; clock taken as not inverted").build());
            }
            decided = true;
            return;
        }
        boolean nearInv = cfg.highSlots() * 2 != n && Math.abs(duty - inv) < Math.abs(duty - expect);
        double off = Math.min(Math.abs(duty - expect), Math.abs(duty - inv));
        inverted = nearInv;
        decided = true;
        String slot0 = cfg.slot0AfterRef() + "/" + n + " period after each " + (inverted ? "falling" : "rising") + " edge";
        if (off > 0.3 / n) {
            verdict = String.format(Locale.ROOT, "duty %.4f matches neither %s nor %s; taken as %s, slot 0 starts %s",
                    duty, ratio, invRatio, inverted ? "inverted" : "not inverted", slot0);
            notes.add(Annotation.on(ClockRecovery.TRACK, "clock-duty-unexpected").span(at, at).severity(Severity.WARNING)
                    .label(String.format(Locale.ROOT, "duty %.3f, expected %s", duty, ratio)).number("duty", duty, "")
                    .build());
        } else if (inverted) {
            verdict = String.format(Locale.ROOT, "duty %.4f matches %s: clock lane inverted, slot 0 starts %s",
                    duty, invRatio, slot0);
            if (firstDecision || !wasInverted) {
                notes.add(Annotation.on(ClockRecovery.TRACK, "clock-inverted").span(at, at).severity(Severity.WARNING)
                        .label(String.format(Locale.ROOT, "clock inverted (duty %.3f = %s high)", duty, invRatio))
                        .number("duty", duty, "").build());
            }
        } else {
            verdict = String.format(Locale.ROOT, "duty %.4f matches %s (pattern %s): slot 0 starts %s",
                    duty, ratio, cfg.pattern(), slot0);
            if (firstDecision || wasInverted) {
                notes.add(Annotation.on(ClockRecovery.TRACK, "clock-pattern").span(at, at).severity(Severity.INFO)
                        .label(String.format(Locale.ROOT, "duty %.3f = %s high: slot 0 found", duty, ratio))
                        .number("duty", duty, "").text("pattern", cfg.pattern()).build());
            }
        }
    }
}
