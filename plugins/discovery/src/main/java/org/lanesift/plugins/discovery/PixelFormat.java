package org.lanesift.plugins.discovery;

/**
 * Candidate pixel formats. Pixels are cut from the data words read as one bit stream, each
 * word's value most significant bit first, each pixel most significant bit first. In the
 * {@code rgb} formats red comes first, in their {@code bgr} twins blue (red and blue swapped). A
 * byte-swapped 16-bit pixel sends its low byte first (a little-endian 16-bit value sent byte by
 * byte; common practice). Loosely packed 18-bit colour puts each 6-bit component in the top of
 * its own byte (MIPI DSI loosely packed pixel stream, from memory).
 */
enum PixelFormat {
    RGB565("rgb565", Layout.P565, false, false),
    BGR565("bgr565", Layout.P565, true, false),
    RGB565_BYTE_SWAPPED("rgb565-byte-swapped", Layout.P565, false, true),
    BGR565_BYTE_SWAPPED("bgr565-byte-swapped", Layout.P565, true, true),
    RGB666("rgb666", Layout.P666, false, false),
    BGR666("bgr666", Layout.P666, true, false),
    RGB666_LOOSE("rgb666-loose", Layout.P666_LOOSE, false, false),
    BGR666_LOOSE("bgr666-loose", Layout.P666_LOOSE, true, false),
    RGB888("rgb888", Layout.P888, false, false),
    BGR888("bgr888", Layout.P888, true, false);

    /** Where the three components sit in a raw pixel: shift and depth of the first, green and last. */
    enum Layout {
        P565(16, 11, 5, 5, 6, 0, 5),
        P666(18, 12, 6, 6, 6, 0, 6),
        P666_LOOSE(24, 18, 6, 10, 6, 2, 6),
        P888(24, 16, 8, 8, 8, 0, 8);

        final int bits;
        final int firstShift;
        final int firstDepth;
        final int greenShift;
        final int greenDepth;
        final int lastShift;
        final int lastDepth;

        Layout(int bits, int firstShift, int firstDepth, int greenShift, int greenDepth, int lastShift, int lastDepth) {
            this.bits = bits;
            this.firstShift = firstShift;
            this.firstDepth = firstDepth;
            this.greenShift = greenShift;
            this.greenDepth = greenDepth;
            this.lastShift = lastShift;
            this.lastDepth = lastDepth;
        }
    }

    final String label;
    final Layout layout;
    final int bitsPerPixel;
    /** Blue first: the twin of the red-first format with the same bits. */
    final boolean blueFirst;
    /** The two bytes of a 16-bit pixel are sent low byte first. */
    final boolean byteSwapped;

    PixelFormat(String label, Layout layout, boolean blueFirst, boolean byteSwapped) {
        this.label = label;
        this.layout = layout;
        this.bitsPerPixel = layout.bits;
        this.blueFirst = blueFirst;
        this.byteSwapped = byteSwapped;
    }

    /** The format with red and blue swapped. */
    PixelFormat twin() {
        return switch (this) {
            case RGB565 -> BGR565;
            case BGR565 -> RGB565;
            case RGB565_BYTE_SWAPPED -> BGR565_BYTE_SWAPPED;
            case BGR565_BYTE_SWAPPED -> RGB565_BYTE_SWAPPED;
            case RGB666 -> BGR666;
            case BGR666 -> RGB666;
            case RGB666_LOOSE -> BGR666_LOOSE;
            case BGR666_LOOSE -> RGB666_LOOSE;
            case RGB888 -> BGR888;
            default -> RGB888;
        };
    }

    /** Packs the raw pixel value into 0xRRGGBB, each component scaled to 8 bits. */
    int rgb(long v) {
        if (byteSwapped) {
            v = (v & 0xFF) << 8 | (v >>> 8 & 0xFF);
        }
        Layout l = layout;
        int first = scale((int) (v >>> l.firstShift) & ((1 << l.firstDepth) - 1), l.firstDepth);
        int g = scale((int) (v >>> l.greenShift) & ((1 << l.greenDepth) - 1), l.greenDepth);
        int last = scale((int) (v >>> l.lastShift) & ((1 << l.lastDepth) - 1), l.lastDepth);
        return blueFirst ? last << 16 | g << 8 | first : first << 16 | g << 8 | last;
    }

    /** The raw value of a colour whose components are already at this format's depth (for the test generator). */
    long raw(int r, int g, int b) {
        long first = blueFirst ? b : r;
        long last = blueFirst ? r : b;
        long v = first << layout.firstShift | (long) g << layout.greenShift | last << layout.lastShift;
        return byteSwapped ? (v & 0xFF) << 8 | (v >>> 8 & 0xFF) : v;
    }

    /** Bits per component: red, green, blue. */
    int[] depths() {
        return new int[] {layout.firstDepth, layout.greenDepth, layout.lastDepth};
    }

    /** Bits of a raw pixel that carry no colour in this format (the padding of loosely packed 18-bit colour), 0 when none. */
    long paddingMask() {
        return layout == Layout.P666_LOOSE ? 0x030303L : 0;
    }

    private static int scale(int v, int bits) {
        return bits == 8 ? v : (v << (8 - bits)) | (v >>> (2 * bits - 8));
    }
}
