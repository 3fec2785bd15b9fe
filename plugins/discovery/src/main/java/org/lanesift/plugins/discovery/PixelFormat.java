package org.lanesift.plugins.discovery;

/**
 * Candidate pixel formats. Pixels are cut from the data words read as one bit stream, each
 * word's value most significant bit first, each pixel most significant bit first (red first).
 * Loosely packed 18-bit colour puts each 6-bit component in the top of its own byte (MIPI DSI
 * loosely packed pixel stream, from memory).
 */
enum PixelFormat {
    RGB565("rgb565", 16),
    RGB666("rgb666", 18),
    RGB666_LOOSE("rgb666-loose", 24),
    RGB888("rgb888", 24);

    final String label;
    final int bitsPerPixel;

    PixelFormat(String label, int bitsPerPixel) {
        this.label = label;
        this.bitsPerPixel = bitsPerPixel;
    }

    /** Packs the raw pixel value into 0xRRGGBB, each component scaled to 8 bits. */
    int rgb(long v) {
        int r;
        int g;
        int b;
        switch (this) {
            case RGB565 -> {
                r = scale((int) (v >>> 11) & 31, 5);
                g = scale((int) (v >>> 5) & 63, 6);
                b = scale((int) v & 31, 5);
            }
            case RGB666 -> {
                r = scale((int) (v >>> 12) & 63, 6);
                g = scale((int) (v >>> 6) & 63, 6);
                b = scale((int) v & 63, 6);
            }
            case RGB666_LOOSE -> {
                r = scale((int) (v >>> 18) & 63, 6);
                g = scale((int) (v >>> 10) & 63, 6);
                b = scale((int) (v >>> 2) & 63, 6);
            }
            default -> {
                r = (int) (v >>> 16) & 255;
                g = (int) (v >>> 8) & 255;
                b = (int) v & 255;
            }
        }
        return r << 16 | g << 8 | b;
    }

    /** The raw value of a 0xRRGGBB colour whose components are already at this format's depth (for the test generator). */
    long raw(int r, int g, int b) {
        return switch (this) {
            case RGB565 -> (long) r << 11 | (long) g << 5 | b;
            case RGB666 -> (long) r << 12 | (long) g << 6 | b;
            case RGB666_LOOSE -> (long) r << 18 | (long) g << 10 | (long) b << 2;
            default -> (long) r << 16 | (long) g << 8 | b;
        };
    }

    /** Bits per component: red, green, blue. */
    int[] depths() {
        return switch (this) {
            case RGB565 -> new int[] {5, 6, 5};
            case RGB888 -> new int[] {8, 8, 8};
            default -> new int[] {6, 6, 6};
        };
    }

    private static int scale(int v, int bits) {
        return (v << (8 - bits)) | (v >>> (2 * bits - 8));
    }
}
