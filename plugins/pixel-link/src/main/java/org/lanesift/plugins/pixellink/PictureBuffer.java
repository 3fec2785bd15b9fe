package org.lanesift.plugins.pixellink;

import java.util.Arrays;

/**
 * The picture of the frame being assembled: rows of {@code 0xRRGGBB} pixels, all as wide as the
 * frame's first line. A shorter line is padded with black, a longer one cut. The buffer grows by
 * doubling, never beyond {@code maxHeight} rows of the frame's width.
 */
final class PictureBuffer {
    private final int maxHeight;
    private int[] buf = new int[0];
    private int rows;
    private int width = -1;

    /** @param maxHeight most rows a frame may have */
    PictureBuffer(int maxHeight) {
        this.maxHeight = maxHeight;
    }

    /** Empties the picture for a new frame; the width is learned again. */
    void reset() {
        rows = 0;
        width = -1;
    }

    /** Width in pixels, or -1 before the first line. */
    int width() {
        return width;
    }

    /** Sets the width, in pixels, from the frame's first line. */
    void width(int pixels) {
        width = pixels;
    }

    /** Rows so far. */
    int rows() {
        return rows;
    }

    /**
     * Appends one row.
     *
     * @param line pixels of the line; entries past its length are not read
     * @param len  pixels the line had (may exceed {@code line.length} when it was cut on arrival)
     */
    void appendRow(int[] line, int len) {
        long need = (long) (rows + 1) * width;
        if (need > buf.length) {
            buf = Arrays.copyOf(buf, (int) Math.min(Math.max(need, 2L * buf.length), (long) maxHeight * width));
        }
        int off = rows * width;
        int copy = Math.min(len, width);
        System.arraycopy(line, 0, buf, off, Math.min(copy, line.length));
        if (copy < width) {
            Arrays.fill(buf, off + copy, off + width, 0);
        }
        rows++;
    }

    /** A copy of the rows so far, row-major. */
    int[] pixels() {
        return Arrays.copyOf(buf, rows * width);
    }

    /**
     * Removes the rows from {@code row} on and returns them.
     *
     * @param row first row removed, at most {@link #rows()}
     * @return the removed rows, row-major
     */
    int[] cutFrom(int row) {
        int[] tail = Arrays.copyOfRange(buf, row * width, rows * width);
        rows = row;
        return tail;
    }

    /**
     * Starts the picture with rows already assembled (the tail {@link #cutFrom} removed).
     *
     * @param pixelsWide width, pixels
     * @param tail       rows, row-major
     * @param tailRows   number of rows in {@code tail}
     */
    void refill(int pixelsWide, int[] tail, int tailRows) {
        width = pixelsWide;
        if (buf.length < tail.length) {
            buf = new int[tail.length];
        }
        System.arraycopy(tail, 0, buf, 0, tail.length);
        rows = tailRows;
    }
}
