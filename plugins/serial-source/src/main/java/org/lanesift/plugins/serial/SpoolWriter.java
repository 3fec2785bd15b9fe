package org.lanesift.plugins.serial;

import java.io.BufferedOutputStream;
import java.io.FileOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Properties;

/**
 * Appends every received byte to the current segment of a spool directory, exactly as received,
 * before anything decodes it; then indexes it (frame offsets and sequence numbers in framed mode,
 * a mark every MiB in raw mode). Called from the capture thread only; the counters may be read
 * from any thread. Format: docs/spool.md.
 */
public final class SpoolWriter implements AutoCloseable {
    static final int INDEX_RECORD = 32;
    static final byte REC_FRAME = 1;
    static final byte REC_SKIPPED = 2;
    static final byte REC_MARK = 3;
    private static final long RAW_MARK_BYTES = 1 << 20;

    private final Path dir;
    private SpoolHeader header;
    private int segment;
    private FileOutputStream data;
    private OutputStream index;
    private FrameDecoder indexer;
    private long segmentBytes;
    private long nextMark;
    private final byte[] rec = new byte[INDEX_RECORD];
    private long expectedSeq = -1;
    private volatile long totalBytes;
    private volatile long frames;
    private volatile long gaps;
    private volatile long crcFailures;
    private volatile long duplicates;
    private volatile long skippedBytes;
    private boolean closed;

    /**
     * Opens a new spool in an empty (or new) directory and its first segment.
     *
     * @param dir    the directory
     * @param header what the spool holds (may be rewritten by {@link #updateHeader})
     * @throws IOException if the directory already holds a spool or cannot be written
     */
    public SpoolWriter(Path dir, SpoolHeader header) throws IOException {
        this(dir, header, false);
    }

    /**
     * Opens a new spool whose header may be provisional: written at once, so that a spool is never
     * without one, but marked so that a follower waits for {@link #updateHeader} (the rate and
     * channel count the device reports) before it decodes.
     *
     * @param dir         the directory
     * @param header      what the spool holds so far
     * @param provisional whether the header will be replaced after the identification exchange
     * @throws IOException if the directory already holds a spool or cannot be written
     */
    public SpoolWriter(Path dir, SpoolHeader header, boolean provisional) throws IOException {
        this.dir = dir;
        this.header = header;
        Files.createDirectories(dir);
        if (Files.exists(dir.resolve(SpoolFiles.HEADER))) {
            throw new DeviceException(dir + ": already holds a spool (" + SpoolFiles.HEADER + "); choose an empty directory");
        }
        header.write(dir, provisional);
        openSegment("start");
    }

    /**
     * Rewrites {@code spool.properties}, such as after the identification exchange.
     *
     * @param h the new header
     * @throws IOException on a write failure
     */
    public void updateHeader(SpoolHeader h) throws IOException {
        header = h;
        h.write(dir);
    }

    /**
     * The header in force.
     *
     * @return header
     */
    public SpoolHeader header() {
        return header;
    }

    private void openSegment(String reason) throws IOException {
        segment++;
        if (segment > SpoolFiles.MAX_SEGMENTS) {
            throw new DeviceException(dir + ": more than " + SpoolFiles.MAX_SEGMENTS + " segments");
        }
        Properties p = new Properties();
        p.setProperty("segment", Integer.toString(segment));
        p.setProperty("openedEpochMs", Long.toString(System.currentTimeMillis()));
        p.setProperty("openedNanos", Long.toString(System.nanoTime()));
        p.setProperty("reason", reason);
        SpoolFiles.writeAtomically(SpoolFiles.segmentInfo(dir, segment), p);
        data = new FileOutputStream(SpoolFiles.segment(dir, segment).toFile());
        index = new BufferedOutputStream(new FileOutputStream(SpoolFiles.index(dir, segment).toFile()), 1 << 16);
        segmentBytes = 0;
        nextMark = 0;
        expectedSeq = -1;
        indexer = new FrameDecoder(new FrameDecoder.Listener() {
            @Override
            public void frame(int code, int seq, byte[] buf, int off, int len, long at) {
                onFrame(code, seq, buf, off, len, at);
            }

            @Override
            public void skipped(long at, long length, int crc) {
                onSkipped(at, length, crc);
            }
        });
    }

    /**
     * Appends received bytes: first to the segment file, then to the index.
     *
     * @param b   bytes
     * @param off first byte
     * @param len count
     * @throws IOException when the disk write fails (the capture must stop and say so)
     */
    public void append(byte[] b, int off, int len) throws IOException {
        if (closed) {
            throw new IllegalStateException("spool is closed");
        }
        data.write(b, off, len);
        segmentBytes += len;
        totalBytes += len;
        if (header.framed()) {
            indexer.feed(b, off, len);
        } else {
            while (nextMark < segmentBytes) {
                writeRecord(REC_MARK, 0, nextMark, 0, nextMark);
                nextMark += RAW_MARK_BYTES;
            }
        }
    }

    private void onFrame(int code, int seq, byte[] buf, int off, int len, long at) {
        if (code != FrameType.DATA.code || len < 8) {
            return;
        }
        long seqU = seq & 0xFFFFFFFFL;
        frames++;
        if (expectedSeq >= 0 && seqU != expectedSeq) {
            if ((int) (seqU - expectedSeq) < 0) {
                duplicates++; // repeated or late frame: not a gap, sequence expectation unchanged
                writeRecord(REC_FRAME, seq, at, Framing.HEADER + len + Framing.TRAILER, Framing.u64(buf, off));
                return;
            }
            gaps++;
        }
        expectedSeq = (seqU + 1) & 0xFFFFFFFFL;
        writeRecord(REC_FRAME, seq, at, Framing.HEADER + len + Framing.TRAILER, Framing.u64(buf, off));
    }

    private void onSkipped(long at, long length, int crc) {
        crcFailures += crc;
        skippedBytes += length;
        writeRecord(REC_SKIPPED, crc, at, (int) Math.min(length, Integer.MAX_VALUE), 0);
    }

    private void writeRecord(byte kind, int seq, long offset, int length, long sampleIndex) {
        java.util.Arrays.fill(rec, (byte) 0);
        rec[0] = kind;
        Framing.putU32(rec, 4, seq);
        Framing.putU64(rec, 8, offset);
        Framing.putU32(rec, 16, length);
        Framing.putU64(rec, 24, sampleIndex);
        try {
            index.write(rec);
        } catch (IOException e) {
            throw new DeviceException(SpoolFiles.index(dir, segment) + ": cannot write the index: " + e.getMessage(), e);
        }
    }

    /**
     * Forces the current segment's bytes to the disk (after a disconnect, while waiting to reconnect).
     *
     * @throws IOException on a write failure
     */
    public void sync() throws IOException {
        index.flush();
        data.getFD().sync();
    }

    /**
     * Closes the current segment (after a disconnect) and opens the next one.
     *
     * @param why reason recorded in the closed segment, such as {@code "disconnect"}
     * @throws IOException on a write failure
     */
    public void nextSegment(String why) throws IOException {
        closeSegment(why);
        openSegment("reconnect");
    }

    private void closeSegment(String why) throws IOException {
        indexer.finish();
        index.close();
        data.getFD().sync();
        data.close();
        Properties p = new Properties();
        p.setProperty("bytes", Long.toString(segmentBytes));
        p.setProperty("closedEpochMs", Long.toString(System.currentTimeMillis()));
        p.setProperty("reason", why);
        SpoolFiles.writeAtomically(SpoolFiles.segmentClosed(dir, segment), p);
    }

    /**
     * Closes the spool cleanly: the last segment, then {@code spool.closed} with the totals.
     *
     * @param why reason, such as {@code "stop"} or {@code "disconnect"}
     * @throws IOException on a write failure
     */
    public void close(String why) throws IOException {
        if (closed) {
            return;
        }
        closeSegment(why);
        closed = true;
        Properties p = new Properties();
        p.setProperty("segments", Integer.toString(segment));
        p.setProperty("bytes", Long.toString(totalBytes));
        p.setProperty("frames", Long.toString(frames));
        p.setProperty("gaps", Long.toString(gaps));
        p.setProperty("crcFailures", Long.toString(crcFailures));
        p.setProperty("reason", why);
        SpoolFiles.writeAtomically(dir.resolve(SpoolFiles.CLOSED), p);
    }

    @Override
    public void close() throws IOException {
        close("stop");
    }

    /** @return bytes appended so far, all segments */
    public long bytes() {
        return totalBytes;
    }

    /** @return good DATA frames indexed */
    public long frames() {
        return frames;
    }

    /** @return sequence jumps seen by the indexer */
    public long gaps() {
        return gaps;
    }

    /** @return DATA frames whose sequence number was behind the expected one */
    public long duplicates() {
        return duplicates;
    }

    /** @return candidate frames with a bad CRC or length */
    public long crcFailures() {
        return crcFailures;
    }

    /** @return bytes that belonged to no good frame */
    public long skippedBytes() {
        return skippedBytes;
    }

    /** @return the current segment number, from 1 */
    public int segment() {
        return segment;
    }

    /** @return the spool directory */
    public Path dir() {
        return dir;
    }
}
