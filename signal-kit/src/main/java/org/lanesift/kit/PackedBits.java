package org.lanesift.kit;

/**
 * Packed-bit helpers beyond the contract's {@link org.lanesift.data.BitSets}, working 64 bits at a
 * time with the same layout (bit {@code i} in bit {@code i & 63} of word {@code i >>> 6}).
 */
public final class PackedBits {
    private PackedBits() {
    }

    /**
     * Reads 64 bits starting at {@code pos}; bits past the array read as 0.
     *
     * @param a   packed bits
     * @param pos first bit, inside the array
     * @return bit {@code pos} in bit 0
     */
    public static long get64(long[] a, int pos) {
        int w = pos >>> 6;
        int s = pos & 63;
        long lo = a[w] >>> s;
        if (s == 0 || w + 1 >= a.length) {
            return lo;
        }
        return lo | a[w + 1] << (64 - s);
    }

    /**
     * Copies {@code n} bits from {@code src} at {@code srcPos} to {@code dst} at {@code dstPos}.
     * The {@code dst} bits at and after {@code dstPos} must be zero (append only).
     *
     * @param src    source bits
     * @param srcPos first source bit
     * @param dst    destination, large enough
     * @param dstPos first destination bit
     * @param n      bit count
     */
    public static void append(long[] src, int srcPos, long[] dst, int dstPos, int n) {
        int done = 0;
        while (done < n) {
            int k = Math.min(64, n - done);
            long v = get64(src, srcPos + done);
            if (k < 64) {
                v &= (1L << k) - 1;
            }
            int d = dstPos + done;
            int w = d >>> 6;
            int s = d & 63;
            dst[w] |= v << s;
            if (s != 0 && s + k > 64) {
                dst[w + 1] |= v >>> (64 - s);
            }
            done += k;
        }
    }

    /**
     * ORs {@code len} bits of {@code src} from bit {@code from} into {@code dst} from bit 0; bits of
     * {@code dst} past {@code len} in its last word are cleared.
     *
     * @param dst  destination, at least {@code BitSets.words(len)} words
     * @param src  source bits (bits past its end read as 0)
     * @param from first source bit
     * @param len  bit count
     */
    public static void orShifted(long[] dst, long[] src, int from, int len) {
        int words = (len + 63) >>> 6;
        int sw = from >>> 6;
        int sh = from & 63;
        for (int w = 0; w < words; w++) {
            long lo = sw + w < src.length ? src[sw + w] : 0;
            long v = lo >>> sh;
            if (sh != 0 && sw + w + 1 < src.length) {
                v |= src[sw + w + 1] << (64 - sh);
            }
            dst[w] |= v;
        }
        if ((len & 63) != 0) {
            dst[words - 1] &= (1L << len) - 1;
        }
    }

    /**
     * Index of the first bit of the final run of equal bits in {@code [0, n)}: every bit from it
     * to {@code n - 1} equals bit {@code n - 1}, and the bit before it differs.
     *
     * @param a packed bits
     * @param n bit count, at least 1
     * @return the run start, 0 when all bits are equal
     */
    public static int finalRunStart(long[] a, int n) {
        boolean last = (a[(n - 1) >>> 6] & (1L << (n - 1))) != 0;
        int w = (n - 1) >>> 6;
        long validMask = ((n & 63) == 0) ? -1L : (1L << (n & 63)) - 1;
        while (w >= 0) {
            long x = a[w];
            if (last) {
                x = ~x;
            }
            if (w == (n - 1) >>> 6) {
                x &= validMask;
            }
            if (x != 0) {
                return w * 64 + 63 - Long.numberOfLeadingZeros(x) + 1;
            }
            w--;
        }
        return 0;
    }
}
