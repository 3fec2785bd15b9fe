package org.lanesift.plugins.serial;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;

/**
 * Turns spooled bytes back into runs of logic8 samples with their capture-wide sample index, and
 * into gap annotations. A run never spans a gap: at a sequence gap, a sample-index jump, a CRC
 * failure followed by missing samples, or a reconnect, the current run ends and the next starts
 * at the true index of the next good sample (docs/spool.md, "Gaps"). Every irregularity is
 * annotated: samples lost before the first frame, a sequence jump over a continuous index, an index
 * overlap (samples trimmed), a late (reordered) or repeated frame; a gap whose length comes from
 * wall-clock time is labelled an estimate. Memory: one frame buffer and one run buffer of
 * {@code blockSamples} bytes.
 */
final class SpoolDecoder {
    /** Receives runs and annotations. */
    interface Out {
        void samples(long firstIndex, byte[] b, int n);

        void annotate(Annotation a);
    }

    static final String TRACK = "stream";
    private final SpoolHeader header;
    private final double periodFs;
    private final Out out;
    private final byte[] run;
    private long runFirst;
    private int runLen;
    private long expectedIndex = -1;
    private long expectedSeq = -1;
    private long shift;
    private int segment;
    private boolean segmentStart;
    private long prevClosedEpochMs = -1;
    private long segOpenedEpochMs = -1;
    private FrameDecoder frames;
    private long gaps;
    private long corruptRuns;
    private long duplicates;
    private long samples;
    private long dropBefore;
    private long reordered;
    private long overlaps;
    private long seqJumps;
    /** Sequence numbers [from, to) of the last sequence gap; a late frame in it arrived out of order. */
    private long gapSeqFrom = -1;
    private long gapSeqTo = -1;

    SpoolDecoder(SpoolHeader header, int blockSamples, Out out) {
        this.header = header;
        this.periodFs = 1e15 / header.rateHz();
        this.out = out;
        this.run = new byte[blockSamples];
    }

    long gaps() {
        return gaps;
    }

    long corruptRuns() {
        return corruptRuns;
    }

    long duplicates() {
        return duplicates;
    }

    long samples() {
        return samples;
    }

    /** @return frames that arrived after later ones (their samples fell in a reported gap and are dropped) */
    long reordered() {
        return reordered;
    }

    /** @return frames whose index overlapped samples already read (the overlap trimmed) */
    long overlaps() {
        return overlaps;
    }

    /** @return sequence jumps with a continuous sample index (frames lost that held no new samples) */
    long seqJumps() {
        return seqJumps;
    }

    /** Samples (and gaps, corrupt runs, repeats) before this capture-wide index are left out (a replay from a start time). */
    void dropBefore(long index) {
        dropBefore = index;
    }

    /** @return the index the next good sample is expected at, or -1 before the first */
    long expectedIndex() {
        return expectedIndex;
    }

    /** @return what is added to the device's sample index to make the capture-wide one */
    long shift() {
        return shift;
    }

    /**
     * Framed: applies the start-of-segment rules to the segment's first frame, known from its
     * index, as if it had been read (the reconnect gap, a device that counts from 0 again).
     *
     * @param deviceIndex the first DATA frame's sample index as the device sent it
     */
    void enterSegment(long deviceIndex) {
        if (!segmentStart) {
            return;
        }
        segmentStart = false;
        expectedIndex = resume(deviceIndex + shift, -1);
    }

    /**
     * The capture-wide index of a segment's first frame: a device that counts from 0 again after a
     * reconnect is moved on by the wall-clock gap, and the samples missed become a gap.
     */
    private long resume(long idx, long seq) {
        if (expectedIndex < 0) {
            if (idx > 0) { // the device counts from 0 since configured: the first frames were lost
                gap(0, idx, seq, "start", false);
            }
        } else if (idx < expectedIndex) { // the device restarted its count: only the clock tells how much is missing
            long resume = expectedIndex + wallGapSamples();
            shift += resume - idx;
            gap(expectedIndex, resume, -1, "reconnect", true);
            idx = resume;
        } else if (idx > expectedIndex) {
            gap(expectedIndex, idx, -1, "reconnect", false);
        }
        return idx;
    }

    /**
     * Framed: continues the current segment at an indexed frame instead of its start: its bytes
     * begin at {@code segmentOffset}, its first sample has capture-wide index {@code index}.
     */
    void resumeAt(long segmentOffset, long index) {
        frames = new FrameDecoder(frameListener(), segmentOffset);
        expectedIndex = index;
        expectedSeq = -1;
    }

    /**
     * Raw: applies the start-of-segment rules, then passes over {@code bytes} samples unread.
     *
     * @param bytes samples (bytes) of the segment skipped
     */
    void skipRaw(long bytes) {
        startRawSegment();
        expectedIndex += bytes;
    }

    /** Raw: a segment's first byte follows the last one of the segment before, after the wall-clock gap between them. */
    private void startRawSegment() {
        if (!segmentStart) {
            return;
        }
        segmentStart = false;
        if (expectedIndex < 0) {
            expectedIndex = 0;
        } else {
            long resume = expectedIndex + wallGapSamples();
            gap(expectedIndex, resume, -1, "reconnect", true);
            expectedIndex = resume;
        }
    }

    /** Starts segment {@code n}; times in epoch ms of its opening and of the previous close (or -1). */
    void beginSegment(int n, long openedEpochMs, long previousClosedEpochMs) {
        endSegment();
        segment = n;
        segmentStart = true;
        segOpenedEpochMs = openedEpochMs;
        prevClosedEpochMs = previousClosedEpochMs;
        expectedSeq = -1;
        if (header.framed()) {
            frames = new FrameDecoder(frameListener());
        }
    }

    private FrameDecoder.Listener frameListener() {
        return new FrameDecoder.Listener() {
            @Override
            public void frame(int code, int seq, byte[] buf, int off, int len, long at) {
                onFrame(code, seq, buf, off, len, at);
            }

            @Override
            public void skipped(long at, long length, int crc) {
                onSkipped(at, length, crc);
            }
        };
    }

    void feed(byte[] b, int off, int len) {
        if (header.framed()) {
            frames.feed(b, off, len);
        } else {
            startRawSegment();
            append(b, off, len);
        }
    }

    void endSegment() {
        if (frames != null) {
            frames.finish();
            frames = null;
        }
        flush();
    }

    private long wallGapSamples() {
        if (segOpenedEpochMs < 0 || prevClosedEpochMs < 0 || segOpenedEpochMs <= prevClosedEpochMs) {
            return 0;
        }
        return Math.round((segOpenedEpochMs - prevClosedEpochMs) * 1e-3 * header.rateHz());
    }

    private void onFrame(int code, int seq, byte[] buf, int off, int len, long at) {
        if (code != FrameType.DATA.code) {
            return;
        }
        if (len < 8) {
            corrupt(at, Framing.HEADER + len + Framing.TRAILER, 0, "DATA frame shorter than its 8-byte sample index");
            return;
        }
        long idx = Framing.u64(buf, off) + shift;
        int n = len - 8;
        long seqU = seq & 0xFFFFFFFFL;
        if (segmentStart) {
            segmentStart = false;
            idx = resume(idx, expectedIndex < 0 ? seqU : -1);
            expectedIndex = idx;
        } else {
            if (expectedSeq >= 0 && seqU != expectedSeq && (int) (seqU - expectedSeq) < 0) {
                late(idx, n, seqU);
                return;
            }
            if (expectedIndex < 0) {
                expectedIndex = idx;
            }
            long missingFrames = expectedSeq >= 0 ? ((seqU - expectedSeq) & 0xFFFFFFFFL) : -1;
            if (idx > expectedIndex) {
                gap(expectedIndex, idx, missingFrames, "sequence", false);
                if (missingFrames > 0) {
                    gapSeqFrom = expectedSeq;
                    gapSeqTo = seqU;
                }
                expectedIndex = idx;
            } else if (missingFrames > 0) {
                seqJump(idx, missingFrames);
            }
        }
        expectedSeq = (seqU + 1) & 0xFFFFFFFFL;
        int skip = (int) Math.min(n, Math.max(0, expectedIndex - idx));
        if (skip > 0) {
            overlap(idx, skip, n, seqU);
        }
        if (skip > 0 && skip == n) {
            return;
        }
        append(buf, off + 8 + skip, n - skip);
    }

    private void onSkipped(long at, long length, int crc) {
        corrupt(at, length, crc, crc > 0 ? "bytes with a bad CRC-32C or length" : "bytes outside any frame");
    }

    private void append(byte[] b, int off, int len) {
        if (expectedIndex < dropBefore) {
            int k = (int) Math.min(len, dropBefore - expectedIndex);
            expectedIndex += k;
            off += k;
            len -= k;
        }
        while (len > 0) {
            if (runLen == 0) {
                runFirst = expectedIndex;
            }
            int k = Math.min(len, run.length - runLen);
            System.arraycopy(b, off, run, runLen, k);
            runLen += k;
            off += k;
            len -= k;
            expectedIndex += k;
            samples += k;
            if (runLen == run.length) {
                flush();
            }
        }
    }

    void flush() {
        if (runLen > 0) {
            out.samples(runFirst, run, runLen);
            runLen = 0;
        }
    }

    private long fs(long index) {
        return Math.round(index * periodFs);
    }

    /**
     * Reports missing samples.
     *
     * @param estimated true when the length comes from wall-clock time, not from the device's index
     */
    private void gap(long fromIndex, long toIndex, long missingFrames, String cause, boolean estimated) {
        if (toIndex <= dropBefore) {
            return;
        }
        if (fromIndex < dropBefore) {
            fromIndex = dropBefore; // only the part after the start time is reported
            missingFrames = -1;
        }
        flush();
        gaps++;
        Annotation.Builder a = Annotation.on(TRACK, "stream-gap").span(fs(fromIndex), fs(toIndex)).severity(Severity.ERROR)
                .label(estimated
                        ? "gap: about " + (toIndex - fromIndex) + " samples missing (" + cause
                                + "; an estimate from wall-clock time, not a count)"
                        : "gap: " + (toIndex - fromIndex) + " samples missing (" + cause + ")")
                .number("missingSamples", toIndex - fromIndex, "samples").text("cause", cause)
                .text("length", estimated ? "estimate" : "exact")
                .number("segment", segment, "");
        if (missingFrames >= 0) {
            a.number("missingFrames", missingFrames, "frames");
        }
        out.annotate(a.build());
    }

    private void corrupt(long at, long length, int crc, String what) {
        if (expectedIndex < dropBefore) {
            return;
        }
        corruptRuns++;
        long t = fs(Math.max(0, expectedIndex));
        out.annotate(Annotation.on(TRACK, "stream-corrupt").span(t, t).severity(Severity.WARNING)
                .label(length + " " + what).number("bytes", length, "B").number("crcFailures", crc, "")
                .number("segment", segment, "").number("segmentOffset", at, "B").build());
    }

    /** A DATA frame behind the expected sequence number: late if a reported gap lost it, else a repeat. */
    private void late(long idx, int n, long seq) {
        if (idx + n <= dropBefore) {
            return;
        }
        boolean inGap = gapSeqFrom >= 0 && (int) (seq - gapSeqFrom) >= 0 && (int) (seq - gapSeqTo) < 0;
        Annotation.Builder a;
        if (inGap) {
            reordered++;
            a = Annotation.on(TRACK, "stream-reordered").label("frame " + seq
                    + " arrived after later frames; its samples are dropped and the gap before it stays");
        } else {
            duplicates++;
            a = Annotation.on(TRACK, "stream-duplicate").label("frame " + seq + " repeated; its samples are dropped");
        }
        out.annotate(a.span(fs(idx), fs(idx + n)).severity(Severity.WARNING).number("seq", seq, "")
                .number("segment", segment, "").build());
    }

    /** Frames lost (by sequence number) while the sample index runs on: they held no samples we miss. */
    private void seqJump(long idx, long missingFrames) {
        if (idx < dropBefore) {
            return;
        }
        seqJumps++;
        long t = fs(idx);
        out.annotate(Annotation.on(TRACK, "stream-seq-jump").span(t, t).severity(Severity.WARNING)
                .label(missingFrames + " frame numbers skipped but the sample index is continuous; no samples missing")
                .number("missingFrames", missingFrames, "frames").number("segment", segment, "").build());
    }

    /** A frame whose first samples repeat indices already read: those are trimmed, the rest kept. */
    private void overlap(long idx, int skip, int n, long seq) {
        if (idx + skip <= dropBefore) {
            return;
        }
        overlaps++;
        out.annotate(Annotation.on(TRACK, "stream-overlap").span(fs(idx), fs(idx + skip)).severity(Severity.WARNING)
                .label("frame " + seq + " overlaps samples already read; " + skip + " of its " + n + " samples trimmed")
                .number("trimmedSamples", skip, "samples").number("seq", seq, "").number("segment", segment, "").build());
    }
}
