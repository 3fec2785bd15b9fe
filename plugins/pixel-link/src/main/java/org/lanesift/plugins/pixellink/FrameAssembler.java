package org.lanesift.plugins.pixellink;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.FindingRef;
import org.lanesift.data.Frame;
import org.lanesift.time.Femtos;

/**
 * Turns the decoded pixel stream (one int per pixel: {@code 0xRRGGBB}, DE/HS/VS in bits 24..26,
 * flags in bits 27..31) into frames, timing measurements and annotations.
 *
 * <p>Lines are DE-high runs. Frames are separated by vertical blanking, recognised as a DE-low gap
 * holding at least two HS leading edges (when HS pulses are present) or longer than one line period
 * (DE-only links). Sync polarity is the level HS or VS enters when leaving a run that contained DE.
 * Vertical values are counted in lines between HS leading edges, or, without HS, in DE periods.
 * A frame is complete only when the blanking before and after it lay inside the capture and no
 * lock was lost during it; every other frame is output with {@code partial = true}.
 *
 * <p>This class follows the line and frame geometry (DE runs, HS and VS edges, the provisional
 * first gap on DE-only links) and feeds the measurements into {@link Timing}; the picture is kept
 * by a {@link PictureBuffer}, the per-frame bookkeeping by a {@link FrameState}, the sync
 * polarities are learned by {@link SyncPolarity}, and every annotation goes through
 * {@link FrameFindings}.
 */
final class FrameAssembler {
    static final int SUSPECT = 1 << 27;
    static final int GAP = 1 << 28;
    static final int INCOMPLETE = 1 << 29;
    static final int MISMATCH = 1 << 30;
    /** Some bit was flagged because of a finding the sampler made and named ({@link UpstreamFindings}). */
    static final int CAUSED = 1 << 31;
    private static final int F_SUSPECT = SUSPECT >>> 24;
    private static final int F_GAP = GAP >>> 24;
    private static final int F_INCOMPLETE = INCOMPLETE >>> 24;
    private static final int F_MISMATCH = MISMATCH >>> 24;
    private static final int F_CAUSED = CAUSED >>> 24;
    private static final long NONE = LineMark.NONE;

    /** Where results go. */
    interface Out {
        void frame(Frame f);

        void annotate(Annotation a);
    }

    /** How many annotations to emit. */
    enum Detail {
        LINES, FRAMES, ANOMALIES
    }

    private final String id;
    private final Out out;
    private final Timing timing;
    private final Pictures pictures;
    private final FrameFindings findings;
    private final int maxWidth;
    private final int maxHeight;
    private final double clockTol;
    /** The data-lane slip rule (single links only), or null. */
    private final LaneSlip slip;
    private final java.util.function.IntFunction<String> laneName;
    /** The sampler's findings behind flagged bits and clock breaks. */
    private final UpstreamFindings upstream;
    /** Time of the last pixel of the previous batch. */
    private long lastT = Long.MIN_VALUE;
    /** The last two pixels of the previous batch (-1 none), and a DE fall waiting for its next pixel. */
    private int prev1 = -1;
    private int prev2 = -1;
    private int pendingFall = -1;
    private long pendingFallT;
    /** The data-lane slip finding's reference, once found. */
    private String slipRef;

    private long n;
    private int ctrl = -1;
    private long validFrom;
    private long lastLostIdx = NONE;
    private long linesSeen;

    // line
    private final int[] line;
    private int x;
    private boolean lineOpen;
    private boolean lineTruncated;
    private long lineStartIdx = NONE;
    private long lineStartT;
    private long fallIdx = NONE;
    private long fallT;
    private final LineMark lastRise = new LineMark(-1);
    private long pRef = -1;
    private long leadIn = -1;

    // frame
    private final FrameState frame = new FrameState(NONE);
    private final PictureBuffer picture;

    // the first gap on DE-only links
    private final FirstGap firstGap = new FirstGap();

    // HS
    private final SyncPolarity hs;
    private long hsLeadIdx = NONE;
    private long hsLeadT;
    private long prevHsLeadIdx = NONE;
    private long hsTrailIdx = NONE;
    private long hsLines;
    private boolean riseSinceHsTrail = true;
    private boolean fallSinceHsLead;
    private int hsLeadsSinceFall;
    private boolean hsKnownAtFall;

    // VS
    private final SyncPolarity vs;
    private final LineMark vsLead = new LineMark(0);
    private final LineMark vsTrail = new LineMark(0);

    FrameAssembler(String id, Out out, Timing timing, Pictures pictures, int maxWidth, int maxHeight, Detail detail,
                   int hsForced, int vsForced, double clockTolPercent, String controlLane, int[][] singleLinkTables,
                   java.util.function.IntFunction<String> laneName, UpstreamFindings upstream) {
        this.id = id;
        this.out = out;
        this.timing = timing;
        this.pictures = pictures;
        this.findings = new FrameFindings(id, out, timing, detail, controlLane);
        this.maxWidth = maxWidth;
        this.maxHeight = maxHeight;
        this.hs = new SyncPolarity(hsForced);
        this.vs = new SyncPolarity(vsForced);
        this.picture = new PictureBuffer(maxHeight);
        this.clockTol = clockTolPercent / 100;
        this.line = new int[maxWidth];
        this.slip = singleLinkTables == null ? null : new LaneSlip(singleLinkTables);
        this.laneName = laneName;
        this.upstream = upstream;
    }

    /**
     * Consumes decoded pixels.
     *
     * @param px    pixels
     * @param t     time of each pixel, fs
     * @param count how many
     */
    void process(int[] px, long[] t, int count) {
        int c0 = ctrl;
        int xx = x;
        int[] ln = line;
        int cap = ln.length;
        long base = n;
        if (pendingFall != -1 && count > 0) {
            slipFound(slip.fall(pendingFall, px[0], pendingFallT));
            pendingFall = -1;
        }
        for (int i = 0; i < count; i++) {
            int p = px[i];
            if ((p >>> 24) == c0) {
                if ((c0 & 1) != 0) {
                    if (xx < cap) {
                        ln[xx] = p & 0xFFFFFF;
                    }
                    xx++;
                }
                continue;
            }
            x = xx;
            if (slip != null && c0 >= 0 && ((p >>> 24 ^ c0) & 1) != 0) {
                deEdgeForSlip(px, t, i, count);
            }
            slow(p, t[i], i > 0 ? t[i - 1] : lastT, base + i);
            xx = x;
            c0 = ctrl;
        }
        x = xx;
        n = base + count;
        if (count > 0) {
            lastT = t[count - 1];
        }
        timing.pixels = n;
        if (count >= 2) {
            prev2 = px[count - 2];
            prev1 = px[count - 1];
        } else if (count == 1) {
            prev2 = prev1;
            prev1 = px[0];
        }
    }

    /** Hands the blanking pixels beside a DE edge at {@code px[i]} to the data-lane slip rule. */
    private void deEdgeForSlip(int[] px, long[] t, int i, int count) {
        if ((px[i] >>> 24 & 1) == 0) {
            if (i + 1 < count) {
                slipFound(slip.fall(px[i], px[i + 1], t[i]));
            } else {
                pendingFall = px[i];
                pendingFallT = t[i];
            }
        } else {
            int last = i >= 1 ? px[i - 1] : prev1;
            int before = i >= 2 ? px[i - 2] : i == 1 ? prev1 : prev2;
            if (last != -1 && before != -1) {
                slipFound(slip.rise(before, last, t[i]));
            }
        }
    }

    /** The slip rule named a lane: one finding, and the frame being built (and every later one) is suspect. */
    private void slipFound(LaneSlip.Slip s) {
        if (s == null) {
            return;
        }
        slipRef = findings.laneSlip(laneName.apply(s.lane()), s.late(), s.unitIntervals(), s.firstFs());
        if (frame.isOpen()) {
            frame.markSuspect(slipRef);
        }
    }

    private void slow(int p, long t, long prevT, long idx) {
        int flags = p >>> 24;
        boolean incomplete = (flags & F_INCOMPLETE) != 0;
        if (incomplete || (flags & F_GAP) != 0) {
            lostLock(idx, t, incomplete ? "a pixel with missing bit slots or a lane without data" : "the clock stopped or jumped", incomplete,
                    incomplete ? null : upstream.breakBetween(prevT == Long.MIN_VALUE ? t : prevT, t));
        }
        if ((flags & F_SUSPECT) != 0) {
            frame.suspectPixel();
        } else if ((flags & F_CAUSED) != 0) {
            FindingRef r = upstream.flagsNear(t);
            if (r == null) {
                frame.suspectPixel(); // cannot happen: the lane buffer explained the flag with a reference it was given
            } else {
                frame.causedPixel(r.describe());
            }
        }
        if ((flags & F_MISMATCH) != 0) {
            if (frame.firstMismatch()) {
                findings.anomaly(idx, t, "link-mismatch", Severity.WARNING, "odd and even links disagree on DE/HS/VS");
            }
        }
        int c = incomplete ? Math.max(ctrl, 0) : (p >>> 24) & 7;
        int rgb = incomplete ? 0 : p & 0xFFFFFF;
        if (ctrl < 0) {
            ctrl = c;
            if ((c & 1) != 0) {
                lineOpen = true;
                lineTruncated = true;
                lineStartIdx = idx;
                lineStartT = t;
                x = 0;
            }
            hs.start((c & 1) != 0);
            vs.start((c & 1) != 0);
        } else {
            int changed = c ^ ctrl;
            boolean de = (c & 1) != 0;
            if ((changed & 1) != 0 && !de) {
                deFall(idx, t);
            }
            if ((changed & 2) != 0) {
                hsEdge(idx, t, (c & 2) != 0, de);
            }
            if ((changed & 4) != 0) {
                vsEdge(idx, t, (c & 4) != 0, de);
            }
            if ((changed & 1) != 0 && de) {
                deRise(idx, t);
            }
            ctrl = c;
        }
        if ((c & 1) != 0) {
            if (x < line.length) {
                line[x] = rgb;
            }
            x++;
        }
    }

    // ------------------------------------------------------------------ events

    /**
     * Lock is lost at a pixel. Missing bit slots are this decoder's own finding (an error). A clock
     * that stopped or jumped where the stage recovering the clock made a finding it named in the
     * bits ({@code cause}: its {@code clock-dropout} or {@code clock-glitch}) is that finding's
     * consequence, stated as information referring to it; a break no such finding accounts for
     * (the sampler was told to tolerate longer gaps, say) is this decoder's own finding, an error,
     * and the frame it breaks refers to it: either way the fault is found once.
     */
    private void lostLock(long idx, long t, String why, boolean incomplete, FindingRef cause) {
        if (lastLostIdx == NONE || idx - lastLostIdx > 1) {
            if (incomplete) {
                findings.anomaly(idx, t, "lost-lock", Severity.ERROR, "lock lost: " + why);
            } else if (cause != null) {
                findings.anomaly(idx, t, "lost-lock", Severity.INFO, "lock lost: " + why
                        + " (consequence: see " + cause.describe() + ")");
            } else {
                findings.anomaly(idx, t, "lost-lock", Severity.ERROR, "lock lost: " + why
                        + "; no finding of the stage that recovers the clock accounts for it");
            }
        }
        lastLostIdx = idx;
        validFrom = idx + (incomplete ? 1 : 0);
        if (frame.isOpen() && !frame.broken()) {
            String reason = "lock lost at " + Femtos.format(t) + " (" + why + ")";
            if (incomplete) {
                frame.markBroken(reason);
            } else {
                frame.markBrokenUpstream(reason);
            }
        }
        firstGap.drop();
        if (!lineOpen) {
            fallIdx = idx;
            fallT = t;
            hsLeadsSinceFall = 0;
            hsKnownAtFall = false;
        }
    }

    private void deFall(long idx, long t) {
        fallIdx = idx;
        fallT = t;
        fallSinceHsLead = true;
        hsLeadsSinceFall = 0;
        hsKnownAtFall = hs.known();
        if (!lineOpen) {
            return;
        }
        lineOpen = false;
        int len = x;
        x = 0;
        if (lineTruncated || !frame.isOpen()) {
            return;
        }
        linesSeen++;
        boolean valid = lineStartIdx >= validFrom;
        if (valid) {
            timing.hActive.add(len);
        }
        int width = picture.width();
        if (width < 0) {
            if (len > maxWidth) {
                findings.anomaly(lineStartIdx, lineStartT, "line-too-long", Severity.ERROR,
                        "line of " + len + " pixels is longer than maxWidth " + maxWidth);
                frame.markBroken("a line longer than maxWidth");
                return;
            }
            width = len;
            picture.width(len);
        }
        int rows = picture.rows();
        if (len != width && valid) {
            // (a line begun before a lock loss is cut by it: the loss is named, and its frame broken, already)
            frame.markSuspect(findings.lineLength(lineStartT, t, len, width, rows, frame.index()));
        }
        if (rows >= maxHeight) {
            if (frame.firstTooTallReport()) {
                findings.anomaly(lineStartIdx, lineStartT, "frame-too-tall", Severity.ERROR,
                        "frame has more than maxHeight " + maxHeight + " lines");
            }
            frame.markBroken("more lines than maxHeight");
            return;
        }
        picture.appendRow(line, len);
        frame.lastFallT(t);
        findings.line(lineStartT, t, len, rows, frame.index());
    }

    private long vLineOf(long idx) {
        if (lastRise.idx() == NONE || pRef <= 0) {
            return NONE;
        }
        return lastRise.vLine() + Math.round((idx - lastRise.idx()) / (double) pRef);
    }

    private void deRise(long idx, long t) {
        // resolve a provisional first gap (DE-only links, start of capture)
        if (firstGap.pendingAt(lastRise.idx()) && pRef <= 0) {
            long p2 = idx - firstGap.riseIdx();
            switch (firstGap.decide(idx)) {
                case VERTICAL -> {
                    pRef = p2;
                    splitAtFirstGap();
                }
                case HORIZONTAL_BEFORE_VERTICAL -> pRef = firstGap.periodPixels();
                case HORIZONTAL -> {
                    pRef = p2;
                    timing.hDePeriod.add(firstGap.periodPixels());
                }
            }
        }
        int kind; // 0 lead-in, 1 horizontal, 2 vertical, 3 provisional horizontal
        if (fallIdx == NONE) {
            kind = 0;
            leadIn = idx;
        } else {
            long gap = idx - fallIdx;
            if (hsKnownAtFall && hs.known()) {
                kind = hsLeadsSinceFall >= 2 ? 2 : 1;
            } else if (pRef > 0) {
                kind = gap > pRef ? 2 : 1;
            } else if (lastRise.since(validFrom)) {
                kind = 3;
                firstGap.hold(picture.rows(), gap, idx - lastRise.idx(), idx, t);
            } else {
                kind = 1;
            }
        }
        long vLine = (lastRise.idx() != NONE && pRef > 0) ? vLineOf(idx) : lastRise.vLine() + 1;
        long hsL = hs.known() ? hsLines : -1;
        if (kind == 2) {
            if (vs.known() && vsTrail.since(validFrom) && vsTrail.idx() > fallIdx) {
                long l = vsTrail.linesTo(hsL, vLine);
                if (l != NONE) {
                    timing.vBack.add(l);
                }
            }
            boolean prevStartSeen = frame.isOpen() && frameStartSeenNow();
            long pfRise = frame.firstRise();
            long pfT = frame.firstT();
            long pfHs = frame.firstHs();
            long pfV = frame.firstV();
            boolean pfBroken = frame.broken();
            if (frame.isOpen()) {
                closeFrame(true);
            }
            if (prevStartSeen && !pfBroken && pfRise != NONE && pfRise >= validFrom) {
                long l = LineMark.linesBetween(pfHs, pfV, hsL, vLine);
                if (l != NONE) {
                    timing.vTotal.add(l);
                }
                if (t > pfT) {
                    timing.refresh.add(1e15 / (t - pfT));
                    timing.clockPerFrame.add((idx - pfRise) * 1e15 / (t - pfT));
                }
            }
            openFrame(idx, t, fallIdx >= validFrom || idx - fallIdx > Math.max(pRef, 0), false, hsL, vLine);
        } else if (!frame.isOpen()) {
            openFrame(idx, t, false, kind == 0, hsL, vLine);
        } else if (kind == 1 && fallIdx >= validFrom && lastRise.since(validFrom)) {
            long per = idx - lastRise.idx();
            timing.hDeLow.add(idx - fallIdx);
            timing.hDePeriod.add(per);
            pRef = per;
            if (t > lastRise.t()) {
                double f = per * 1e15 / (t - lastRise.t());
                double ref = timing.clockPerLine.mean();
                if (timing.clockPerLine.count() >= 2 && Math.abs(f - ref) > clockTol * ref && frame.firstDriftReport()) {
                    findings.anomaly(idx, t, "clock-drift", Severity.WARNING, String.format(java.util.Locale.ROOT,
                            "pixel clock %.0f Hz over this line, %.0f Hz on average", f, ref));
                }
                timing.clockPerLine.add(f);
                timing.linePixels += per;
                timing.lineTimeFs += t - lastRise.t();
            }
        }
        if (hs.known() && !riseSinceHsTrail && hsTrailIdx != NONE && hsTrailIdx >= validFrom) {
            timing.hBack.add(idx - hsTrailIdx);
        }
        riseSinceHsTrail = true;
        hs.deSeen();
        vs.deSeen();
        lastRise.set(idx, t, hsL, vLine);
        lineOpen = true;
        lineTruncated = false;
        lineStartIdx = idx;
        lineStartT = t;
        x = 0;
    }

    private void hsEdge(long idx, long t, boolean level, boolean deNow) {
        int lv = level ? 1 : 0;
        boolean knew = hs.known();
        if (!hs.edge(lv, deNow)) {
            return;
        }
        if (!knew) {
            timing.hsActive = hs.active();
        }
        if (lv == hs.active()) {
            hsLines++;
            if (prevHsLeadIdx != NONE && prevHsLeadIdx >= validFrom) {
                timing.hTotal.add(idx - prevHsLeadIdx);
            }
            if (fallSinceHsLead && !lineOpen && fallIdx != NONE && fallIdx >= validFrom && frame.isOpen()) {
                timing.hFront.add(idx - fallIdx);
            }
            fallSinceHsLead = false;
            hsLeadsSinceFall++;
            prevHsLeadIdx = idx;
            hsLeadIdx = idx;
            hsLeadT = t;
        } else {
            if (hsLeadIdx != NONE && hsLeadIdx >= validFrom) {
                long w = idx - hsLeadIdx;
                timing.hSync.add(w);
                findings.hsync(hsLeadT, t, w);
            }
            hsTrailIdx = idx;
            riseSinceHsTrail = false;
        }
    }

    private void vsEdge(long idx, long t, boolean level, boolean deNow) {
        int lv = level ? 1 : 0;
        boolean knew = vs.known();
        if (!vs.edge(lv, deNow)) {
            return;
        }
        if (!knew) {
            timing.vsActive = vs.active();
        }
        long hsL = hs.known() ? hsLines : -1;
        long vL = vLineOf(idx);
        if (lv == vs.active()) {
            vsLead.set(idx, t, hsL, vL);
            if (lastRise.since(validFrom) && !lineOpen) {
                long l = lastRise.linesTo(hsL, vL);
                if (l != NONE) {
                    timing.vFront.add(l - 1);
                }
            }
            if (hs.known() && hsLeadIdx != NONE && hsLeadIdx >= validFrom) {
                timing.vSyncOffset.add(idx - hsLeadIdx);
            }
        } else {
            if (vsLead.since(validFrom)) {
                long l = vsLead.linesTo(hsL, vL);
                if (l != NONE) {
                    timing.vSync.add(l);
                }
                findings.vsync(vsLead.t(), t, idx - vsLead.idx(), l, NONE);
            }
            vsTrail.set(idx, t, hsL, vL);
        }
    }

    // ------------------------------------------------------------------ frames

    private void openFrame(long idx, long t, boolean startSeen, boolean startPending, long hsL, long vL) {
        frame.open(idx, t, startSeen, startPending, hsL, vL);
        picture.reset();
        if (slipRef != null) {
            frame.markSuspect(slipRef);
        }
    }

    private boolean frameStartSeenNow() {
        if (frame.startPending()) {
            return validFrom == 0 && pRef > 0 && leadIn > pRef;
        }
        return frame.startSeen();
    }

    /** The provisional first gap was vertical blanking: the rows after it start a new frame. */
    private void splitAtFirstGap() {
        int w = picture.width();
        int row = firstGap.row();
        if (!frame.isOpen() || w <= 0 || row > picture.rows()) {
            return;
        }
        int tailRows = picture.rows() - row;
        int[] tail = picture.cutFrom(row);
        long keepLastFall = frame.lastFallT();
        frame.lastFallT(firstGap.riseT());
        closeFrame(true);
        openFrame(firstGap.riseIdx(), firstGap.riseT(), true, false, -1, 0);
        picture.refill(w, tail, tailRows);
        frame.lastFallT(keepLastFall);
        lastRise.vLine(tailRows);
    }

    private void closeFrame(boolean endSeen) {
        if (!frame.isOpen()) {
            return;
        }
        frame.close();
        boolean startSeen = frameStartSeenNow();
        int rows = picture.rows();
        int width = picture.width();
        if (rows == 0 || width <= 0) {
            return;
        }
        boolean complete = startSeen && endSeen && !frame.broken();
        boolean suspect = frame.suspect();
        long index = frame.index();
        Frame f = new Frame(id, frame.firstT(), Math.max(frame.lastFallT(), frame.firstT()), index, width, rows,
                picture.pixels(), !complete, suspect);
        if (complete) {
            timing.framesComplete++;
            timing.vActive.add(rows);
        } else {
            timing.framesPartial++;
        }
        if (suspect) {
            timing.framesSuspect++;
        }
        String why = complete ? null : frame.broken() ? frame.brokenReason()
                : !startSeen ? "the capture began inside this frame" : "the capture ended inside this frame";
        // partial only because the capture began or ended inside it (a fact of the capture window), or
        // because of a clock fault found upstream: no fault of its own
        boolean windowOnly = !complete && (!frame.broken() || frame.brokenElsewhere());
        findings.frame(f, index, complete, suspect, why, windowOnly, frame.suspectPixels(), frame.causedPixels(), frame.suspectCause());
        out.frame(f);
        if (pictures != null) {
            pictures.offer(f);
        }
        frame.advanceIndex();
    }

    /** Flushes at the end of the capture. */
    void finish() {
        if (lineOpen) {
            lineOpen = false;
            x = 0;
            frame.markCaptureEnd("the capture ended inside a line");
        }
        boolean endSeen = false;
        if (fallIdx != NONE && fallIdx >= validFrom) {
            if (hsKnownAtFall && hs.known()) {
                endSeen = hsLeadsSinceFall >= 2;
            } else {
                endSeen = pRef > 0 && n - fallIdx > pRef;
            }
        }
        if (frame.isOpen()) {
            closeFrame(endSeen);
        }
        if (linesSeen == 0) {
            findings.shortCapture(n);
        }
    }

    long pixels() {
        return n;
    }
}
