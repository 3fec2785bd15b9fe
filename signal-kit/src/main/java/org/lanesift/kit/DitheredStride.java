package org.lanesift.kit;

/**
 * Chooses one sample in each run of {@code stride} samples for statistics, at a position within
 * the run that a hash of the run's number decides (stratified, jittered sampling). The chosen
 * samples fall at every phase of any periodic signal, where a fixed stride of 16 sees only five
 * phases of an 80-sample clock period, yet exactly one sample in {@code stride} is taken, spread as
 * evenly as a fixed stride spreads them. The choice depends on the sample index from the stream
 * start alone, so it does not depend on where blocks are cut.
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
     * @param stride length of the runs, at least 1 (1 takes every sample)
     * @return true when the sample counts
     */
    public static boolean taken(long index, int stride) {
        if (stride <= 1) {
            return true;
        }
        long run = Math.floorDiv(index, stride);
        return index - run * stride == offset(run, stride);
    }

    /**
     * The first sample taken at or after {@code index}.
     *
     * @param index  sample index from the stream start
     * @param stride length of the runs, at least 1
     * @return the index of the next sample taken
     */
    public static long next(long index, int stride) {
        if (stride <= 1) {
            return index;
        }
        long run = Math.floorDiv(index, stride);
        long k = run * stride + offset(run, stride);
        return k >= index ? k : (run + 1) * stride + offset(run + 1, stride);
    }

    /**
     * Where in run {@code run} the taken sample lies: the top 32 bits of the hash scaled to
     * {@code [0, stride)} by a multiply and a shift, no division (D. Lemire, A fast alternative to
     * the modulo reduction, 2016).
     *
     * @param run    run number, {@code floor(index / stride)}
     * @param stride run length, at least 1
     * @return the offset of the taken sample in the run
     */
    public static int offset(long run, int stride) {
        if (stride <= 1) {
            return 0;
        }
        return (int) (((mix(run) >>> 32) * stride) >>> 32);
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
