package org.lanesift.plugins.differential;

import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.plugin.StageContext;

/**
 * Tells from the warm-up samples whether the legs are swapped, by the expected pattern: the 7:1
 * clock lane is high 4 of 7 slots, or the longest steady run is the idle level. A swap found
 * inverts the comparator's output; the verdict is annotated either way.
 */
final class SwapDetector {
    private final StageContext ctx;
    private final Settings s;
    private final String levelsTrack;
    private final Comparator cmp;

    SwapDetector(StageContext ctx, Settings s, String levelsTrack, Comparator cmp) {
        this.ctx = ctx;
        this.s = s;
        this.levelsTrack = levelsTrack;
        this.cmp = cmp;
    }

    /**
     * Judges the warm-up.
     *
     * @param v   difference samples, volts
     * @param n   their count, at least 1
     * @param thr threshold, volts
     * @param hys hysteresis, volts
     * @param t0  warm-up start, fs
     * @param t1  warm-up end, fs
     */
    void detect(float[] v, int n, double thr, double hys, long t0, long t1) {
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
}
