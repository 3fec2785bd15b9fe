package org.lanesift.plugins.pixellink;

/**
 * Bookkeeping of the frame being assembled, apart from its picture: whether one is open, whether
 * its start was seen, whether it broke (and why), whether any pixel was suspect, where its first
 * line began (pixel index, time in fs, and line number by HS count and by DE period), its last
 * line's end time, and the one-report-per-frame latches. The frame index counts every frame
 * closed so far and is not reset.
 */
final class FrameState {
    private boolean open;
    private boolean startSeen;
    private boolean startPending;
    private boolean broken;
    private String brokenReason;
    private boolean brokenElsewhere;
    private boolean suspect;
    private String suspectCause;
    private long firstRise;
    private long firstT;
    private long firstV;
    private long firstHs;
    private long index;
    private long suspectPixels;
    private long causedPixels;
    private long mismatches;
    private boolean driftReported;
    private boolean tooTallReported;
    private long lastFallT;

    /** @param noneIdx the pixel index meaning "none" */
    FrameState(long noneIdx) {
        firstRise = noneIdx;
    }

    /**
     * Opens a frame at its first line.
     *
     * @param idx          pixel index of the first line's start
     * @param t            its time, fs
     * @param seen         the blanking before it lay in the capture
     * @param pending      whether the start can be decided only once the line period is known
     * @param hsLine       line number by HS count, or -1 without HS
     * @param vLine        line number by DE period
     */
    void open(long idx, long t, boolean seen, boolean pending, long hsLine, long vLine) {
        open = true;
        startSeen = seen;
        startPending = pending;
        broken = false;
        brokenElsewhere = false;
        suspect = false;
        suspectCause = null;
        brokenReason = null;
        firstRise = idx;
        firstT = t;
        firstHs = hsLine;
        firstV = vLine;
        suspectPixels = 0;
        causedPixels = 0;
        mismatches = 0;
        driftReported = false;
        tooTallReported = false;
        lastFallT = t;
    }

    /** Closes the frame; {@link #advanceIndex} follows when it was output. */
    void close() {
        open = false;
    }

    /** The frame was output: the next one gets the next index. */
    void advanceIndex() {
        index++;
    }

    boolean isOpen() {
        return open;
    }

    /** Whether the start was seen, when that was not left pending. */
    boolean startSeen() {
        return startSeen;
    }

    boolean startPending() {
        return startPending;
    }

    /** The first reason the frame broke is kept. */
    void markBroken(String why) {
        if (!broken) {
            broken = true;
            brokenReason = why;
        }
    }

    /** The capture ended inside this frame's line: partial through the capture window, not a fault. */
    void markCaptureEnd(String why) {
        if (!broken) {
            brokenElsewhere = true;
        }
        markBroken(why);
    }

    /**
     * Marks the frame broken by a clock fault stated once elsewhere: a finding of the stage
     * recovering the clock, or this decoder's own {@code lost-lock} finding.
     *
     * @param why the reason, for the frame's annotation
     */
    void markBrokenUpstream(String why) {
        if (!broken) {
            brokenElsewhere = true;
        }
        markBroken(why);
    }

    /**
     * Whether the frame was broken only by a fact reported elsewhere: the capture's end, or a clock
     * fault found upstream.
     *
     * @return true if the frame's break is no finding of its own
     */
    boolean brokenElsewhere() {
        return brokenElsewhere;
    }

    boolean broken() {
        return broken;
    }

    String brokenReason() {
        return brokenReason;
    }

    /**
     * Marks the frame suspect because of a finding stated once elsewhere (the first is kept).
     *
     * @param cause a reference to that finding, e.g. "the line-length finding at 1.2 us"
     */
    void markSuspect(String cause) {
        suspect = true;
        if (suspectCause == null) {
            suspectCause = cause;
        }
    }

    /**
     * Why the frame is suspect when that is only the consequence of findings stated elsewhere:
     * null when it holds pixels with flagged bits (its own finding) or is not suspect.
     *
     * @return the reference to the finding, or null
     */
    String suspectCause() {
        return suspectPixels > 0 ? null : suspectCause;
    }

    /**
     * A pixel whose flagged bits a finding of the sampler accounts for arrived: the frame is suspect
     * as that finding's consequence (counted also between frames; opening resets the count).
     *
     * @param cause a reference to that finding, for the frame's annotation
     */
    void causedPixel(String cause) {
        if (open) {
            markSuspect(cause);
        }
        causedPixels++;
    }

    long causedPixels() {
        return causedPixels;
    }

    /** A pixel with flagged bits arrived (counted also between frames; opening resets the count). */
    void suspectPixel() {
        suspect |= open;
        suspectPixels++;
    }

    boolean suspect() {
        return suspect;
    }

    long suspectPixels() {
        return suspectPixels;
    }

    /** Counts a pixel whose odd and even links disagree; true for the first since the frame opened. */
    boolean firstMismatch() {
        return mismatches++ == 0;
    }

    /** True the first time it is asked per frame: clock drift is reported once a frame. */
    boolean firstDriftReport() {
        if (driftReported) {
            return false;
        }
        driftReported = true;
        return true;
    }

    /** True the first time it is asked per frame: too many lines is reported once a frame. */
    boolean firstTooTallReport() {
        if (tooTallReported) {
            return false;
        }
        tooTallReported = true;
        return true;
    }

    long firstRise() {
        return firstRise;
    }

    long firstT() {
        return firstT;
    }

    long firstHs() {
        return firstHs;
    }

    long firstV() {
        return firstV;
    }

    long index() {
        return index;
    }

    long lastFallT() {
        return lastFallT;
    }

    /** @param t end time of the latest line, fs */
    void lastFallT(long t) {
        lastFallT = t;
    }
}
