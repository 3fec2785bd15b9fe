package org.lanesift.plugins.pixellink;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Frame;
import org.lanesift.time.Femtos;

/**
 * What the frame assembler reports, as annotations on four tracks ({@code <id>.frames},
 * {@code .lines}, {@code .sync}, {@code .anomalies}), filtered by the detail level, and the count of
 * each anomaly kind kept in {@link Timing} for the report. Pixel positions are pixel indices since
 * the start of the capture; times are femtoseconds.
 */
final class FrameFindings {
    private final FrameAssembler.Out out;
    private final Timing timing;
    private final FrameAssembler.Detail detail;
    private final String trackFrames;
    private final String trackLines;
    private final String trackSync;
    private final String trackAnom;
    private final String controlLane;
    private long firstLineLengthT = -1;

    /**
     * @param controlLane names the lane (and slots) carrying DE, HS and VS, for the framing finding
     */
    FrameFindings(String id, FrameAssembler.Out out, Timing timing, FrameAssembler.Detail detail, String controlLane) {
        this.out = out;
        this.controlLane = controlLane;
        this.timing = timing;
        this.detail = detail;
        trackFrames = id + ".frames";
        trackLines = id + ".lines";
        trackSync = id + ".sync";
        trackAnom = id + ".anomalies";
    }

    /** An anomaly at one pixel: counted, and annotated at every detail level. */
    void anomaly(long pixel, long t, String kind, Severity s, String label) {
        timing.anomaly(kind);
        out.annotate(Annotation.on(trackAnom, kind).span(t, t).severity(s).label(label)
                .field("pixel", Field.integer(pixel, "px")).build());
    }

    /**
     * A line of another length than the frame's first. Lines are framed by DE alone, so lines that
     * change length mean the framing is inconsistent: the first is the one warning, naming the lane
     * that carries DE, HS and VS (a lane off by whole unit intervals keeps clean margins and shows
     * only here); every later one is information pointing back at it, so the fault is found once.
     *
     * @return a reference to the first line-length finding, for the frames it makes suspect
     */
    String lineLength(long startT, long endT, int pixels, int expected, int row, long frame) {
        timing.anomaly("line-length");
        boolean first = firstLineLengthT < 0;
        if (first) {
            firstLineLengthT = startT;
        }
        String label = "line " + row + ": " + pixels + " px, expected " + expected + (first
                ? "; framing from " + controlLane + " is inconsistent (a lane off by whole unit intervals, or a source"
                        + " changing its line length); later lines of another length are listed as information"
                : " (consequence: see the first line-length finding at " + Femtos.format(firstLineLengthT) + ")");
        out.annotate(Annotation.on(trackAnom, "line-length").span(startT, endT).severity(first ? Severity.WARNING : Severity.INFO)
                .label(label)
                .field("pixels", Field.integer(pixels, "px")).field("expected", Field.integer(expected, "px"))
                .field("row", Field.integer(row, "")).field("frame", Field.integer(frame, "")).build());
        return "the line-length finding at " + Femtos.format(firstLineLengthT);
    }

    /**
     * A data lane whole unit intervals off the others ({@link LaneSlip}): the one finding; the
     * frames decoded through it are suspect and refer back to it.
     *
     * @param lane          the lane's name
     * @param late          whether it is late (else early)
     * @param unitIntervals by how many unit intervals
     * @param tFs           the DE edge where the first evidence was seen
     * @return a reference to this finding, for the frames it makes suspect
     */
    String laneSlip(String lane, boolean late, int unitIntervals, long tFs) {
        timing.anomaly("lane-slot-offset");
        String label = lane + ": pixel bits " + unitIntervals + " unit interval" + (unitIntervals > 1 ? "s " : " ")
                + (late ? "late" : "early") + " against the DE edges (blanking pixels next to DE " + (late ? "falls" : "rises")
                + " differ only in this lane's " + (late ? "first" : "last") + " slots); its pixel bits are decoded into the"
                + " wrong pixels, the decode is suspect: correct the lane's skew by " + unitIntervals + " unit interval"
                + (unitIntervals > 1 ? "s" : "");
        out.annotate(Annotation.on(trackAnom, "lane-slot-offset").span(tFs, tFs).severity(Severity.WARNING).label(label)
                .field("unitIntervals", Field.integer(late ? unitIntervals : -unitIntervals, "UI")).build());
        return "the lane-slot-offset finding at " + Femtos.format(tFs);
    }

    /** One active line (detail {@code lines} only). */
    void line(long startT, long endT, int pixels, int row, long frame) {
        if (detail == FrameAssembler.Detail.LINES) {
            out.annotate(Annotation.on(trackLines, "line").span(startT, endT).label(pixels + " px")
                    .field("pixels", Field.integer(pixels, "px")).field("row", Field.integer(row, ""))
                    .field("frame", Field.integer(frame, "")).build());
        }
    }

    /** One HS pulse (detail {@code lines} only). */
    void hsync(long leadT, long trailT, long widthPixels) {
        if (detail == FrameAssembler.Detail.LINES) {
            out.annotate(Annotation.on(trackSync, "hsync").span(leadT, trailT).label("HS " + widthPixels + " px")
                    .field("width", Field.integer(widthPixels, "px")).build());
        }
    }

    /**
     * One VS pulse (detail {@code lines} and {@code frames}).
     *
     * @param widthLines width in lines, or {@code unknown} when it could not be counted
     */
    void vsync(long leadT, long trailT, long widthPixels, long widthLines, long unknown) {
        if (detail != FrameAssembler.Detail.ANOMALIES) {
            Annotation.Builder b = Annotation.on(trackSync, "vsync").span(leadT, trailT)
                    .label("VS " + (widthLines == unknown ? "?" : Long.toString(widthLines)) + " lines")
                    .field("widthPixels", Field.integer(widthPixels, "px"));
            if (widthLines != unknown) {
                b.field("widthLines", Field.integer(widthLines, "lines"));
            }
            out.annotate(b.build());
        }
    }

    /**
     * A finished frame: its annotation (at detail {@code anomalies} only when partial), why it is
     * partial, and how many of its pixels had flagged bits. A frame that is partial only because
     * the capture began or ended inside it ({@code windowOnly}) is information, not a finding
     * about the link: both its annotations are info. A frame suspect only through a finding stated
     * elsewhere ({@code suspectCause}) is information referring to it, so the fault is found once;
     * so is the count of its pixels whose flagged bits that finding accounts for ({@code causedPixels}).
     */
    void frame(Frame f, long index, boolean complete, boolean suspect, String partialReason, boolean windowOnly, long suspectPixels,
               long causedPixels, String suspectCause) {
        Severity partialSev = windowOnly ? Severity.INFO : Severity.WARNING;
        Severity sev = suspect ? (suspectCause != null && (complete || windowOnly) ? Severity.INFO : Severity.WARNING)
                : complete ? Severity.INFO : partialSev;
        if (detail != FrameAssembler.Detail.ANOMALIES || !complete) {
            out.annotate(Annotation.on(trackFrames, "frame").span(f.startFs(), f.endFs()).severity(sev)
                    .label("frame " + index + ": " + f.width() + "x" + f.height() + (complete ? "" : " partial")
                            + (suspect ? " suspect" : "") + (suspect && suspectCause != null ? " (consequence: see " + suspectCause + ")" : ""))
                    .field("index", Field.integer(index, "")).field("width", Field.integer(f.width(), "px"))
                    .field("height", Field.integer(f.height(), "lines")).field("partial", Field.enumValue(Boolean.toString(!complete)))
                    .field("suspect", Field.enumValue(Boolean.toString(suspect))).build());
        }
        if (!complete) {
            timing.anomaly("partial-frame");
            out.annotate(Annotation.on(trackAnom, "partial-frame").span(f.startFs(), f.endFs()).severity(partialSev)
                    .label("frame " + index + " partial: " + partialReason).field("index", Field.integer(index, ""))
                    .field("reason", Field.text(partialReason)).build());
        }
        if (suspectPixels > 0) {
            out.annotate(Annotation.on(trackAnom, "suspect-bits").span(f.startFs(), f.endFs()).severity(Severity.WARNING)
                    .label("frame " + index + ": " + suspectPixels + " pixels with flagged bits")
                    .field("pixels", Field.integer(suspectPixels, "px")).build());
        } else if (causedPixels > 0 && suspectCause != null) {
            out.annotate(Annotation.on(trackAnom, "suspect-bits").span(f.startFs(), f.endFs()).severity(Severity.INFO)
                    .label("frame " + index + ": " + causedPixels + " pixels with flagged bits (consequence: see " + suspectCause + ")")
                    .field("pixels", Field.integer(causedPixels, "px")).build());
        }
    }

    /** The capture held no complete active line. */
    void shortCapture(long pixels) {
        String msg = "capture shorter than one line: " + pixels + " pixels decoded but no complete active (DE) line";
        timing.errors.add(msg);
        timing.anomaly("short-capture");
        out.annotate(Annotation.on(trackAnom, "short-capture").span(0, 0).severity(Severity.ERROR).label(msg)
                .field("pixels", Field.integer(pixels, "px")).build());
    }
}
