package org.lanesift.plugins.serial;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Properties;
import java.util.function.BooleanSupplier;

/**
 * Reads the bytes of a spool's segments in order with a fixed buffer. In follow mode it waits at
 * the end of an open segment for more bytes (a spool being written by a live capture) and ends
 * only when {@code spool.closed} appears and everything has been read.
 */
final class SpoolReader implements AutoCloseable {
    /** What {@link #read} found; IDLE: nothing new yet (follow mode, after one poll wait). */
    enum Event { DATA, SEGMENT_START, END, IDLE }

    private final Path dir;
    private final boolean follow;
    private final long pollMs;
    private final BooleanSupplier cancelled;
    private int segment;
    private InputStream in;
    private long segmentOffset;
    private long consumed;
    private boolean unclosed;

    private final long idleLimitNanos;
    private long lastProgressNanos = System.nanoTime();

    SpoolReader(Path dir, boolean follow, long pollMs, BooleanSupplier cancelled) {
        this(dir, follow, pollMs, cancelled, Long.MAX_VALUE);
    }

    /**
     * A reader; following, it gives up when the spool has not grown for {@code idleLimitNanos} and
     * the capture never closed it (a capture that died).
     */
    SpoolReader(Path dir, boolean follow, long pollMs, BooleanSupplier cancelled, long idleLimitNanos) {
        this.dir = dir;
        this.follow = follow;
        this.pollMs = pollMs;
        this.cancelled = cancelled;
        this.idleLimitNanos = idleLimitNanos;
    }

    /** One poll wait with nothing new; past the idle limit, the follower gives up. */
    private Event idle() throws InterruptedException {
        if (System.nanoTime() - lastProgressNanos > idleLimitNanos) {
            throw new DeviceException("spool " + dir + ": nothing new for " + String.format(java.util.Locale.ROOT, "%.3g", idleLimitNanos / 1e9)
                    + " s and the capture never closed the spool (no " + SpoolFiles.CLOSED + "); stopped following it "
                    + "(option followIdleSeconds; docs/spool.md)");
        }
        Thread.sleep(pollMs);
        return Event.IDLE;
    }

    int segment() {
        return segment;
    }

    long consumed() {
        return consumed;
    }

    long segmentOffset() {
        return segmentOffset;
    }

    /** @return true if a non-follow read found a spool that was never closed (a crashed capture) */
    boolean unclosed() {
        return unclosed;
    }

    Properties segmentInfo() throws IOException {
        Path p = SpoolFiles.segmentInfo(dir, segment);
        return Files.exists(p) ? SpoolFiles.read(p) : new Properties();
    }

    /**
     * Reads the next bytes into {@code buf}.
     *
     * @return the event; for DATA, {@link #lastCount()} bytes were read
     */
    Event read(byte[] buf) throws IOException, InterruptedException {
        while (true) {
            if (in == null) {
                int next = segment + 1;
                Path seg = SpoolFiles.segment(dir, next);
                if (Files.exists(seg)) {
                    in = Files.newInputStream(seg);
                    segment = next;
                    segmentOffset = 0;
                    lastProgressNanos = System.nanoTime();
                    return Event.SEGMENT_START;
                }
                if (Files.exists(dir.resolve(SpoolFiles.CLOSED)) || !follow || cancelled.getAsBoolean()) {
                    if (!follow && !Files.exists(dir.resolve(SpoolFiles.CLOSED))) {
                        unclosed = true;
                    }
                    return Event.END;
                }
                return idle();
            }
            int n = in.read(buf);
            if (n > 0) {
                lastProgressNanos = System.nanoTime();
                last = n;
                segmentOffset += n;
                consumed += n;
                return Event.DATA;
            }
            // at the end of what is written so far
            boolean segClosed = Files.exists(SpoolFiles.segmentClosed(dir, segment));
            if (segClosed || !follow || cancelled.getAsBoolean()) {
                if (segClosed) {
                    n = in.read(buf); // bytes written just before the close marker
                    if (n > 0) {
                        last = n;
                        segmentOffset += n;
                        consumed += n;
                        return Event.DATA;
                    }
                }
                in.close();
                in = null;
                continue;
            }
            return idle();
        }
    }

    private int last;

    /**
     * Moves forward in the current segment without reading, to {@code offset} or its end.
     *
     * @param offset byte offset in the segment, at least the current one
     * @return the offset reached
     */
    long skipTo(long offset) throws IOException {
        while (in != null && segmentOffset < offset) {
            long k = in.skip(offset - segmentOffset);
            if (k <= 0) {
                break;
            }
            segmentOffset += k;
        }
        return segmentOffset;
    }

    int lastCount() {
        return last;
    }

    @Override
    public void close() {
        if (in != null) {
            try {
                in.close();
            } catch (IOException ignored) {
                // nothing to keep
            }
            in = null;
        }
    }
}
