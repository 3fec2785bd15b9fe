package org.lanesift.plugins.packetlink;

/**
 * The 16-bit checksum of a long packet's payload: CRC-16 with polynomial x^16+x^12+x^5+1,
 * reflected, initial value 0xFFFF, no final XOR (catalogued as CRC-16/MCRF4XX in the CRC RevEng
 * catalogue; DESIGN.md section 6). It is sent after the payload, least significant byte first.
 * Table-driven, one table lookup per byte.
 */
public final class PayloadCrc {
    /** Initial register value. */
    public static final int INIT = 0xFFFF;
    private static final char[] TABLE = new char[256];

    static {
        for (int v = 0; v < 256; v++) {
            int c = v;
            for (int k = 0; k < 8; k++) {
                c = (c & 1) != 0 ? (c >>> 1) ^ 0x8408 : c >>> 1;
            }
            TABLE[v] = (char) c;
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
        for (int i = off, end = off + len; i < end; i++) {
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
