package org.lanesift.kit;

/**
 * Chooses on average one sample in {@code stride} for statistics, without aliasing: whether sample
 * {@code index} (counted from the stream start) is taken depends on a hash of the index alone, so
 * the chosen samples fall at every phase of any periodic signal (a fixed stride of 16 sees only
 * five phases of an 80-sample clock period) and do not depend on where blocks are cut.
 *
 * <p>The hash is the SplitMix64 output function (Steele, Lea and Flood, Fast splittable
 * pseudorandom number generators, OOPSLA 2014), whose output bits pass the usual randomness tests.
 */
public final class DitheredStride {
    private DitheredStride() {
    }

    /**
     * Whether a sample is taken.
     *
     * @param index  sample index from the stream start
     * @param stride mean distance between taken samples, at least 1 (1 takes every sample)
     * @return true when the sample counts
     */
    public static boolean taken(long index, int stride) {
        return stride <= 1 || Long.remainderUnsigned(mix(index), stride) == 0;
    }

    /**
     * SplitMix64's output function of {@code x}.
     *
     * @param x any value
     * @return its 64-bit hash
     */
    static long mix(long x) {
        long z = x + 0x9E3779B97F4A7C15L;
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
