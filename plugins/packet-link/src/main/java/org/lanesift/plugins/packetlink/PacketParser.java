package org.lanesift.plugins.packetlink;

/**
 * Cuts a merged high-speed (or low-power data) byte stream into packets: a 4-byte header (data
 * identifier, two data or word-count bytes, ECC), and for long packets the payload and a 16-bit
 * checksum, least significant byte first (MIPI DSI specification, from memory; docs/reference-facts.md#dsi-packets-ecc-and-checksum).
 *
 * <p>The header's ECC is checked and a single-bit error corrected before the length is used, so a
 * corrupted word count never sizes anything: a length that runs past the bytes at hand stops the
 * parse with {@link #STOP_TRUNCATED}. Parsing allocates nothing; results go to a {@link Listener}
 * as offsets into the caller's array.
 */
final class PacketParser {
    /** Parsing stopped: fewer than 4 bytes were left (a partial header after the last packet). */
    static final int STOP_LEFTOVER = 1;
    /** Parsing stopped: a header had two or more bit errors; the rest of the burst cannot be framed. */
    static final int STOP_UNCORRECTABLE = 2;
    /** Parsing stopped: a long packet's payload and checksum run past the end of the bytes. */
    static final int STOP_TRUNCATED = 3;

    /** Receives packets as they are cut. */
    interface Listener {
        /**
         * One packet.
         *
         * @param offset        index of its first header byte
         * @param header        the corrected 24 header bits: data identifier in bits 7:0, data bytes / word count in 23:8
         * @param eccResult     the packed {@link Ecc#check} result
         * @param payloadOffset index of the first payload byte (long packets)
         * @param payloadLength payload bytes, 0 for short packets
         * @param checksumRx    checksum as received, or -1 for short packets
         * @param checksumCalc  checksum computed over the payload, or -1 for short packets
         */
        void packet(int offset, int header, int eccResult, int payloadOffset, int payloadLength, int checksumRx, int checksumCalc);

        /**
         * Parsing ended before the last byte.
         *
         * @param offset    index of the first byte not parsed
         * @param remaining number of bytes not parsed
         * @param reason    {@link #STOP_LEFTOVER}, {@link #STOP_UNCORRECTABLE} or {@link #STOP_TRUNCATED}
         */
        default void stopped(int offset, int remaining, int reason) {
        }
    }

    private PacketParser() {
    }

    /**
     * Parses packets from {@code data[off, off + len)}.
     *
     * @param data bytes in wire order
     * @param off  first byte
     * @param len  number of bytes
     * @param l    receives packets
     * @return number of bytes taken by complete packets
     */
    static int parse(byte[] data, int off, int len, Listener l) {
        int pos = off;
        int end = off + len;
        while (end - pos >= 4) {
            int h = (data[pos] & 0xFF) | (data[pos + 1] & 0xFF) << 8 | (data[pos + 2] & 0xFF) << 16;
            int r = Ecc.check(h, data[pos + 3]);
            if (Ecc.status(r) == Ecc.UNCORRECTABLE) {
                l.stopped(pos, end - pos, STOP_UNCORRECTABLE);
                return pos - off;
            }
            int hdr = Ecc.header(r);
            if (!DataTypes.isLong(hdr)) {
                l.packet(pos, hdr, r, pos + 4, 0, -1, -1);
                pos += 4;
                continue;
            }
            int wc = hdr >>> 8;
            if (end - pos - 6 < wc) {
                l.stopped(pos, end - pos, STOP_TRUNCATED);
                return pos - off;
            }
            int p = pos + 4;
            int rx = (data[p + wc] & 0xFF) | (data[p + wc + 1] & 0xFF) << 8;
            int calc = PayloadCrc.of(data, p, wc);
            l.packet(pos, hdr, r, p, wc, rx, calc);
            pos = p + wc + 2;
        }
        if (pos < end) {
            l.stopped(pos, end - pos, STOP_LEFTOVER);
        }
        return pos - off;
    }
}
