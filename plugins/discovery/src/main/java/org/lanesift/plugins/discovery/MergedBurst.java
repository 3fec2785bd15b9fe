package org.lanesift.plugins.discovery;

import org.lanesift.data.BitSets;
import org.lanesift.kit.PackedBits;

/**
 * One burst's payload after the sync, lanes merged, in wire order: bit {@code i} is the
 * {@code i}-th bit of the burst's word stream as it was sent.
 *
 * @param bits   packed bits
 * @param length bit count
 * @param index  burst number in the capture
 */
record MergedBurst(long[] bits, int length, int index) {

    boolean bit(int i) {
        return BitSets.get(bits, i);
    }

    int words(int wordBits) {
        return length / wordBits;
    }

    /**
     * Word {@code q} of {@code wordBits} bits; with {@code msbFirst} the first wire bit is the
     * most significant bit of the value.
     */
    long word(int q, int wordBits, boolean msbFirst) {
        long x = PackedBits.get64(bits, q * wordBits);
        if (wordBits < 64) {
            x &= (1L << wordBits) - 1;
        }
        return msbFirst ? Long.reverse(x) >>> (64 - wordBits) : x;
    }
}
