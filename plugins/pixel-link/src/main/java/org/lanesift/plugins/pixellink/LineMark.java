package org.lanesift.plugins.pixellink;

/**
 * Where a line-level event happened (a DE rise, a VS edge): its pixel index, its time in fs, and
 * the line it fell on counted two ways: by HS leading edges (-1 without HS) and by DE periods
 * ({@link #NONE} while the line period is unknown). Vertical distances use the HS count when both
 * ends have it, the DE-period count otherwise.
 */
final class LineMark {
    /** No index, no line number. */
    static final long NONE = Long.MIN_VALUE / 4;

    private long idx = NONE;
    private long t;
    private long hsLine;
    private long vLine;

    /** @param hsLine the HS line number before the first event */
    LineMark(long hsLine) {
        this.hsLine = hsLine;
    }

    void set(long pixelIdx, long timeFs, long hsLineNow, long vLineNow) {
        idx = pixelIdx;
        t = timeFs;
        hsLine = hsLineNow;
        vLine = vLineNow;
    }

    /** Pixel index, or {@link #NONE} before the first event. */
    long idx() {
        return idx;
    }

    /** Whether an event happened at or after pixel {@code from}. */
    boolean since(long from) {
        return idx != NONE && idx >= from;
    }

    long t() {
        return t;
    }

    long vLine() {
        return vLine;
    }

    /** Renumbers the DE-period line (after a frame was split behind this event). */
    void vLine(long line) {
        vLine = line;
    }

    /** Lines from this event to a later one, or {@link #NONE} when neither count covers both. */
    long linesTo(long hsLineThen, long vLineThen) {
        return linesBetween(hsLine, vLine, hsLineThen, vLineThen);
    }

    /** Lines from a to b, by HS count when both have one, else by DE periods, else {@link #NONE}. */
    static long linesBetween(long aHs, long aV, long bHs, long bV) {
        if (aHs >= 0 && bHs >= 0) {
            return bHs - aHs;
        }
        if (aV != NONE && bV != NONE) {
            return bV - aV;
        }
        return NONE;
    }
}
