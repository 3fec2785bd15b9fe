package org.lanesift.plugins.differential;

import org.lanesift.data.BitSets;
import org.lanesift.kit.PackedBits;

/**
 * A run of samples both legs have (or the one channel has) at the same times: volts of the first
 * leg from offset {@code ao}, of the second (null for one channel) from {@code bo}, {@code len}
 * samples, and their invalid samples as one chunk-aligned mask (null when none).
 */
record Chunk(float[] a, int ao, float[] b, int bo, int len, long[] inv) {
    /**
     * The OR of two masks' bit ranges, aligned to bit 0, or null when neither has a bit set.
     *
     * @param x  first mask, or null
     * @param xo its first bit
     * @param len bits
     * @param y  second mask, or null
     * @param yo its first bit
     * @return the mask or null
     */
    static long[] mask(long[] x, int xo, int len, long[] y, int yo) {
        boolean ax = x != null && BitSets.any(x, xo, xo + len);
        boolean ay = y != null && BitSets.any(y, yo, yo + len);
        if (!ax && !ay) {
            return null;
        }
        long[] out = new long[BitSets.words(len)];
        if (ax) {
            PackedBits.orShifted(out, x, xo, len);
        }
        if (ay) {
            PackedBits.orShifted(out, y, yo, len);
        }
        return out;
    }
}
