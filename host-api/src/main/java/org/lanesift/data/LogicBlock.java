package org.lanesift.data;

import java.util.Objects;

/**
 * A contiguous run of one logic channel's samples, bit-packed 64 to a {@code long}
 * ({@link BitSets} layout): sample {@code i} is bit {@code i & 63} of {@code bits[i >>> 6]}, taken
 * at {@code startFs + i * periodFs} femtoseconds. Bits past {@code length} are ignored. Samples
 * that are unknown (an analyser's x/z, missing data) are marked in {@link #invalid()}. Receivers
 * never change the arrays; who may keep them is the ownership rule of {@link Block} (a lent block
 * is readable only until the receiver's {@code accept} returns).
 *
 * @param channel    channel name
 * @param firstIndex index of sample 0 within the whole capture
 * @param startFs    time of sample 0, femtoseconds
 * @param periodFs   sample period, femtoseconds
 * @param bits       packed samples
 * @param length     number of samples
 * @param invalid    bitset of unknown samples, or null if all are known
 */
public record LogicBlock(String channel, long firstIndex, long startFs, double periodFs, long[] bits, int length,
                         long[] invalid) implements Block {

    /**
     * Checks the invariants.
     *
     * @param channel channel name
     * @param firstIndex index of sample 0 within the whole capture
     * @param startFs time of sample 0, femtoseconds
     * @param periodFs sample period, femtoseconds
     * @param bits packed samples
     * @param length number of samples
     * @param invalid bitset of unknown samples, or null if all are known
     */
    public LogicBlock {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(bits, "bits");
        if (!(periodFs > 0) || !Double.isFinite(periodFs)) {
            throw new IllegalArgumentException("logic block '" + channel + "': sample period must be positive, got " + periodFs + " fs");
        }
        if (length < 0 || BitSets.words(length) > bits.length) {
            throw new IllegalArgumentException("logic block '" + channel + "': " + bits.length + " words cannot hold " + length + " samples");
        }
        if (invalid != null && invalid.length < BitSets.words(length)) {
            throw new IllegalArgumentException("logic block '" + channel + "': validity mask too short for " + length + " samples");
        }
    }

    /**
     * Sample {@code i}.
     *
     * @param i sample index within the block
     * @return the level
     */
    public boolean get(int i) {
        return (bits[i >>> 6] & (1L << i)) != 0;
    }

    /**
     * Time of sample {@code i}.
     *
     * @param i sample index
     * @return femtoseconds
     */
    public long timeFs(int i) {
        return startFs + Math.round(i * periodFs);
    }

    @Override
    public long endFs() {
        return startFs + Math.round(length * periodFs);
    }

    @Override
    public DataKind kind() {
        return DataKind.LOGIC;
    }

    @Override
    public String toString() {
        return "LogicBlock[" + channel + ", " + length + " samples from index " + firstIndex + "]";
    }
}
