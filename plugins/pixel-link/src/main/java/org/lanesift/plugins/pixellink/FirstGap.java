package org.lanesift.plugins.pixellink;

/**
 * The first DE-low gap of a link without HS, before any line period is known: it may be
 * horizontal or vertical blanking. It is held provisionally (taken as horizontal) until the next
 * DE rise gives a second rise-to-rise period; comparing the two (a ratio above 3/2 counts as
 * different) decides what the gap was. Pixel counts and indices throughout.
 */
final class FirstGap {
    /** What the provisional gap turned out to be. */
    enum Verdict {
        /** The period across the gap is the longer one and the gap exceeds a line: it was vertical blanking. */
        VERTICAL,
        /** The new period is the longer one: the gap was horizontal and the next gap is vertical. */
        HORIZONTAL_BEFORE_VERTICAL,
        /** The two periods are alike: both were lines. */
        HORIZONTAL
    }

    private boolean pending;
    private int row;
    private long gap;
    private long period;
    private long riseIdx;
    private long riseT;

    /**
     * Holds a gap provisionally.
     *
     * @param rowAfter  rows of the frame picture before the line that follows the gap
     * @param gapPixels DE-low pixels of the gap
     * @param periodPixels rise-to-rise pixels across the gap
     * @param idx       pixel index of the DE rise ending the gap
     * @param t         its time, fs
     */
    void hold(int rowAfter, long gapPixels, long periodPixels, long idx, long t) {
        pending = true;
        row = rowAfter;
        gap = gapPixels;
        period = periodPixels;
        riseIdx = idx;
        riseT = t;
    }

    /** Forgets a held gap (lock was lost). */
    void drop() {
        pending = false;
    }

    /** Whether a gap is held and the rise ending it is the latest one. */
    boolean pendingAt(long lastRiseIdx) {
        return pending && lastRiseIdx == riseIdx;
    }

    /**
     * Decides, at the next DE rise, and forgets the gap.
     *
     * @param idx pixel index of that rise
     * @return the verdict
     */
    Verdict decide(long idx) {
        pending = false;
        long p2 = idx - riseIdx;
        if (2 * period > 3 * p2 && gap > p2) {
            return Verdict.VERTICAL;
        }
        if (2 * p2 > 3 * period) {
            return Verdict.HORIZONTAL_BEFORE_VERTICAL;
        }
        return Verdict.HORIZONTAL;
    }

    /** Rise-to-rise pixels across the gap. */
    long periodPixels() {
        return period;
    }

    /** Rows of the picture before the line after the gap. */
    int row() {
        return row;
    }

    /** Pixel index of the rise ending the gap. */
    long riseIdx() {
        return riseIdx;
    }

    /** Time of the rise ending the gap, fs. */
    long riseT() {
        return riseT;
    }
}
