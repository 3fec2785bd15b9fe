package org.lanesift.plugins.serial;

/**
 * Encodes frames of the device stream (docs/device-stream.md):
 * {@code D5 6B | type u8 | flags u8 | seq u32 LE | len u16 LE | payload | CRC-32C u32 LE}, the CRC
 * taken over type, flags, seq, len and payload (everything between the marker and the CRC).
 */
final class Framing {
    /** First marker byte. */
    static final int MARK0 = 0xD5;
    /** Second marker byte. */
    static final int MARK1 = 0x6B;
    /** Bytes before the payload: marker 2, type 1, flags 1, seq 4, len 2. */
    static final int HEADER = 10;
    /** Bytes after the payload: the CRC. */
    static final int TRAILER = 4;
    /** Largest payload a frame may declare; a larger length field is a corrupt header. */
    static final int MAX_PAYLOAD = 16384;

    private Framing() {
    }

    /**
     * Encodes one frame into {@code out} at {@code at}.
     *
     * @param type    frame type
     * @param seq     sequence number (unsigned 32-bit, wraps)
     * @param payload payload bytes
     * @param off     first payload byte
     * @param len     payload length, at most {@link #MAX_PAYLOAD}
     * @param out     destination, at least {@code at + HEADER + len + TRAILER} long
     * @param at      where to write
     * @return bytes written
     */
    static int encode(FrameType type, int seq, byte[] payload, int off, int len, byte[] out, int at) {
        if (len < 0 || len > MAX_PAYLOAD) {
            throw new IllegalArgumentException("frame payload must be 0.." + MAX_PAYLOAD + " bytes, got " + len);
        }
        out[at] = (byte) MARK0;
        out[at + 1] = (byte) MARK1;
        out[at + 2] = (byte) type.code;
        out[at + 3] = 0;
        putU32(out, at + 4, seq);
        out[at + 8] = (byte) len;
        out[at + 9] = (byte) (len >>> 8);
        System.arraycopy(payload, off, out, at + HEADER, len);
        int crc = Crc32c.of(out, at + 2, HEADER - 2 + len);
        putU32(out, at + HEADER + len, crc);
        return HEADER + len + TRAILER;
    }

    /**
     * Encodes one frame into a new array.
     *
     * @param type    frame type
     * @param seq     sequence number
     * @param payload payload
     * @return the frame bytes
     */
    static byte[] encode(FrameType type, int seq, byte[] payload) {
        byte[] out = new byte[HEADER + payload.length + TRAILER];
        encode(type, seq, payload, 0, payload.length, out, 0);
        return out;
    }

    static void putU32(byte[] b, int at, int v) {
        b[at] = (byte) v;
        b[at + 1] = (byte) (v >>> 8);
        b[at + 2] = (byte) (v >>> 16);
        b[at + 3] = (byte) (v >>> 24);
    }

    static void putU64(byte[] b, int at, long v) {
        for (int i = 0; i < 8; i++) {
            b[at + i] = (byte) (v >>> (8 * i));
        }
    }

    static int u32(byte[] b, int at) {
        return (b[at] & 0xFF) | (b[at + 1] & 0xFF) << 8 | (b[at + 2] & 0xFF) << 16 | (b[at + 3] & 0xFF) << 24;
    }

    static long u64(byte[] b, int at) {
        long v = 0;
        for (int i = 7; i >= 0; i--) {
            v = (v << 8) | (b[at + i] & 0xFF);
        }
        return v;
    }
}
