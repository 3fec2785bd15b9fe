package org.lanesift.plugins.serial;

/**
 * Finds frames in a byte stream that may be cut anywhere and may hold corrupt or foreign bytes.
 * It keeps a fixed buffer of two maximal frames, so memory never depends on a length field. A
 * candidate frame is accepted only if its length is at most {@link Framing#MAX_PAYLOAD} and its
 * CRC-32C matches; otherwise the decoder skips one byte past the marker and searches again
 * (resynchronisation). Skipped bytes are reported once per contiguous run.
 */
public final class FrameDecoder {
    /** Receives what the decoder finds. */
    public interface Listener {
        /**
         * A frame with a good CRC.
         *
         * @param code         type code (see {@link FrameType#of})
         * @param seq          sequence number
         * @param buf          buffer holding the payload (valid only during the call)
         * @param off          payload start in {@code buf}
         * @param len          payload length
         * @param streamOffset offset of the frame's first marker byte in the stream
         */
        void frame(int code, int seq, byte[] buf, int off, int len, long streamOffset);

        /**
         * A run of bytes that belonged to no good frame.
         *
         * @param streamOffset offset of the first skipped byte
         * @param length       number of skipped bytes
         * @param crcFailures  how many candidate frames in the run had a bad CRC (or a bad length)
         */
        void skipped(long streamOffset, long length, int crcFailures);
    }

    private static final int FRAME_MAX = Framing.HEADER + Framing.MAX_PAYLOAD + Framing.TRAILER;
    private final byte[] buf = new byte[2 * FRAME_MAX];
    private final Listener listener;
    private int start;
    private int end;
    private long base; // stream offset of buf[0]
    private long skipStart = -1;
    private long skipLen;
    private int skipCrc;
    private boolean eof;

    /**
     * Creates a decoder.
     *
     * @param listener receiver of frames and skipped runs
     */
    public FrameDecoder(Listener listener) {
        this.listener = listener;
    }

    /**
     * Creates a decoder for a stream that starts at a given offset.
     *
     * @param listener receiver
     * @param offset   stream offset of the first byte that will be fed
     */
    public FrameDecoder(Listener listener, long offset) {
        this.listener = listener;
        this.base = offset;
    }

    /**
     * Feeds bytes.
     *
     * @param b   bytes
     * @param off first byte
     * @param len count
     */
    public void feed(byte[] b, int off, int len) {
        while (len > 0) {
            if (end == buf.length) {
                compact();
            }
            int n = Math.min(len, buf.length - end);
            System.arraycopy(b, off, buf, end, n);
            end += n;
            off += n;
            len -= n;
            scan();
        }
    }

    /**
     * Ends the stream: a candidate frame that can no longer complete (its length field may be
     * corrupt) is skipped and the bytes after it are searched again; what is left is reported as
     * skipped. The decoder can be fed again afterwards (a new stream, same offsets).
     */
    public void finish() {
        eof = true;
        scan();
        eof = false;
        if (end > start) {
            skip(start, end - start, 0);
            start = end;
        }
        flushSkip();
    }

    /**
     * Stream offset of the next byte that will be fed.
     *
     * @return the offset
     */
    public long position() {
        return base + end;
    }

    private void compact() {
        int n = end - start;
        System.arraycopy(buf, start, buf, 0, n);
        base += start;
        start = 0;
        end = n;
    }

    private void scan() {
        while (true) {
            int p = start;
            int last = end - 1;
            while (p < last && !((buf[p] & 0xFF) == Framing.MARK0 && (buf[p + 1] & 0xFF) == Framing.MARK1)) {
                p++;
            }
            if (p > start) {
                skip(start, p - start, 0);
                start = p;
            }
            if (end - start < Framing.HEADER) {
                if (eof) {
                    return;
                }
                // keep a trailing lone first-marker byte, or the partial header
                if (end - start == 1 && (buf[start] & 0xFF) != Framing.MARK0) {
                    skip(start, 1, 0);
                    start = end;
                }
                return;
            }
            int len = (buf[start + 8] & 0xFF) | (buf[start + 9] & 0xFF) << 8;
            if (len > Framing.MAX_PAYLOAD) {
                skip(start, 1, 1);
                start++;
                continue;
            }
            int total = Framing.HEADER + len + Framing.TRAILER;
            if (end - start < total) {
                if (!eof) {
                    return;
                }
                skip(start, 1, 1);
                start++;
                continue;
            }
            int crc = Crc32c.of(buf, start + 2, Framing.HEADER - 2 + len);
            if (crc != Framing.u32(buf, start + Framing.HEADER + len)) {
                skip(start, 1, 1);
                start++;
                continue;
            }
            flushSkip();
            int code = buf[start + 2] & 0xFF;
            int seq = Framing.u32(buf, start + 4);
            long at = base + start;
            int payload = start + Framing.HEADER;
            start += total;
            listener.frame(code, seq, buf, payload, len, at);
        }
    }

    private void skip(int from, long n, int crcFailures) {
        long at = base + from;
        if (skipStart < 0) {
            skipStart = at;
        }
        skipLen += n;
        skipCrc += crcFailures;
    }

    private void flushSkip() {
        if (skipStart >= 0) {
            long s = skipStart;
            long l = skipLen;
            int c = skipCrc;
            skipStart = -1;
            skipLen = 0;
            skipCrc = 0;
            listener.skipped(s, l, c);
        }
    }
}
