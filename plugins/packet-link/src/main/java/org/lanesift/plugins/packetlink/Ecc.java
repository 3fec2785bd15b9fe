package org.lanesift.plugins.packetlink;

/**
 * The 6-bit error-correcting code of a packet header: a Hamming code over the 24 header bits
 * (data identifier and two data/word-count bytes) that corrects any single-bit error and detects
 * any double-bit error.
 *
 * <p>Header bit {@code i} is bit {@code i & 7} of header byte {@code i >> 3} (bit 0 = least
 * significant bit of the data identifier). ECC bit {@code p} is the XOR of the header bits listed
 * in docs/reference-facts.md#dsi-packets-ecc-and-checksum (MIPI DSI specification, from memory). Every header bit feeds an
 * odd number (3 or 5) of parity bits, so a single error gives a syndrome of odd weight that names
 * the bit, and two errors give a non-zero syndrome of even weight that names none.
 */
public final class Ecc {
    /** Result status: the header and ECC agreed. */
    public static final int OK = 0;
    /** Result status: one header bit was wrong and has been corrected. */
    public static final int CORRECTED_HEADER_BIT = 1;
    /** Result status: one ECC bit was wrong; the header bits were right. */
    public static final int CORRECTED_ECC_BIT = 2;
    /** Result status: two or more bits were wrong; the header cannot be trusted. */
    public static final int UNCORRECTABLE = 3;

    /** Header bits that make up each ECC bit (docs/reference-facts.md#dsi-packets-ecc-and-checksum, MIPI DSI specification, from memory). */
    static final int[][] PARITY_SETS = {
        {0, 1, 2, 4, 5, 7, 10, 11, 13, 16, 20, 21, 22, 23},
        {0, 1, 3, 4, 6, 8, 10, 12, 14, 17, 20, 21, 22, 23},
        {0, 2, 3, 5, 6, 9, 11, 12, 15, 18, 20, 21, 22},
        {1, 2, 3, 7, 8, 9, 13, 14, 15, 19, 20, 21, 23},
        {4, 5, 6, 7, 8, 9, 16, 17, 18, 19, 20, 22, 23},
        {10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 21, 22, 23},
    };

    private static final int[] COLUMN = new int[24];
    private static final byte[] T0 = new byte[256];
    private static final byte[] T1 = new byte[256];
    private static final byte[] T2 = new byte[256];
    /** Syndrome to the header bit it names (0..23), 24+p for ECC bit p, or -1. */
    private static final byte[] SYNDROME_BIT = new byte[64];

    static {
        for (int p = 0; p < 6; p++) {
            for (int b : PARITY_SETS[p]) {
                COLUMN[b] |= 1 << p;
            }
        }
        for (int v = 0; v < 256; v++) {
            int e0 = 0;
            int e1 = 0;
            int e2 = 0;
            for (int k = 0; k < 8; k++) {
                if ((v >> k & 1) != 0) {
                    e0 ^= COLUMN[k];
                    e1 ^= COLUMN[8 + k];
                    e2 ^= COLUMN[16 + k];
                }
            }
            T0[v] = (byte) e0;
            T1[v] = (byte) e1;
            T2[v] = (byte) e2;
        }
        java.util.Arrays.fill(SYNDROME_BIT, (byte) -1);
        for (int b = 0; b < 24; b++) {
            SYNDROME_BIT[COLUMN[b]] = (byte) b;
        }
        for (int p = 0; p < 6; p++) {
            SYNDROME_BIT[1 << p] = (byte) (24 + p);
        }
    }

    private Ecc() {
    }

    /**
     * Computes the ECC of a header.
     *
     * @param header24 the three header bytes, first byte in bits 7:0
     * @return the ECC byte (bits 7:6 zero)
     */
    public static int compute(int header24) {
        return (T0[header24 & 0xFF] ^ T1[(header24 >>> 8) & 0xFF] ^ T2[(header24 >>> 16) & 0xFF]) & 0x3F;
    }

    /**
     * Checks a received header against its ECC and corrects a single-bit error.
     *
     * @param header24 the three header bytes as received, first byte in bits 7:0
     * @param eccByte  the received ECC byte (bits 7:6 are ignored)
     * @return packed result: corrected header in bits 23:0, status ({@link #OK} ..
     *         {@link #UNCORRECTABLE}) in bits 25:24, corrected bit position (0..29, header bits then
     *         ECC bits) in bits 30:26; read it with {@link #header}, {@link #status}, {@link #bit}
     */
    public static int check(int header24, int eccByte) {
        int h = header24 & 0xFFFFFF;
        int syndrome = compute(h) ^ (eccByte & 0x3F);
        if (syndrome == 0) {
            return h;
        }
        int bit = SYNDROME_BIT[syndrome];
        if (bit < 0) {
            return h | UNCORRECTABLE << 24;
        }
        if (bit < 24) {
            return (h ^ (1 << bit)) | CORRECTED_HEADER_BIT << 24 | bit << 26;
        }
        return h | CORRECTED_ECC_BIT << 24 | bit << 26;
    }

    /**
     * The header part of a {@link #check} result.
     *
     * @param result the packed result
     * @return the (corrected) 24 header bits
     */
    public static int header(int result) {
        return result & 0xFFFFFF;
    }

    /**
     * The status part of a {@link #check} result.
     *
     * @param result the packed result
     * @return {@link #OK}, {@link #CORRECTED_HEADER_BIT}, {@link #CORRECTED_ECC_BIT} or {@link #UNCORRECTABLE}
     */
    public static int status(int result) {
        return (result >>> 24) & 3;
    }

    /**
     * The corrected bit of a {@link #check} result.
     *
     * @param result the packed result
     * @return 0..23 for a header bit, 24..29 for ECC bit 0..5; meaningful only when corrected
     */
    public static int bit(int result) {
        return (result >>> 26) & 31;
    }
}
