package org.lanesift.plugins.pixellink;

import java.util.Arrays;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Frame;
import org.lanesift.time.Femtos;

/**
 * Turns the decoded pixel stream (one int per pixel: {@code 0xRRGGBB}, DE/HS/VS in bits 24..26,
 * flags in bits 27..30) into frames, timing measurements and annotations.
 *
 * <p>Lines are DE-high runs. Frames are separated by vertical blanking, recognised as a DE-low gap
 * holding at least two HS leading edges (when HS pulses are present) or longer than one line period
 * (DE-only links). Sync polarity is the level HS or VS enters when leaving a run that contained DE.
 * Vertical values are counted in lines between HS leading edges, or, without HS, in DE periods.
 * A frame is complete only when the blanking before and after it lay inside the capture and no
 * lock was lost during it; every other frame is output with {@code partial = true}.
 */
final class FrameAssembler {
    static final int SUSPECT = 1 << 27;
    static final int GAP = 1 << 28;
    static final int INCOMPLETE = 1 << 29;
    static final int MISMATCH = 1 << 30;
    private static final int F_SUSPECT = SUSPECT >>> 24;
    private static final int F_GAP = GAP >>> 24;
    private static final int F_INCOMPLETE = INCOMPLETE >>> 24;
    private static final int F_MISMATCH = MISMATCH >>> 24;
    private static final long NONE = Long.MIN_VALUE / 4;

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
    final Timing timing;
    private final Pictures pictures;
    private final int maxWidth;
    private final int maxHeight;
    private final Detail detail;
    private final int hsForced;
    private final int vsForced;
    private final double clockTol;
    private final String trackFrames;
    private final String trackLines;
    private final String trackSync;
    private final String trackAnom;

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
    private long lastRiseIdx = NONE;
    private long lastRiseT;
    private long lastRiseV;
    private long lastRiseHs = -1;
    private long pRef = -1;
    private long leadIn = -1;

    // frame
    private boolean frameOpen;
    private int[] buf = new int[0];
    private int rows;
    private int width = -1;
    private boolean frameStartSeen;
    private boolean frameStartPending;
    private boolean frameBroken;
    private boolean frameSuspect;
    private String brokenReason;
    private long frameFirstRise = NONE;
    private long frameFirstT;
    private long frameFirstV;
    private long frameFirstHs;
    private long frameIndex;
    private long frameSuspectBits;
    private long frameMismatch;
    private boolean frameDriftReported;
    private boolean frameTooTallReported;
    private long frameLastFallT;

    // bootstrap of the first gap on DE-only links
    private boolean bootPending;
    private int bootRow;
    private long bootGap;
    private long bootPeriod;
    private long bootIdx;
    private long bootT;

    // HS
    private int hsActive = -1;
    private boolean deInHsRun;
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
    private int vsActive = -1;
    private boolean deInVsRun;
    private long vsLeadIdx = NONE;
    private long vsLeadT;
    private long vsLeadHs;
    private long vsLeadV;
    private long vsTrailIdx = NONE;
    private long vsTrailHs;
    private long vsTrailV;

    FrameAssembler(String id, Out out, Timing timing, Pictures pictures, int maxWidth, int maxHeight, Detail detail,
                   int hsForced, int vsForced, double clockTolPercent) {
        this.id = id;
        this.out = out;
        this.timing = timing;
        this.pictures = pictures;
        this.maxWidth = maxWidth;
        this.maxHeight = maxHeight;
        this.detail = detail;
        this.hsForced = hsForced;
        this.vsForced = vsForced;
        this.clockTol = clockTolPercent / 100;
        this.line = new int[maxWidth];
        trackFrames = id + ".frames";
        trackLines = id + ".lines";
        trackSync = id + ".sync";
        trackAnom = id + ".anomalies";
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
            slow(p, t[i], base + i);
            xx = x;
            c0 = ctrl;
        }
        x = xx;
        n = base + count;
        timing.pixels = n;
    }

    private void slow(int p, long t, long idx) {
        int flags = p >>> 24;
        boolean incomplete = (flags & F_INCOMPLETE) != 0;
        if (incomplete || (flags & F_GAP) != 0) {
            lostLock(idx, t, incomplete ? "a pixel with missing bit slots or a lane without data" : "the clock stopped or jumped", incomplete);
        }
        if ((flags & F_SUSPECT) != 0) {
            frameSuspect |= frameOpen;
            frameSuspectBits++;
        }
        if ((flags & F_MISMATCH) != 0) {
            if (frameMismatch++ == 0) {
                timing.anomaly("link-mismatch");
                anomaly(idx, t, "link-mismatch", Severity.WARNING, "odd and even links disagree on DE/HS/VS");
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
            deInHsRun = (c & 1) != 0;
            deInVsRun = deInHsRun;
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

    private void lostLock(long idx, long t, String why, boolean incomplete) {
        if (lastLostIdx == NONE || idx - lastLostIdx > 1) {
            timing.anomaly("lost-lock");
            anomaly(idx, t, "lost-lock", Severity.ERROR, "lock lost: " + why);
        }
        lastLostIdx = idx;
        validFrom = idx + (incomplete ? 1 : 0);
        if (frameOpen && !frameBroken) {
            frameBroken = true;
            brokenReason = "lock lost at " + Femtos.format(t) + " (" + why + ")";
        }
        bootPending = false;
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
        hsKnownAtFall = hsActive >= 0;
        if (!lineOpen) {
            return;
        }
        lineOpen = false;
        int len = x;
        x = 0;
        if (lineTruncated || !frameOpen) {
            return;
        }
        linesSeen++;
        boolean valid = lineStartIdx >= validFrom;
        if (valid) {
            timing.hActive.add(len);
        }
        if (width < 0) {
            if (len > maxWidth) {
                timing.anomaly("line-too-long");
                anomaly(lineStartIdx, lineStartT, "line-too-long", Severity.ERROR,
                        "line of " + len + " pixels is longer than maxWidth " + maxWidth);
                markBroken("a line longer than maxWidth");
                return;
            }
            width = len;
        }
        if (len != width) {
            timing.anomaly("line-length");
            frameSuspect = true;
            out.annotate(Annotation.on(trackAnom, "line-length").span(lineStartT, t).severity(Severity.WARNING)
                    .label("line " + rows + ": " + len + " px, expected " + width)
                    .field("pixels", Field.integer(len, "px")).field("expected", Field.integer(width, "px"))
                    .field("row", Field.integer(rows, "")).field("frame", Field.integer(frameIndex, "")).build());
        }
        if (rows >= maxHeight) {
            if (!frameTooTallReported) {
                frameTooTallReported = true;
                timing.anomaly("frame-too-tall");
                anomaly(lineStartIdx, lineStartT, "frame-too-tall", Severity.ERROR,
                        "frame has more than maxHeight " + maxHeight + " lines");
            }
            markBroken("more lines than maxHeight");
            return;
        }
        long need = (long) (rows + 1) * width;
        if (need > buf.length) {
            buf = Arrays.copyOf(buf, (int) Math.min(Math.max(need, 2L * buf.length), (long) maxHeight * width));
        }
        int off = rows * width;
        int copy = Math.min(len, width);
        System.arraycopy(line, 0, buf, off, Math.min(copy, line.length));
        if (copy < width) {
            Arrays.fill(buf, off + copy, off + width, 0);
        }
        rows++;
        frameLastFallT = t;
        if (detail == Detail.LINES) {
            out.annotate(Annotation.on(trackLines, "line").span(lineStartT, t).label(len + " px")
                    .field("pixels", Field.integer(len, "px")).field("row", Field.integer(rows - 1, ""))
                    .field("frame", Field.integer(frameIndex, "")).build());
        }
    }

    private void markBroken(String why) {
        if (!frameBroken) {
            frameBroken = true;
            brokenReason = why;
        }
    }

    private long vLineOf(long idx) {
        if (lastRiseIdx == NONE || pRef <= 0) {
            return NONE;
        }
        return lastRiseV + Math.round((idx - lastRiseIdx) / (double) pRef);
    }

    private static long linesBetween(long aHs, long aV, long bHs, long bV) {
        if (aHs >= 0 && bHs >= 0) {
            return bHs - aHs;
        }
        if (aV != NONE && bV != NONE) {
            return bV - aV;
        }
        return NONE;
    }

    private void deRise(long idx, long t) {
        // resolve a provisional first gap (DE-only links, start of capture)
        if (bootPending && lastRiseIdx == bootIdx && pRef <= 0) {
            bootPending = false;
            long p2 = idx - bootIdx;
            if (2 * bootPeriod > 3 * p2 && bootGap > p2) {
                pRef = p2;
                splitAtBoot();
            } else if (2 * p2 > 3 * bootPeriod) {
                pRef = bootPeriod;
            } else {
                pRef = p2;
                timing.hDePeriod.add(bootPeriod);
            }
        }
        int kind; // 0 lead-in, 1 horizontal, 2 vertical, 3 provisional horizontal
        if (fallIdx == NONE) {
            kind = 0;
            leadIn = idx;
        } else {
            long gap = idx - fallIdx;
            if (hsKnownAtFall && hsActive >= 0) {
                kind = hsLeadsSinceFall >= 2 ? 2 : 1;
            } else if (pRef > 0) {
                kind = gap > pRef ? 2 : 1;
            } else if (lastRiseIdx != NONE && lastRiseIdx >= validFrom) {
                kind = 3;
                bootPending = true;
                bootRow = rows;
                bootGap = gap;
                bootPeriod = idx - lastRiseIdx;
                bootIdx = idx;
                bootT = t;
            } else {
                kind = 1;
            }
        }
        long vLine = (lastRiseIdx != NONE && pRef > 0) ? vLineOf(idx) : lastRiseV + 1;
        long hsL = hsActive >= 0 ? hsLines : -1;
        if (kind == 2) {
            if (vsActive >= 0 && vsTrailIdx != NONE && vsTrailIdx >= validFrom && vsTrailIdx > fallIdx) {
                long l = linesBetween(vsTrailHs, vsTrailV, hsL, vLine);
                if (l != NONE) {
                    timing.vBack.add(l);
                }
            }
            boolean prevStartSeen = frameOpen && frameStartSeenNow();
            long pfRise = frameFirstRise;
            long pfT = frameFirstT;
            long pfHs = frameFirstHs;
            long pfV = frameFirstV;
            boolean pfBroken = frameBroken;
            if (frameOpen) {
                closeFrame(true);
            }
            if (prevStartSeen && !pfBroken && pfRise != NONE && pfRise >= validFrom) {
                long l = linesBetween(pfHs, pfV, hsL, vLine);
                if (l != NONE) {
                    timing.vTotal.add(l);
                }
                if (t > pfT) {
                    timing.refresh.add(1e15 / (t - pfT));
                    timing.clockPerFrame.add((idx - pfRise) * 1e15 / (t - pfT));
                }
            }
            openFrame(idx, t, fallIdx >= validFrom || idx - fallIdx > Math.max(pRef, 0), false, hsL, vLine);
        } else if (!frameOpen) {
            openFrame(idx, t, false, kind == 0, hsL, vLine);
        } else if (kind == 1 && fallIdx >= validFrom && lastRiseIdx != NONE && lastRiseIdx >= validFrom) {
            long per = idx - lastRiseIdx;
            timing.hDeLow.add(idx - fallIdx);
            timing.hDePeriod.add(per);
            pRef = per;
            if (t > lastRiseT) {
                double f = per * 1e15 / (t - lastRiseT);
                double ref = timing.clockPerLine.mean();
                if (timing.clockPerLine.count() >= 2 && Math.abs(f - ref) > clockTol * ref && !frameDriftReported) {
                    frameDriftReported = true;
                    timing.anomaly("clock-drift");
                    anomaly(idx, t, "clock-drift", Severity.WARNING, String.format(java.util.Locale.ROOT,
                            "pixel clock %.0f Hz over this line, %.0f Hz on average", f, ref));
                }
                timing.clockPerLine.add(f);
                timing.linePixels += per;
                timing.lineTimeFs += t - lastRiseT;
            }
        }
        if (hsActive >= 0 && !riseSinceHsTrail && hsTrailIdx != NONE && hsTrailIdx >= validFrom) {
            timing.hBack.add(idx - hsTrailIdx);
        }
        riseSinceHsTrail = true;
        deInHsRun = true;
        deInVsRun = true;
        lastRiseIdx = idx;
        lastRiseT = t;
        lastRiseV = vLine;
        lastRiseHs = hsL;
        lineOpen = true;
        lineTruncated = false;
        lineStartIdx = idx;
        lineStartT = t;
        x = 0;
    }

    private void hsEdge(long idx, long t, boolean level, boolean deNow) {
        int lv = level ? 1 : 0;
        if (hsActive < 0) {
            if (hsForced >= 0) {
                hsActive = hsForced;
            } else if (deInHsRun) {
                hsActive = lv;
            } else {
                deInHsRun = deNow;
                return;
            }
            timing.hsActive = hsActive;
        }
        deInHsRun = deNow;
        if (lv == hsActive) {
            hsLines++;
            if (prevHsLeadIdx != NONE && prevHsLeadIdx >= validFrom) {
                timing.hTotal.add(idx - prevHsLeadIdx);
            }
            if (fallSinceHsLead && !lineOpen && fallIdx != NONE && fallIdx >= validFrom && frameOpen) {
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
                if (detail == Detail.LINES) {
                    out.annotate(Annotation.on(trackSync, "hsync").span(hsLeadT, t).label("HS " + w + " px")
                            .field("width", Field.integer(w, "px")).build());
                }
            }
            hsTrailIdx = idx;
            riseSinceHsTrail = false;
        }
    }

    private void vsEdge(long idx, long t, boolean level, boolean deNow) {
        int lv = level ? 1 : 0;
        if (vsActive < 0) {
            if (vsForced >= 0) {
                vsActive = vsForced;
            } else if (deInVsRun) {
                vsActive = lv;
            } else {
                deInVsRun = deNow;
                return;
            }
            timing.vsActive = vsActive;
        }
        deInVsRun = deNow;
        long hsL = hsActive >= 0 ? hsLines : -1;
        long vL = vLineOf(idx);
        if (lv == vsActive) {
            vsLeadIdx = idx;
            vsLeadT = t;
            vsLeadHs = hsL;
            vsLeadV = vL;
            if (lastRiseIdx != NONE && lastRiseIdx >= validFrom && !lineOpen) {
                long l = linesBetween(lastRiseHs, lastRiseV, hsL, vL);
                if (l != NONE) {
                    timing.vFront.add(l - 1);
                }
            }
            if (hsActive >= 0 && hsLeadIdx != NONE && hsLeadIdx >= validFrom) {
                timing.vSyncOffset.add(idx - hsLeadIdx);
            }
        } else {
            if (vsLeadIdx != NONE && vsLeadIdx >= validFrom) {
                long l = linesBetween(vsLeadHs, vsLeadV, hsL, vL);
                if (l != NONE) {
                    timing.vSync.add(l);
                }
                if (detail != Detail.ANOMALIES) {
                    Annotation.Builder b = Annotation.on(trackSync, "vsync").span(vsLeadT, t)
                            .label("VS " + (l == NONE ? "?" : Long.toString(l)) + " lines")
                            .field("widthPixels", Field.integer(idx - vsLeadIdx, "px"));
                    if (l != NONE) {
                        b.field("widthLines", Field.integer(l, "lines"));
                    }
                    out.annotate(b.build());
                }
            }
            vsTrailIdx = idx;
            vsTrailHs = hsL;
            vsTrailV = vL;
        }
    }

    // ------------------------------------------------------------------ frames

    private void openFrame(long idx, long t, boolean startSeen, boolean startPending, long hsL, long vL) {
        frameOpen = true;
        rows = 0;
        width = -1;
        frameStartSeen = startSeen;
        frameStartPending = startPending;
        frameBroken = false;
        frameSuspect = false;
        brokenReason = null;
        frameFirstRise = idx;
        frameFirstT = t;
        frameFirstHs = hsL;
        frameFirstV = vL;
        frameSuspectBits = 0;
        frameMismatch = 0;
        frameDriftReported = false;
        frameTooTallReported = false;
        frameLastFallT = t;
    }

    private boolean frameStartSeenNow() {
        if (frameStartPending) {
            return validFrom == 0 && pRef > 0 && leadIn > pRef;
        }
        return frameStartSeen;
    }

    private void splitAtBoot() {
        if (!frameOpen || width <= 0 || bootRow > rows) {
            return;
        }
        int tailRows = rows - bootRow;
        int[] tail = Arrays.copyOfRange(buf, bootRow * width, rows * width);
        int w = width;
        rows = bootRow;
        long keepLastFall = frameLastFallT;
        frameLastFallT = bootT;
        closeFrame(true);
        openFrame(bootIdx, bootT, true, false, -1, 0);
        width = w;
        if (buf.length < tail.length) {
            buf = new int[tail.length];
        }
        System.arraycopy(tail, 0, buf, 0, tail.length);
        rows = tailRows;
        frameLastFallT = keepLastFall;
        lastRiseV = tailRows;
    }

    private void closeFrame(boolean endSeen) {
        if (!frameOpen) {
            return;
        }
        frameOpen = false;
        boolean startSeen = frameStartSeenNow();
        if (rows == 0 || width <= 0) {
            return;
        }
        boolean complete = startSeen && endSeen && !frameBroken;
        int[] rgb = Arrays.copyOf(buf, rows * width);
        Frame f = new Frame(id, frameFirstT, Math.max(frameLastFallT, frameFirstT), frameIndex, width, rows, rgb, !complete,
                frameSuspect);
        if (complete) {
            timing.framesComplete++;
            timing.vActive.add(rows);
        } else {
            timing.framesPartial++;
        }
        if (frameSuspect) {
            timing.framesSuspect++;
        }
        Severity sev = complete ? (frameSuspect ? Severity.WARNING : Severity.INFO) : Severity.WARNING;
        if (detail != Detail.ANOMALIES || !complete) {
            out.annotate(Annotation.on(trackFrames, "frame").span(f.startFs(), f.endFs()).severity(sev)
                    .label("frame " + frameIndex + ": " + width + "x" + rows + (complete ? "" : " partial") + (frameSuspect ? " suspect" : ""))
                    .field("index", Field.integer(frameIndex, "")).field("width", Field.integer(width, "px"))
                    .field("height", Field.integer(rows, "lines")).field("partial", Field.enumValue(Boolean.toString(!complete)))
                    .field("suspect", Field.enumValue(Boolean.toString(frameSuspect))).build());
        }
        if (!complete) {
            String why = frameBroken ? brokenReason : !startSeen ? "the capture began inside this frame" : "the capture ended inside this frame";
            timing.anomaly("partial-frame");
            out.annotate(Annotation.on(trackAnom, "partial-frame").span(f.startFs(), f.endFs()).severity(Severity.WARNING)
                    .label("frame " + frameIndex + " partial: " + why).field("index", Field.integer(frameIndex, ""))
                    .field("reason", Field.text(why)).build());
        }
        if (frameSuspectBits > 0) {
            out.annotate(Annotation.on(trackAnom, "suspect-bits").span(f.startFs(), f.endFs()).severity(Severity.WARNING)
                    .label("frame " + frameIndex + ": " + frameSuspectBits + " pixels with flagged bits")
                    .field("pixels", Field.integer(frameSuspectBits, "px")).build());
        }
        out.frame(f);
        if (pictures != null) {
            pictures.offer(f);
        }
        frameIndex++;
    }

    private void anomaly(long idx, long t, String kind, Severity s, String label) {
        out.annotate(Annotation.on(trackAnom, kind).span(t, t).severity(s).label(label)
                .field("pixel", Field.integer(idx, "px")).build());
    }

    /** Flushes at the end of the capture. */
    void finish() {
        if (lineOpen) {
            lineOpen = false;
            x = 0;
            markBroken("the capture ended inside a line");
        }
        boolean endSeen = false;
        if (fallIdx != NONE && fallIdx >= validFrom) {
            if (hsKnownAtFall && hsActive >= 0) {
                endSeen = hsLeadsSinceFall >= 2;
            } else {
                endSeen = pRef > 0 && n - fallIdx > pRef;
            }
        }
        if (frameOpen) {
            closeFrame(endSeen);
        }
        if (linesSeen == 0) {
            String msg = "capture shorter than one line: " + n + " pixels decoded but no complete active (DE) line";
            timing.errors.add(msg);
            timing.anomaly("short-capture");
            out.annotate(Annotation.on(trackAnom, "short-capture").span(0, 0).severity(Severity.ERROR).label(msg)
                    .field("pixels", Field.integer(n, "px")).build());
        }
    }

    long pixels() {
        return n;
    }
}
