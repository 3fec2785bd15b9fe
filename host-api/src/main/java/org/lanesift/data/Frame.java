package org.lanesift.data;

import java.util.Objects;

/**
 * A decoded picture: {@code width x height} pixels as packed {@code 0xRRGGBB} values, row-major,
 * top row first.
 *
 * @param channel  source name (the decoder instance)
 * @param startFs  time of the frame's first pixel
 * @param endFs    time just after its last pixel
 * @param index    frame number in the capture, from 0
 * @param width    pixels per line
 * @param height   lines
 * @param rgb      {@code width * height} packed colours
 * @param partial  true if the capture began or ended inside this frame
 * @param suspect  true if any bit of it was flagged by the sampler
 */
public record Frame(String channel, long startFs, long endFs, long index, int width, int height, int[] rgb,
                    boolean partial, boolean suspect) implements Block {

    /**
     * Checks the dimensions.
     *
     * @param channel source name (the decoder instance)
     * @param startFs time of the frame's first pixel
     * @param endFs time just after its last pixel
     * @param index frame number in the capture, from 0
     * @param width pixels per line
     * @param height lines
     * @param rgb {@code width * height} packed colours
     * @param partial true if the capture began or ended inside this frame
     * @param suspect true if any bit of it was flagged by the sampler
     */
    public Frame {
        Objects.requireNonNull(channel, "channel");
        if (width < 0 || height < 0 || (long) width * height != rgb.length) {
            throw new IllegalArgumentException("frame " + index + " of '" + channel + "': " + rgb.length
                    + " pixels do not make " + width + " x " + height);
        }
    }

    @Override
    public DataKind kind() {
        return DataKind.FRAME;
    }

    @Override
    public String toString() {
        return "Frame[" + channel + " #" + index + ", " + width + "x" + height + (partial ? ", partial" : "")
                + (suspect ? ", suspect" : "") + "]";
    }
}
