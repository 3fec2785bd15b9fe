package org.lanesift.plugins.serial;

/**
 * CRC-32C (Castagnoli): polynomial 0x1EDC6F41, reflected (table polynomial 0x82F63B78), initial
 * value 0xFFFFFFFF, final XOR 0xFFFFFFFF. The frame checksum of the device stream
 * (docs/device-stream.md). {@link #update} is the byte-at-a-time table form, written out so
 * firmware authors can read the exact algorithm; {@link #of}, on the hot paths, gives the same
 * value through {@link java.util.zip.CRC32C}, which the JVM compiles to the processor's CRC
 * instructions where it has them.
 */
public final class Crc32c {
    private static final int[] TABLE = new int[256];

    static {
        for (int i = 0; i < 256; i++) {
            int c = i;
            for (int k = 0; k < 8; k++) {
                c = (c & 1) != 0 ? (c >>> 1) ^ 0x82F63B78 : c >>> 1;
            }
            TABLE[i] = c;
        }
    }

    private Crc32c() {
    }

    /**
     * Continues a running CRC register (start with {@code 0xFFFFFFFF}, finish with {@code ~reg}).
     *
     * @param reg register value
     * @param b   bytes
     * @param off first byte
     * @param len number of bytes
     * @return new register value
     */
    public static int update(int reg, byte[] b, int off, int len) {
        int c = reg;
        for (int i = off, end = off + len; i < end; i++) {
            c = TABLE[(c ^ b[i]) & 0xFF] ^ (c >>> 8);
        }
        return c;
    }

    /**
     * The CRC-32C of a byte range.
     *
     * @param b   bytes
     * @param off first byte
     * @param len number of bytes
     * @return the checksum as an unsigned 32-bit value in an int
     */
    public static int of(byte[] b, int off, int len) {
        java.util.zip.CRC32C c = new java.util.zip.CRC32C();
        c.update(b, off, len);
        return (int) c.getValue();
    }
}
