package org.lanesift.data;

import java.util.Objects;

/**
 * A contiguous run of one analog channel's samples in volts, uniformly spaced.
 *
 * <p>Sample {@code i} (0 &le; i &lt; {@link #length()}) was taken at
 * {@code startFs + i * periodFs} femtoseconds and reads {@code volts[i]} volts. Samples the
 * instrument clipped or did not deliver are marked in the optional {@link #invalid()} bitset
 * ({@link BitSets} layout); their values must not be trusted. Receivers never change the arrays.
 * Who may keep them, and when a source may recycle them, is the ownership rule of {@link Block}:
 * a block is the receivers' to keep unless the engine let its source lend it
 * ({@link org.lanesift.plugin.StageContext#mayLend(int)}), and then it is readable only until the
 * receiver's {@code accept} returns.
 *
 * @param channel    channel name
 * @param firstIndex index of sample 0 within the whole capture
 * @param startFs    time of sample 0, femtoseconds
 * @param periodFs   sample period, femtoseconds
 * @param volts      sample values in volts; at least {@code length} long
 * @param length     number of valid entries in {@code volts}
 * @param invalid    bitset of invalid samples, or null if all are valid
 */
public record AnalogBlock(String channel, long firstIndex, long startFs, double periodFs, float[] volts, int length,
                          long[] invalid) implements Block {

    /**
     * Checks the invariants.
     *
     * @param channel channel name
     * @param firstIndex index of sample 0 within the whole capture
     * @param startFs time of sample 0, femtoseconds
     * @param periodFs sample period, femtoseconds
     * @param volts sample values in volts; at least {@code length} long
     * @param length number of valid entries in {@code volts}
     * @param invalid bitset of invalid samples, or null if all are valid
     */
    public AnalogBlock {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(volts, "volts");
        if (!(periodFs > 0) || !Double.isFinite(periodFs)) {
            throw new IllegalArgumentException("analog block '" + channel + "': sample period must be positive, got " + periodFs + " fs");
        }
        if (length < 0 || length > volts.length) {
            throw new IllegalArgumentException("analog block '" + channel + "': length " + length + " outside 0.." + volts.length);
        }
        if (invalid != null && invalid.length < BitSets.words(length)) {
            throw new IllegalArgumentException("analog block '" + channel + "': validity mask too short for " + length + " samples");
        }
    }

    /**
     * A block of raw ADC codes converted to volts as {@code volts = code * gain + offset}.
     *
     * @param channel    channel name
     * @param firstIndex index of the first sample in the capture
     * @param startFs    time of the first sample
     * @param periodFs   sample period
     * @param codes      raw codes
     * @param length     number of codes to use
     * @param gainVolts  volts per code
     * @param offsetVolts volts at code 0
     * @param clipLow    codes at or below this are marked invalid (clipped)
     * @param clipHigh   codes at or above this are marked invalid (clipped)
     * @return the converted block
     */
    public static AnalogBlock fromCodes(String channel, long firstIndex, long startFs, double periodFs, short[] codes, int length,
                                        double gainVolts, double offsetVolts, int clipLow, int clipHigh) {
        float[] v = new float[length];
        long[] inv = null;
        for (int i = 0; i < length; i++) {
            int c = codes[i];
            v[i] = (float) (c * gainVolts + offsetVolts);
            if (c <= clipLow || c >= clipHigh) {
                if (inv == null) {
                    inv = new long[BitSets.words(length)];
                }
                inv[i >>> 6] |= 1L << i;
            }
        }
        return new AnalogBlock(channel, firstIndex, startFs, periodFs, v, length, inv);
    }

    /**
     * Wraps an array whose every sample is valid.
     *
     * @param channel  channel name
     * @param startFs  time of the first sample
     * @param periodFs sample period
     * @param volts    the samples, all used
     * @return the block, starting at capture index 0
     */
    public static AnalogBlock of(String channel, long startFs, double periodFs, float[] volts) {
        return new AnalogBlock(channel, 0, startFs, periodFs, volts, volts.length, null);
    }

    /**
     * Time of sample {@code i}.
     *
     * @param i sample index within the block
     * @return femtoseconds
     */
    public long timeFs(int i) {
        return startFs + Math.round(i * periodFs);
    }

    /**
     * Whether sample {@code i} is valid.
     *
     * @param i sample index within the block
     * @return false if clipped or missing
     */
    public boolean isValid(int i) {
        return invalid == null || (invalid[i >>> 6] & (1L << i)) == 0;
    }

    @Override
    public long endFs() {
        return startFs + Math.round(length * periodFs);
    }

    @Override
    public DataKind kind() {
        return DataKind.ANALOG;
    }

    @Override
    public String toString() {
        return "AnalogBlock[" + channel + ", " + length + " samples from index " + firstIndex + "]";
    }
}
