package org.lanesift.plugins.packetlink;

/**
 * Names and lengths of packet data types, host-to-peripheral direction: the standard names of the
 * MIPI DSI specification (from memory), lower case with hyphens. Unknown or reserved types are kept raw under the name {@code "reserved-0xNN"}.
 */
final class DataTypes {
    static final int VSYNC_START = 0x01;
    static final int VSYNC_END = 0x11;
    static final int HSYNC_START = 0x21;
    static final int HSYNC_END = 0x31;
    static final int EOT = 0x08;
    static final int COLOR_MODE_OFF = 0x02;
    static final int COLOR_MODE_ON = 0x12;
    static final int SHUTDOWN = 0x22;
    static final int TURN_ON = 0x32;
    static final int GENERIC_SHORT_WRITE_0 = 0x03;
    static final int GENERIC_SHORT_WRITE_1 = 0x13;
    static final int GENERIC_SHORT_WRITE_2 = 0x23;
    static final int GENERIC_READ_0 = 0x04;
    static final int GENERIC_READ_1 = 0x14;
    static final int GENERIC_READ_2 = 0x24;
    static final int DCS_SHORT_WRITE_0 = 0x05;
    static final int DCS_SHORT_WRITE_1 = 0x15;
    static final int DCS_READ = 0x06;
    static final int SET_MAX_RETURN = 0x37;
    static final int NULL_PACKET = 0x09;
    static final int BLANKING = 0x19;
    static final int GENERIC_LONG_WRITE = 0x29;
    static final int DCS_LONG_WRITE = 0x39;
    static final int PIXELS_16 = 0x0E;
    static final int PIXELS_18 = 0x1E;
    static final int PIXELS_18_LOOSE = 0x2E;
    static final int PIXELS_24 = 0x3E;

    private static final String[] NAMES = new String[64];
    private static final boolean[] LONG = new boolean[64];

    static {
        name(VSYNC_START, "vsync-start");
        name(VSYNC_END, "vsync-end");
        name(HSYNC_START, "hsync-start");
        name(HSYNC_END, "hsync-end");
        name(EOT, "end-of-transmission-packet");
        name(COLOR_MODE_OFF, "color-mode-off");
        name(COLOR_MODE_ON, "color-mode-on");
        name(SHUTDOWN, "shutdown-peripheral");
        name(TURN_ON, "turn-on-peripheral");
        name(GENERIC_SHORT_WRITE_0, "generic-short-write-0");
        name(GENERIC_SHORT_WRITE_1, "generic-short-write-1");
        name(GENERIC_SHORT_WRITE_2, "generic-short-write-2");
        name(GENERIC_READ_0, "generic-read-0");
        name(GENERIC_READ_1, "generic-read-1");
        name(GENERIC_READ_2, "generic-read-2");
        name(DCS_SHORT_WRITE_0, "dcs-short-write-0");
        name(DCS_SHORT_WRITE_1, "dcs-short-write-1");
        name(DCS_READ, "dcs-read");
        name(SET_MAX_RETURN, "set-maximum-return-packet-size");
        name(0x07, "compression-mode");
        name(NULL_PACKET, "null-packet");
        name(BLANKING, "blanking-packet");
        name(GENERIC_LONG_WRITE, "generic-long-write");
        name(DCS_LONG_WRITE, "dcs-long-write");
        name(0x0A, "picture-parameter-set");
        name(0x0B, "compressed-pixel-stream");
        name(0x0C, "loosely-packed-pixel-stream-ycbcr-20");
        name(0x1C, "packed-pixel-stream-ycbcr-24");
        name(0x2C, "packed-pixel-stream-ycbcr-16");
        name(0x0D, "packed-pixel-stream-rgb-30");
        name(0x1D, "packed-pixel-stream-rgb-36");
        name(0x3D, "packed-pixel-stream-ycbcr-12");
        name(PIXELS_16, "packed-pixel-stream-rgb565");
        name(PIXELS_18, "packed-pixel-stream-rgb666");
        name(PIXELS_18_LOOSE, "loosely-packed-pixel-stream-rgb666");
        name(PIXELS_24, "packed-pixel-stream-rgb888");
        // Long packets have a data type whose low nibble is 0x9..0xF (all long types listed above do;
        // every short type has 0x0..0x8). Reserved types follow the same rule so that their length is
        // still taken from the header.
        for (int dt = 0; dt < 64; dt++) {
            LONG[dt] = (dt & 0x0F) >= 0x09;
        }
    }

    private static void name(int dt, String n) {
        NAMES[dt] = n;
    }

    private DataTypes() {
    }

    static boolean isLong(int dt) {
        return LONG[dt & 0x3F];
    }

    static boolean isKnown(int dt) {
        return NAMES[dt & 0x3F] != null;
    }

    static String name(int dt) {
        String n = NAMES[dt & 0x3F];
        return n != null ? n : String.format("reserved-0x%02X", dt & 0x3F);
    }

    /** Whether a packet of this type carries a command (write, read or peripheral control). */
    static boolean isCommand(int dt) {
        return switch (dt & 0x3F) {
            case GENERIC_SHORT_WRITE_0, GENERIC_SHORT_WRITE_1, GENERIC_SHORT_WRITE_2, GENERIC_READ_0, GENERIC_READ_1,
                 GENERIC_READ_2, DCS_SHORT_WRITE_0, DCS_SHORT_WRITE_1, DCS_READ, SET_MAX_RETURN, GENERIC_LONG_WRITE,
                 DCS_LONG_WRITE, COLOR_MODE_OFF, COLOR_MODE_ON, SHUTDOWN, TURN_ON -> true;
            default -> false;
        };
    }

    static boolean isDcs(int dt) {
        int d = dt & 0x3F;
        return d == DCS_SHORT_WRITE_0 || d == DCS_SHORT_WRITE_1 || d == DCS_LONG_WRITE || d == DCS_READ;
    }

    static boolean isGenericWrite(int dt) {
        int d = dt & 0x3F;
        return d == GENERIC_SHORT_WRITE_0 || d == GENERIC_SHORT_WRITE_1 || d == GENERIC_SHORT_WRITE_2 || d == GENERIC_LONG_WRITE;
    }

    static boolean isPixels(int dt) {
        int d = dt & 0x3F;
        return d == PIXELS_16 || d == PIXELS_18 || d == PIXELS_18_LOOSE || d == PIXELS_24;
    }
}
