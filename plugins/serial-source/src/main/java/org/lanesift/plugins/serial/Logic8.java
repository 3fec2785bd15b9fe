package org.lanesift.plugins.serial;

/**
 * Splits logic8 samples (one byte per sample time, bit k = channel k) into bit-packed channels
 * ({@link org.lanesift.data.BitSets} layout), eight samples at a time with an 8x8 bit-matrix
 * transpose in one {@code long} (the three-step exchange of Hacker's Delight, section 7-3,
 * "Transposing a Bit Matrix").
 */
final class Logic8 {
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
        for (int c = 0; c < channels; c++) {
            java.util.Arrays.fill(out[c], 0, words, 0L);
        }
        int full = n & ~7;
        for (int i = 0; i < full; i += 8) {
            long x = (b[i] & 0xFFL) | (b[i + 1] & 0xFFL) << 8 | (b[i + 2] & 0xFFL) << 16 | (b[i + 3] & 0xFFL) << 24
                    | (b[i + 4] & 0xFFL) << 32 | (b[i + 5] & 0xFFL) << 40 | (b[i + 6] & 0xFFL) << 48 | (b[i + 7] & 0xFFL) << 56;
            long t = transpose8(x);
            int w = i >>> 6;
            int sh = i & 63;
            for (int c = 0; c < channels; c++) {
                out[c][w] |= ((t >>> (8 * c)) & 0xFFL) << sh;
            }
        }
        for (int i = full; i < n; i++) {
            int v = b[i];
            for (int c = 0; c < channels; c++) {
                if ((v & (1 << c)) != 0) {
                    out[c][i >>> 6] |= 1L << i;
                }
            }
        }
    }
}
