package org.lanesift.data;

/**
 * Helpers for the bit-packed arrays used throughout: bit {@code i} lives in bit {@code i & 63} of
 * word {@code i >>> 6}, so 64 samples or flags share one {@code long}.
 */
public final class BitSets {
    private BitSets() {
    }

    /**
     * Number of {@code long} words needed for a number of bits.
     *
     * @param bits number of bits, not negative
     * @return words needed
     */
    public static int words(int bits) {
        return (bits + 63) >>> 6;
    }

    /**
     * Reads one bit.
     *
     * @param words the packed array
     * @param i     bit index
     * @return the bit
     */
    public static boolean get(long[] words, int i) {
        return (words[i >>> 6] & (1L << i)) != 0;
    }

    /**
     * Sets one bit to a value.
     *
     * @param words the packed array
     * @param i     bit index
     * @param v     the value
     */
    public static void set(long[] words, int i, boolean v) {
        if (v) {
            words[i >>> 6] |= 1L << i;
        } else {
            words[i >>> 6] &= ~(1L << i);
        }
    }

    /**
     * Sets bits {@code [from, to)} to one.
     *
     * @param words the packed array
     * @param from  first bit
     * @param to    end bit, exclusive
     */
    public static void setRange(long[] words, int from, int to) {
        if (from >= to) {
            return;
        }
        int fw = from >>> 6;
        int lw = (to - 1) >>> 6;
        long firstMask = -1L << from;
        long lastMask = -1L >>> -to;
        if (fw == lw) {
            words[fw] |= firstMask & lastMask;
            return;
        }
        words[fw] |= firstMask;
        for (int w = fw + 1; w < lw; w++) {
            words[w] = -1L;
        }
        words[lw] |= lastMask;
    }

    /**
     * Whether any bit in {@code [from, to)} is set; a null array has none.
     *
     * @param words the packed array, may be null
     * @param from  first bit
     * @param to    end bit, exclusive
     * @return true if at least one bit is set
     */
    public static boolean any(long[] words, int from, int to) {
        if (words == null || from >= to) {
            return false;
        }
        int fw = from >>> 6;
        int lw = (to - 1) >>> 6;
        long firstMask = -1L << from;
        long lastMask = -1L >>> -to;
        if (fw == lw) {
            return (words[fw] & firstMask & lastMask) != 0;
        }
        if ((words[fw] & firstMask) != 0 || (words[lw] & lastMask) != 0) {
            return true;
        }
        for (int w = fw + 1; w < lw; w++) {
            if (words[w] != 0) {
                return true;
            }
        }
        return false;
    }

    /**
     * Counts set bits in the first {@code bits} bits.
     *
     * @param words the packed array, may be null
     * @param bits  number of bits to look at
     * @return count of ones
     */
    public static int count(long[] words, int bits) {
        if (words == null) {
            return 0;
        }
        int n = 0;
        int full = bits >>> 6;
        for (int w = 0; w < full; w++) {
            n += Long.bitCount(words[w]);
        }
        if ((bits & 63) != 0) {
            n += Long.bitCount(words[full] & ((1L << bits) - 1));
        }
        return n;
    }

    /**
     * Copies {@code n} bits starting at bit {@code from} into a new array starting at bit 0, a word
     * at a time.
     *
     * @param src  packed bits
     * @param from first bit to copy
     * @param n    number of bits
     * @return the copy, {@link #words(int) words(n)} long, bits past {@code n} clear
     */
    public static long[] slice(long[] src, int from, int n) {
        long[] dst = new long[words(n)];
        int sw = from >>> 6;
        int sh = from & 63;
        for (int w = 0; w < dst.length; w++) {
            long v = sw + w < src.length ? src[sw + w] >>> sh : 0;
            if (sh != 0 && sw + w + 1 < src.length) {
                v |= src[sw + w + 1] << (64 - sh);
            }
            dst[w] = v;
        }
        if ((n & 63) != 0) {
            dst[dst.length - 1] &= (1L << n) - 1;
        }
        return dst;
    }
}
