package org.lanesift.runner.capture;

import java.util.Arrays;

/**
 * The per-channel arrays a capture reader fills for one block: new arrays for every block, or, for
 * the channels whose blocks the engine lets the source lend (see {@code org.lanesift.data.Block},
 * "Ownership"), two sets of arrays used in turn, so that the set emitted by one {@code next} call
 * is recycled when the next call begins and overwritten by the block after, filled on the caller's
 * thread or ahead of time on the reader's read-ahead thread ({@link ReadAhead}, which calls
 * {@link #release()}, {@link #begin()} and {@link #handOut()} in the order that keeps this rule).
 * Only full-length blocks are lent; a shorter last block gets new arrays of its exact length, as
 * every block did before lending existed. Not thread-safe: used by one thread at a time.
 *
 * <p>Test mode: when {@link #poison} is on, the set emitted by the previous call is overwritten
 * with poison (NaN volts, alternating logic bits, every sample marked invalid) as the next call
 * begins ({@link #release()}), so a receiver that kept a lent block sees it change at once.
 */
final class BlockArrays {
    /** Test mode, see the class comment; also set by the system property {@code lanesift.poisonLentBlocks=true}. */
    static volatile boolean poison = Boolean.getBoolean("lanesift.poisonLentBlocks");
    private static final long POISON_BITS = 0x5555_5555_5555_5555L;

    private final int channels;
    private final int fullLength;
    private boolean[] lent;
    private final float[][][] volts = new float[2][][];
    private final long[][][] bits = new long[2][][];
    private final long[][][] masks = new long[2][][];
    /** Set of the block being filled (0 or 1). */
    private int set;
    /** Whether an array of {@link #set} has been taken since the last {@link #begin()}. */
    private boolean filled;
    /** Set handed out (0 or 1), or -1. */
    private int out = -1;

    /**
     * @param channels   channels per block
     * @param fullLength samples per channel of a full block
     */
    BlockArrays(int channels, int fullLength) {
        this.channels = channels;
        this.fullLength = fullLength;
        this.lent = new boolean[channels];
    }

    /**
     * Says which channels' blocks may be lent; before the first block.
     *
     * @param perChannel one flag per channel, or null for none
     */
    void lend(boolean[] perChannel) {
        lent = perChannel == null ? new boolean[channels] : perChannel.clone();
    }

    /** Whether any channel is lent. */
    boolean lending() {
        for (boolean b : lent) {
            if (b) {
                return true;
            }
        }
        return false;
    }

    /**
     * The set handed out last is recycled now (a call to the reader's {@code next} began): in test
     * mode it is poisoned. Called before any array of the next block is filled.
     */
    void release() {
        if (out >= 0 && poison) {
            poison(out);
        }
        out = -1;
    }

    /** Starts filling a block: the set not filled last (never the one handed out). */
    void begin() {
        if (filled) {
            filled = false;
            set ^= 1;
        }
        if (set == out) {
            throw new IllegalStateException("block arrays: the set being filled is still out");
        }
    }

    /** The set just filled is handed out, until the next {@link #release()}. */
    void handOut() {
        out = filled ? set : -1;
    }

    private void poison(int s) {
        if (volts[s] != null) {
            for (float[] v : volts[s]) {
                if (v != null) {
                    Arrays.fill(v, Float.NaN);
                }
            }
        }
        if (bits[s] != null) {
            for (long[] b : bits[s]) {
                if (b != null) {
                    Arrays.fill(b, POISON_BITS);
                }
            }
        }
        if (masks[s] != null) {
            for (long[] m : masks[s]) {
                if (m != null) {
                    Arrays.fill(m, -1L);
                }
            }
        }
    }

    /**
     * The volts array of a channel for a block of {@code n} samples: lent or new.
     *
     * @param k channel
     * @param n samples in the block
     * @return an array of length {@code n} (contents undefined)
     */
    float[] volts(int k, int n) {
        filled = true;
        if (!lent[k] || n != fullLength) {
            return new float[n];
        }
        if (volts[set] == null) {
            volts[set] = new float[channels][];
        }
        float[] a = volts[set][k];
        if (a == null) {
            a = new float[n];
            volts[set][k] = a;
        }
        return a;
    }

    /**
     * The packed-bits array of a channel for a block of {@code n} samples: lent or new.
     *
     * @param k channel
     * @param n samples in the block
     * @return an array of {@code (n + 63) / 64} words (contents undefined)
     */
    long[] bits(int k, int n) {
        filled = true;
        int words = (n + 63) >>> 6;
        if (!lent[k] || n != fullLength) {
            return new long[words];
        }
        if (bits[set] == null) {
            bits[set] = new long[channels][];
        }
        long[] a = bits[set][k];
        if (a == null) {
            a = new long[words];
            bits[set][k] = a;
        }
        return a;
    }

    /**
     * A cleared invalid-sample mask of a channel for a block of {@code n} samples: lent or new.
     *
     * @param k channel
     * @param n samples in the block
     * @return zeroed array of {@code (n + 63) / 64} words
     */
    long[] mask(int k, int n) {
        filled = true;
        int words = (n + 63) >>> 6;
        if (!lent[k] || n != fullLength) {
            return new long[words];
        }
        if (masks[set] == null) {
            masks[set] = new long[channels][];
        }
        long[] a = masks[set][k];
        if (a == null) {
            a = new long[words];
            masks[set][k] = a;
        } else {
            Arrays.fill(a, 0L);
        }
        return a;
    }
}
