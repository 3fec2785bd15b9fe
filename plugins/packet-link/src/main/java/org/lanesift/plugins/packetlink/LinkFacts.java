package org.lanesift.plugins.packetlink;

/**
 * The link configuration a capture shows, for the init-sequence header: lanes, the high-speed
 * bit rate per lane (Hz, from the mean byte time of every high-speed byte: 8 unit intervals), the
 * pixel format in bits per pixel (the last set_pixel_format, or the data type of video-mode pixel
 * packets) and whether frames came in video or command mode.
 */
final class LinkFacts {
    final int lanes;
    private long hsBytes;
    private double hsByteFsSum;
    /** Bits per pixel, 0 while not seen. */
    int pixelBits;
    boolean videoPackets;
    boolean memoryWrites;

    LinkFacts(int lanes) {
        this.lanes = lanes;
    }

    /** High-speed bytes of one burst (per-byte start and end times, femtoseconds). */
    void hsBytes(long[] startFs, long[] endFs, int n) {
        for (int i = 0; i < n; i++) {
            long d = endFs[i] - startFs[i];
            if (d > 0) {
                hsByteFsSum += d;
                hsBytes++;
            }
        }
    }

    /** Bit rate per lane in Hz, NaN when no high-speed byte was seen. */
    double hsBitRateHz() {
        return hsBytes == 0 ? Double.NaN : 8e15 * hsBytes / hsByteFsSum;
    }

    /** A pixel packet's data type. */
    void pixelType(int dt) {
        videoPackets = true;
        pixelBits = switch (dt & 0x3F) {
            case DataTypes.PIXELS_16 -> 16;
            case DataTypes.PIXELS_18, DataTypes.PIXELS_18_LOOSE -> 18;
            default -> 24;
        };
    }

    /** "video", "command" or "none" (no frames seen). */
    String frameMode() {
        return videoPackets ? "video" : memoryWrites ? "command" : "none";
    }
}
