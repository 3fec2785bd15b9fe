package org.lanesift.plugins.discovery;

/**
 * A CRC parameter set in the form the CRC RevEng catalogue uses (width, poly, init, refin,
 * refout, xorout, check), computed bit-serially over a wire bit sequence: a reflected model takes
 * the bits as they come, least significant bit of each byte first (which is how a byte sent LSB
 * first arrives); a direct model takes them most significant bit first. The result is sent in the
 * same order: LSB first when reflected, MSB first otherwise.
 *
 * @param name   catalogue name
 * @param width  register width, bits (8, 16 or 32)
 * @param poly   generator polynomial without the top bit, normal (not reflected) form
 * @param init   initial register value, normal form
 * @param refin  input reflected
 * @param refout output reflected
 * @param xorout final XOR
 * @param check  the CRC of the ASCII bytes "123456789" (the catalogue's check value)
 */
public record CrcModel(String name, int width, long poly, long init, boolean refin, boolean refout, long xorout, long check) {

    long mask() {
        return width == 64 ? -1L : (1L << width) - 1;
    }

    /**
     * The CRC of {@code n} wire bits starting at {@code from}.
     *
     * @param bits packed bits
     * @param from first bit
     * @param n    bit count
     * @return the CRC value (normal form, as the catalogue writes it)
     */
    long of(long[] bits, int from, int n) {
        long top = 1L << (width - 1);
        long reg = init;
        long mask = mask();
        for (int i = from; i < from + n; i++) {
            long bit = bits[i >>> 6] >>> i & 1L;
            long fb = ((reg & top) != 0 ? 1L : 0L) ^ bit;
            reg = (reg << 1) & mask;
            if (fb != 0) {
                reg ^= poly;
            }
        }
        if (refout) {
            reg = Long.reverse(reg) >>> (64 - width);
        }
        return (reg ^ xorout) & mask;
    }

    /**
     * Wire bits of bytes in the order this model reads them (LSB first when reflected).
     *
     * @param bytes the bytes
     * @return packed bits, 8 per byte
     */
    long[] wireBits(byte[] bytes) {
        long[] w = new long[(bytes.length * 8 + 63) / 64];
        for (int i = 0; i < bytes.length; i++) {
            for (int j = 0; j < 8; j++) {
                int b = refin ? (bytes[i] >> j) & 1 : (bytes[i] >> (7 - j)) & 1;
                if (b != 0) {
                    int at = i * 8 + j;
                    w[at >>> 6] |= 1L << at;
                }
            }
        }
        return w;
    }

    /** The value carried by {@code width} wire bits at {@code from} (LSB first when the output is reflected). */
    long sent(long[] bits, int from) {
        long v = 0;
        for (int j = 0; j < width; j++) {
            int i = from + j;
            if ((bits[i >>> 6] >>> i & 1L) != 0) {
                v |= refout ? 1L << j : 1L << (width - 1 - j);
            }
        }
        return v;
    }
}
