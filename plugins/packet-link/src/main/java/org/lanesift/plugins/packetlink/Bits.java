package org.lanesift.plugins.packetlink;

/** Packed-bit helpers working 64 bits at a time (bit i in bit i&63 of word i>>>6). */
final class Bits {
    private Bits() {
    }

    /**
     * Reads 64 bits starting at {@code pos}; bits past the array read as 0.
     *
     * @param a   packed bits
     * @param pos first bit
     * @return bit pos in bit 0
     */
    static long get64(long[] a, int pos) {
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
     * {@code dst} bits at and after {@code dstPos} must be zero (append only).
     */
    static void append(long[] src, int srcPos, long[] dst, int dstPos, int n) {
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
     * Index of the first bit of the final run of equal bits in {@code [0, n)}: every bit from it
     * to {@code n - 1} equals bit {@code n - 1}, and the bit before it differs.
     *
     * @param a packed bits
     * @param n bit count, at least 1
     * @return the run start, 0 when all bits are equal
     */
    static int finalRunStart(long[] a, int n) {
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
