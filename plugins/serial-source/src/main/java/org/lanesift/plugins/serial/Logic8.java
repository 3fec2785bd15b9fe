package org.lanesift.plugins.serial;

/**
 * Splits logic8 samples (one byte per sample time, bit k = channel k) into bit-packed channels
 * ({@link org.lanesift.data.BitSets} layout), eight samples at a time with an 8x8 bit-matrix
 * transpose in one {@code long} (the three-step exchange of Hacker's Delight, section 7-3,
 * "Transposing a Bit Matrix").
 */
final class Logic8 {
    private static final java.lang.invoke.VarHandle LE64 =
            java.lang.invoke.MethodHandles.byteArrayViewVarHandle(long[].class, java.nio.ByteOrder.LITTLE_ENDIAN);

    private Logic8() {
    }

    /** Transposes the 8x8 bit matrix whose row j is byte j of {@code x}: afterwards byte k, bit j = old byte j, bit k. */
    static long transpose8(long x) {
        long t = (x ^ (x >>> 7)) & 0x00AA00AA00AA00AAL;
        x = x ^ t ^ (t << 7);
        t = (x ^ (x >>> 14)) & 0x0000CCCC0000CCCCL;
        x = x ^ t ^ (t << 14);
        t = (x ^ (x >>> 28)) & 0x00000000F0F0F0F0L;
        x = x ^ t ^ (t << 28);
        return x;
    }

    /**
     * Splits {@code n} samples into {@code out[k]} for channels k below {@code channels}.
     *
     * @param b        samples
     * @param n        count
     * @param channels channels to fill
     * @param out      one array of at least {@code ceil(n/64)} words per channel, overwritten
     */
    static void split(byte[] b, int n, int channels, long[][] out) {
        int words = (n + 63) >>> 6;
        int fullWords = n >>> 6;
        // whole words: eight 8x8 transposes make 64 samples of every channel, kept in registers
        for (int w = 0; w < fullWords; w++) {
            long a0 = 0, a1 = 0, a2 = 0, a3 = 0, a4 = 0, a5 = 0, a6 = 0, a7 = 0;
            int base = w << 6;
            for (int k = 0; k < 8; k++) {
                long t = transpose8((long) LE64.get(b, base + 8 * k));
                int sh = 8 * k;
                a0 |= (t & 0xFFL) << sh;
                a1 |= (t >>> 8 & 0xFFL) << sh;
                a2 |= (t >>> 16 & 0xFFL) << sh;
                a3 |= (t >>> 24 & 0xFFL) << sh;
                a4 |= (t >>> 32 & 0xFFL) << sh;
                a5 |= (t >>> 40 & 0xFFL) << sh;
                a6 |= (t >>> 48 & 0xFFL) << sh;
                a7 |= (t >>> 56) << sh;
            }
            switch (channels) {
                case 8: out[7][w] = a7; // fall through
                case 7: out[6][w] = a6; // fall through
                case 6: out[5][w] = a5; // fall through
                case 5: out[4][w] = a4; // fall through
                case 4: out[3][w] = a3; // fall through
                case 3: out[2][w] = a2; // fall through
                case 2: out[1][w] = a1; // fall through
                default: out[0][w] = a0;
            }
        }
        if (fullWords == words) {
            return;
        }
        // the last, partial word, sample by sample
        for (int c = 0; c < channels; c++) {
            out[c][fullWords] = 0L;
        }
        for (int i = fullWords << 6; i < n; i++) {
            int v = b[i];
            for (int c = 0; c < channels; c++) {
                if ((v & (1 << c)) != 0) {
                    out[c][i >>> 6] |= 1L << i;
                }
            }
        }
    }
}
