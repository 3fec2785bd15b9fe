package org.lanesift.plugins.differential;

/**
 * The levels the comparator follows: learned over the warm-up or from the first full window, then
 * moved toward each window's settled levels by {@code 1 - exp(-window / adaptSamples)}, with the
 * threshold and hysteresis that follow from them where those are learned.
 */
final class LevelTracker {
    /** Fewest settled samples per state for a window's levels to count. */
    static final long MIN_LEVEL_SAMPLES = 8;
    /** Samples count as settled on a level when at least this fraction of the way from the threshold to it. */
    static final double SETTLED_FRACTION = 0.7;

    private final Settings s;
    private double low = Double.NaN;
    private double high = Double.NaN;
    private boolean learned;

    LevelTracker(Settings s) {
        this.s = s;
    }

    void learned(double lowVolts, double highVolts) {
        low = lowVolts;
        high = highVolts;
        learned = true;
    }

    /**
     * Half-width of the band around the threshold outside which samples count as settled on a
     * level: {@link #SETTLED_FRACTION} of the way from the threshold to the learned levels, so that
     * samples on an edge do not pull the levels in. A window with too few settled samples of a
     * level (the levels dropped suddenly) takes that level from every sample outside the
     * hysteresis band instead.
     */
    float settledHalfBand() {
        return learned ? (float) (SETTLED_FRACTION * (high - low) / 2) : 0f;
    }

    /** Follows a finished window's levels and moves the comparator's threshold and hysteresis with them where they are learned. */
    void adapt(LevelAcc w, double adaptSamples, Comparator cmp) {
        if (!w.hasBothLevels(MIN_LEVEL_SAMPLES)) {
            return;
        }
        boolean thrAuto = s.autoThreshold() && !(s.mode == Settings.Mode.SINGLE && s.reference == Settings.Reference.MEDIAN);
        boolean hysAuto = s.autoHysteresis();
        double lo = w.mean(0);
        double hi = w.mean(1);
        if (!learned) {
            learned(lo, hi);
        } else if (adaptSamples > 0) {
            double alpha = 1 - Math.exp(-(w.endIndex - w.startIndex) / adaptSamples);
            low += alpha * (lo - low);
            high += alpha * (hi - high);
        } else {
            return;
        }
        if (!thrAuto && !hysAuto) {
            return;
        }
        double thr = thrAuto ? 0.5 * (low + high) : cmp.threshold();
        double hys = hysAuto ? s.hysteresisFraction * (high - low) : cmp.hysteresis();
        if ((float) thr != cmp.threshold() || (float) (thr + hys / 2) - (float) (thr - hys / 2) != cmp.hysteresis()) {
            cmp.setThreshold(thr, hys, w.endIndex);
        }
    }
}
