package org.lanesift.data;

import java.util.Objects;

/**
 * Words assembled from bits: value, the time span each word occupied on the wire, the lane it came
 * from and per-word flags.
 *
 * @param channel    stream name
 * @param startFs    start of the covered span
 * @param endFs      end of the covered span, exclusive
 * @param count      number of words
 * @param widthBits  bits per word, 1 to 64
 * @param values     word values, least significant bit first on the wire unless the producer says otherwise
 * @param wordStartFs time of each word's first bit
 * @param wordEndFs  time just after each word's last bit
 * @param lane       lane of each word (0 for single-lane streams)
 * @param flags      per-word flags: bit 0 {@link #FLAG_SUSPECT}, bit 1 {@link #FLAG_GAP_BEFORE}
 */
public record WordStream(String channel, long startFs, long endFs, int count, int widthBits, long[] values,
                         long[] wordStartFs, long[] wordEndFs, int[] lane, byte[] flags) implements Block {

    /** A bit of this word had a margin below threshold or was unknown. */
    public static final byte FLAG_SUSPECT = 1;
    /** The stream was interrupted (gap, lost lock) just before this word. */
    public static final byte FLAG_GAP_BEFORE = 2;

    /**
     * Checks array sizes and width.
     *
     * @param channel stream name
     * @param startFs start of the covered span
     * @param endFs end of the covered span, exclusive
     * @param count number of words
     * @param widthBits bits per word, 1 to 64
     * @param values word values, least significant bit first on the wire unless the producer says otherwise
     * @param wordStartFs time of each word's first bit
     * @param wordEndFs time just after each word's last bit
     * @param lane lane of each word (0 for single-lane streams)
     * @param flags per-word flags: bit 0 {@link #FLAG_SUSPECT}, bit 1 {@link #FLAG_GAP_BEFORE}
     */
    public WordStream {
        Objects.requireNonNull(channel, "channel");
        if (widthBits < 1 || widthBits > 64) {
            throw new IllegalArgumentException("word stream '" + channel + "': width " + widthBits + " outside 1..64 bits");
        }
        if (count < 0 || values.length < count || wordStartFs.length < count || wordEndFs.length < count
                || lane.length < count || flags.length < count) {
            throw new IllegalArgumentException("word stream '" + channel + "': arrays do not hold " + count + " words");
        }
    }

    @Override
    public DataKind kind() {
        return DataKind.WORDS;
    }

    @Override
    public String toString() {
        return "WordStream[" + channel + ", " + count + " words of " + widthBits + " bits]";
    }
}
