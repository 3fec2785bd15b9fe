package org.lanesift.plugins.packetlink;

/**
 * The 16-bit checksum of a long packet's payload: CRC-16 with polynomial x^16+x^12+x^5+1,
 * reflected, initial value 0xFFFF, no final XOR (catalogued as CRC-16/MCRF4XX in the CRC RevEng
 * catalogue; docs/reference-facts.md#dsi-packets-ecc-and-checksum). It is sent after the payload, least significant byte first.
 * Table-driven, eight bytes per step (slicing-by-8).
 */
public final class PayloadCrc {
    /** Initial register value. */
    public static final int INIT = 0xFFFF;
    private static final char[] TABLE = new char[256];
    /** Slicing-by-8 tables: T8[k][v] is the register after byte v followed by k zero bytes. */
    private static final int[] T8 = new int[8 * 256];

    static {
        for (int v = 0; v < 256; v++) {
            int c = v;
            for (int k = 0; k < 8; k++) {
                c = (c & 1) != 0 ? (c >>> 1) ^ 0x8408 : c >>> 1;
            }
            TABLE[v] = (char) c;
            T8[v] = c;
        }
        for (int k = 1; k < 8; k++) {
            for (int v = 0; v < 256; v++) {
                int prev = T8[(k - 1) * 256 + v];
                T8[k * 256 + v] = (prev >>> 8) ^ TABLE[prev & 0xFF];
            }
        }
    }

    private PayloadCrc() {
    }

    /**
     * Continues a checksum over bytes.
     *
     * @param crc  the register so far ({@link #INIT} to start)
     * @param data the bytes
     * @param off  first byte
     * @param len  number of bytes
     * @return the new register value, 16 bits
     */
    public static int update(int crc, byte[] data, int off, int len) {
        int c = crc & 0xFFFF;
        int i = off;
        int end = off + len;
        int[] t = T8;
        // eight bytes per step (slicing-by-8): the register meets the first two bytes only
        for (; i + 8 <= end; i += 8) {
            int b0 = (data[i] ^ c) & 0xFF;
            int b1 = (data[i + 1] ^ (c >>> 8)) & 0xFF;
            c = t[7 * 256 + b0] ^ t[6 * 256 + b1] ^ t[5 * 256 + (data[i + 2] & 0xFF)] ^ t[4 * 256 + (data[i + 3] & 0xFF)]
                    ^ t[3 * 256 + (data[i + 4] & 0xFF)] ^ t[2 * 256 + (data[i + 5] & 0xFF)] ^ t[256 + (data[i + 6] & 0xFF)]
                    ^ t[data[i + 7] & 0xFF];
        }
        for (; i < end; i++) {
            c = (c >>> 8) ^ TABLE[(c ^ data[i]) & 0xFF];
        }
        return c;
    }

    /**
     * The checksum of bytes.
     *
     * @param data the bytes
     * @param off  first byte
     * @param len  number of bytes
     * @return the checksum, 16 bits
     */
    public static int of(byte[] data, int off, int len) {
        return update(INIT, data, off, len);
    }
}
