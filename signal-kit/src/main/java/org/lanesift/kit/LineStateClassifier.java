package org.lanesift.kit;

/**
 * Tells the line state of a lane from one sample of each single-ended leg, in volts. Each leg
 * reads high above {@code highVolts}, low below {@code lowVolts}, and keeps its last reading in
 * between (the hysteresis of a low-power receiver; the first sample is read against the middle of
 * the two thresholds). Both legs low with a common mode inside
 * {@code [hsCommonMinVolts, hsCommonMaxVolts]} is high speed; below it, LP-00; above it, invalid.
 * Defaults: docs/reference-facts.md#d-phy-levels-and-states (MIPI D-PHY, from memory). One
 * instance per lane: it keeps the legs' last readings.
 */
public final class LineStateClassifier {
    /** Low-power receiver: a leg above this reads high, volts. */
    public static final double DEFAULT_HIGH_VOLTS = 0.88;
    /** Low-power receiver: a leg below this reads low, volts. */
    public static final double DEFAULT_LOW_VOLTS = 0.55;
    /** Lowest common mode counted as high speed, volts. */
    public static final double DEFAULT_HS_COMMON_MIN_VOLTS = 0.07;
    /** Highest common mode counted as high speed, volts. */
    public static final double DEFAULT_HS_COMMON_MAX_VOLTS = 0.33;
    /** A line state must last this long to count, femtoseconds (30 ns: below the shortest low-power state, about 50 ns, docs/reference-facts.md#d-phy-levels-and-states). */
    public static final long DEFAULT_MIN_STATE_FS = 30_000_000L;

    private final float highVolts;
    private final float lowVolts;
    private final float cmMinVolts;
    private final float cmMaxVolts;
    private boolean legP;
    private boolean legN;
    private boolean legsKnown;

    /**
     * @param highVolts  leg high threshold, volts
     * @param lowVolts   leg low threshold, volts (below {@code highVolts})
     * @param cmMinVolts lowest high-speed common mode, volts
     * @param cmMaxVolts highest high-speed common mode, volts
     */
    public LineStateClassifier(double highVolts, double lowVolts, double cmMinVolts, double cmMaxVolts) {
        this.highVolts = (float) highVolts;
        this.lowVolts = (float) lowVolts;
        this.cmMinVolts = (float) cmMinVolts;
        this.cmMaxVolts = (float) cmMaxVolts;
    }

    /** A classifier with the default D-PHY thresholds. */
    public static LineStateClassifier dphy() {
        return new LineStateClassifier(DEFAULT_HIGH_VOLTS, DEFAULT_LOW_VOLTS, DEFAULT_HS_COMMON_MIN_VOLTS, DEFAULT_HS_COMMON_MAX_VOLTS);
    }

    /**
     * The state of sample pair {@code ip}/{@code in} of two leg blocks: {@link LineState#INVALID}
     * where either sample is marked invalid (the leg's reading is then kept), else
     * {@link #classify(float, float)}.
     *
     * @param p        positive leg samples
     * @param ip       index of the positive sample
     * @param pInvalid validity mask of the positive block (bit i set: sample i invalid) or null
     * @param n        negative leg samples
     * @param in       index of the negative sample
     * @param nInvalid validity mask of the negative block or null
     * @return the state of this sample pair
     */
    public LineState classify(float[] p, int ip, long[] pInvalid, float[] n, int in, long[] nInvalid) {
        if (pInvalid != null && (pInvalid[ip >>> 6] >>> ip & 1L) != 0 || nInvalid != null && (nInvalid[in >>> 6] >>> in & 1L) != 0) {
            return LineState.INVALID;
        }
        return classify(p[ip], n[in]);
    }

    /**
     * @param vp positive leg, volts
     * @param vn negative leg, volts
     * @return the state of this sample pair
     */
    public LineState classify(float vp, float vn) {
        if (!legsKnown) {
            legP = vp > (highVolts + lowVolts) * 0.5f;
            legN = vn > (highVolts + lowVolts) * 0.5f;
            legsKnown = true;
        }
        if (vp > highVolts) {
            legP = true;
        } else if (vp < lowVolts) {
            legP = false;
        }
        if (vn > highVolts) {
            legN = true;
        } else if (vn < lowVolts) {
            legN = false;
        }
        if (legP) {
            return legN ? LineState.LP11 : LineState.LP10;
        }
        if (legN) {
            return LineState.LP01;
        }
        float cm = (vp + vn) * 0.5f;
        if (cm < cmMinVolts) {
            return LineState.LP00;
        }
        return cm <= cmMaxVolts ? LineState.HS : LineState.INVALID;
    }
}
