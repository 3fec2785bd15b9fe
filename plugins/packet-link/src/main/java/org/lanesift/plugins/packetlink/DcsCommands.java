package org.lanesift.plugins.packetlink;

import java.util.Locale;

/**
 * Names of the display command set (MIPI DCS specification, from memory) and readable decoding of
 * the parameters of the commands the decoder understands. Every other command is kept raw with
 * its parameters.
 */
final class DcsCommands {
    static final int NOP = 0x00;
    static final int SOFT_RESET = 0x01;
    static final int ENTER_SLEEP = 0x10;
    static final int EXIT_SLEEP = 0x11;
    static final int DISPLAY_OFF = 0x28;
    static final int DISPLAY_ON = 0x29;
    static final int COLUMN_ADDRESS = 0x2A;
    static final int PAGE_ADDRESS = 0x2B;
    static final int MEMORY_WRITE = 0x2C;
    static final int TEAR_OFF = 0x34;
    static final int TEAR_ON = 0x35;
    static final int ADDRESS_MODE = 0x36;
    static final int PIXEL_FORMAT = 0x3A;
    static final int MEMORY_WRITE_CONTINUE = 0x3C;
    static final int TEAR_SCANLINE = 0x44;

    private static final String[] NAMES = new String[256];

    static {
        NAMES[NOP] = "nop";
        NAMES[SOFT_RESET] = "soft_reset";
        NAMES[0x0A] = "get_power_mode";
        NAMES[0x0B] = "get_address_mode";
        NAMES[0x0C] = "get_pixel_format";
        NAMES[ENTER_SLEEP] = "enter_sleep_mode";
        NAMES[EXIT_SLEEP] = "exit_sleep_mode";
        NAMES[0x12] = "enter_partial_mode";
        NAMES[0x13] = "enter_normal_mode";
        NAMES[0x20] = "exit_invert_mode";
        NAMES[0x21] = "enter_invert_mode";
        NAMES[0x26] = "set_gamma_curve";
        NAMES[DISPLAY_OFF] = "set_display_off";
        NAMES[DISPLAY_ON] = "set_display_on";
        NAMES[COLUMN_ADDRESS] = "set_column_address";
        NAMES[PAGE_ADDRESS] = "set_page_address";
        NAMES[MEMORY_WRITE] = "write_memory_start";
        NAMES[0x2E] = "read_memory_start";
        NAMES[0x30] = "set_partial_rows";
        NAMES[0x33] = "set_scroll_area";
        NAMES[TEAR_OFF] = "set_tear_off";
        NAMES[TEAR_ON] = "set_tear_on";
        NAMES[ADDRESS_MODE] = "set_address_mode";
        NAMES[0x37] = "set_scroll_start";
        NAMES[0x38] = "exit_idle_mode";
        NAMES[0x39] = "enter_idle_mode";
        NAMES[PIXEL_FORMAT] = "set_pixel_format";
        NAMES[MEMORY_WRITE_CONTINUE] = "write_memory_continue";
        NAMES[TEAR_SCANLINE] = "set_tear_scanline";
        NAMES[0x51] = "set_display_brightness";
        NAMES[0x53] = "write_control_display";
    }

    private DcsCommands() {
    }

    /**
     * The standard name, or {@code "raw-0xNN"} for a command outside the set we name.
     *
     * @param cmd command byte
     * @return the name
     */
    static String name(int cmd) {
        String n = NAMES[cmd & 0xFF];
        return n != null ? n : String.format(Locale.ROOT, "raw-0x%02X", cmd & 0xFF);
    }

    static boolean isMemoryWrite(int cmd) {
        return cmd == MEMORY_WRITE || cmd == MEMORY_WRITE_CONTINUE;
    }

    /**
     * Bits per pixel of a {@code set_pixel_format} parameter's DBI field (bits 2:0): 0b101 = 16,
     * 0b110 = 18, 0b111 = 24 (MIPI DCS, from memory).
     *
     * @param param the parameter byte
     * @return 16, 18, 24, or 0 when not one of those
     */
    static int bitsPerPixel(int param) {
        return switch (param & 7) {
            case 5 -> 16;
            case 6 -> 18;
            case 7 -> 24;
            default -> 0;
        };
    }

    /**
     * A readable meaning of a command's parameters, or "" when the command is kept raw.
     *
     * @param cmd command byte
     * @param p   parameter bytes
     * @param off first parameter
     * @param n   parameter count
     * @return text such as {@code "columns 0..319"}
     */
    static String describe(int cmd, byte[] p, int off, int n) {
        switch (cmd) {
            case COLUMN_ADDRESS, PAGE_ADDRESS -> {
                if (n < 4) {
                    return "expected 4 parameters, got " + n;
                }
                int s = (p[off] & 0xFF) << 8 | (p[off + 1] & 0xFF);
                int e = (p[off + 2] & 0xFF) << 8 | (p[off + 3] & 0xFF);
                return (cmd == COLUMN_ADDRESS ? "columns " : "rows ") + s + ".." + e;
            }
            case PIXEL_FORMAT -> {
                if (n < 1) {
                    return "expected 1 parameter";
                }
                int v = p[off] & 0xFF;
                return "interface " + bitsName(v >> 4 & 7) + ", memory " + bitsName(v & 7);
            }
            case ADDRESS_MODE -> {
                if (n < 1) {
                    return "expected 1 parameter";
                }
                int v = p[off] & 0xFF;
                StringBuilder sb = new StringBuilder();
                flag(sb, v, 7, "rows bottom-to-top");
                flag(sb, v, 6, "columns right-to-left");
                flag(sb, v, 5, "rows/columns exchanged");
                flag(sb, v, 4, "refresh bottom-to-top");
                flag(sb, v, 3, "BGR");
                flag(sb, v, 2, "latch right-to-left");
                flag(sb, v, 1, "flip horizontal");
                flag(sb, v, 0, "flip vertical");
                return sb.length() == 0 ? "default orientation, RGB" : sb.toString();
            }
            case TEAR_ON -> {
                if (n < 1) {
                    return "tearing effect on";
                }
                return (p[off] & 1) == 0 ? "tearing effect on, vertical blanking only" : "tearing effect on, vertical and horizontal blanking";
            }
            case TEAR_OFF -> {
                return "tearing effect off";
            }
            case TEAR_SCANLINE -> {
                if (n < 2) {
                    return "expected 2 parameters";
                }
                return "tear at line " + ((p[off] & 0xFF) << 8 | (p[off + 1] & 0xFF));
            }
            case ENTER_SLEEP -> {
                return "sleep in";
            }
            case EXIT_SLEEP -> {
                return "sleep out";
            }
            case DISPLAY_ON -> {
                return "display on";
            }
            case DISPLAY_OFF -> {
                return "display off";
            }
            case MEMORY_WRITE, MEMORY_WRITE_CONTINUE -> {
                return n + " bytes of pixel data";
            }
            default -> {
                return "";
            }
        }
    }

    private static String bitsName(int f) {
        int b = bitsPerPixel(f);
        return b == 0 ? "code " + f : b + "-bit";
    }

    private static void flag(StringBuilder sb, int v, int bit, String text) {
        if ((v >> bit & 1) != 0) {
            if (sb.length() > 0) {
                sb.append(", ");
            }
            sb.append(text);
        }
    }
}
