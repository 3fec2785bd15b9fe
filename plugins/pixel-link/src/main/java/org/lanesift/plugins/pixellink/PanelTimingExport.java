package org.lanesift.plugins.pixellink;

import java.util.Locale;

/**
 * The measured video timing in the two forms a board or firmware takes directly: a devicetree
 * source with a {@code display-timings} node (property names and polarity conventions of the
 * open devicetree binding for display timings, from memory; docs/reference-facts.md
 * "Devicetree panel timing") and a C header with the same values as macros. Units: clock in Hz
 * (rounded to the nearest Hz), horizontal values in pixels, vertical values in lines; each value is
 * the most frequent one measured ({@code docs/timing-report.md}).
 *
 * <p>Written only when the active area and the pixel clock were measured. Without sync pulses
 * (a DE-only panel) the measured blanking is written as the back porch, with front porch and sync
 * length 0 and no sync polarity, and a comment says so.
 */
final class PanelTimingExport {
    private final Timing t;
    private final String id;

    PanelTimingExport(Timing t, String id) {
        this.t = t;
        this.id = id;
    }

    /** Whether enough was measured for a timing node. */
    boolean measured() {
        return t.hActive.count() > 0 && t.vActive.count() > 0 && Double.isFinite(t.pixelClockHz()) && t.pixelClockHz() > 0;
    }

    /** Pixel clock in whole Hz. */
    long clockHz() {
        return Math.round(t.pixelClockHz());
    }

    /** The values in output order: horizontal front porch, sync, back porch; vertical the same. */
    long[] porches() {
        long hf = t.hSyncPresent() ? typical(t.hFront) : 0;
        long hs = t.hSyncPresent() ? typical(t.hSync) : 0;
        long hb = t.hSyncPresent() ? typical(t.hBack) : typical(t.hDeLow);
        long vf = t.vSyncPresent() ? typical(t.vFront) : 0;
        long vs = t.vSyncPresent() ? typical(t.vSync) : 0;
        long vb = t.vSyncPresent() ? typical(t.vBack)
                : t.vTotal.count() > 0 ? t.vTotal.typical() - t.vActive.typical() : 0;
        return new long[] {hf, hs, hb, vf, vs, vb};
    }

    private static long typical(Stat s) {
        return s.count() == 0 ? 0 : s.typical();
    }

    private String notes(String prefix) {
        StringBuilder sb = new StringBuilder();
        sb.append(prefix).append("Measured by lanesift pixel-link, instance ").append(safe(id)).append(", mapping ")
                .append(safe(t.mapping)).append(t.dual ? ", dual link" : "").append(".\n");
        sb.append(prefix).append("Clock in Hz, horizontal values in pixels, vertical values in lines (most frequent value measured).\n");
        if (!t.hSyncPresent()) {
            sb.append(prefix).append("No HS pulses in the capture: the horizontal blanking is written as back porch, front porch and\n")
                    .append(prefix).append("sync length as 0 (fill in what the panel data sheet gives).\n");
        }
        if (!t.vSyncPresent()) {
            sb.append(prefix).append("No VS pulses in the capture: the vertical blanking is written as back porch, front porch and\n")
                    .append(prefix).append("sync length as 0 (fill in what the panel data sheet gives).\n");
        }
        if (varying()) {
            sb.append(prefix).append("Some values varied in the capture; see ").append(safe(id)).append("-timing.txt for the ranges.\n");
        }
        sb.append(prefix).append("pixelclk-active is not written: on a 7:1 link the parallel pixel clock exists only inside the\n")
                .append(prefix).append("receiver, so a capture of the link cannot show which edge samples the data (see the panel data sheet).\n");
        sb.append(prefix).append("Check these values against the panel data sheet before driving a panel with them.\n");
        return sb.toString();
    }

    private boolean varying() {
        for (Stat s : new Stat[] {t.hActive, t.hFront, t.hSync, t.hBack, t.vActive, t.vFront, t.vSync, t.vBack, t.hDeLow}) {
            if (s.count() > 0 && s.varying()) {
                return true;
            }
        }
        return t.clockPerLine.count() > 0 && t.clockPerLine.varying(t.clockTolerancePercent / 100);
    }

    /** Devicetree source (compiles with {@code dtc -I dts -O dtb}). */
    String dts() {
        String label = symbol(id).toLowerCase(Locale.ROOT) + "_timing";
        long[] p = porches();
        StringBuilder sb = new StringBuilder(1024);
        sb.append("/dts-v1/;\n\n/*\n").append(notes(" * ")).append(" */\n\n/ {\n\tdisplay-timings {\n")
                .append("\t\tnative-mode = <&").append(label).append(">;\n\n")
                .append("\t\t").append(label).append(": timing0 {\n");
        prop(sb, "clock-frequency", clockHz());
        prop(sb, "hactive", t.hActive.typical());
        prop(sb, "vactive", t.vActive.typical());
        prop(sb, "hfront-porch", p[0]);
        prop(sb, "hsync-len", p[1]);
        prop(sb, "hback-porch", p[2]);
        prop(sb, "vfront-porch", p[3]);
        prop(sb, "vsync-len", p[4]);
        prop(sb, "vback-porch", p[5]);
        if (t.hSyncPresent()) {
            prop(sb, "hsync-active", t.hsActive);
        }
        if (t.vSyncPresent()) {
            prop(sb, "vsync-active", t.vsActive);
        }
        // the slot mappings carry DE as active high (docs/reference-facts.md, pixel-link slot mappings)
        prop(sb, "de-active", 1);
        sb.append("\t\t};\n\t};\n};\n");
        return sb.toString();
    }

    private static void prop(StringBuilder sb, String name, long v) {
        sb.append("\t\t\t").append(name).append(" = <").append(v).append(">;\n");
    }

    /** C header with the same values as {@link #dts()}. */
    String cHeader() {
        String p = symbol(id).toUpperCase(Locale.ROOT) + "_";
        long[] q = porches();
        StringBuilder sb = new StringBuilder(1024);
        sb.append("/*\n").append(notes(" * ")).append(" * Polarity macros: 1 = active high, 0 = active low, -1 = no pulses in the capture.\n */\n")
                .append("#ifndef ").append(p).append("TIMING_H\n#define ").append(p).append("TIMING_H\n\n");
        define(sb, p + "PIXEL_CLOCK_HZ", clockHz() + "UL");
        define(sb, p + "H_ACTIVE", t.hActive.typical());
        define(sb, p + "H_FRONT_PORCH", q[0]);
        define(sb, p + "H_SYNC_LEN", q[1]);
        define(sb, p + "H_BACK_PORCH", q[2]);
        define(sb, p + "H_TOTAL", t.hActive.typical() + q[0] + q[1] + q[2]);
        define(sb, p + "V_ACTIVE", t.vActive.typical());
        define(sb, p + "V_FRONT_PORCH", q[3]);
        define(sb, p + "V_SYNC_LEN", q[4]);
        define(sb, p + "V_BACK_PORCH", q[5]);
        define(sb, p + "V_TOTAL", t.vActive.typical() + q[3] + q[4] + q[5]);
        define(sb, p + "HSYNC_ACTIVE", t.hSyncPresent() ? t.hsActive : -1);
        define(sb, p + "VSYNC_ACTIVE", t.vSyncPresent() ? t.vsActive : -1);
        define(sb, p + "DE_ACTIVE", 1);
        sb.append("\n#endif\n");
        return sb.toString();
    }

    private static void define(StringBuilder sb, String name, Object v) {
        String s = String.valueOf(v);
        sb.append("#define ").append(name).append(' ').append(s.startsWith("-") ? "(" + s + ")" : s).append('\n');
    }

    /** A C identifier (and devicetree label) from an instance id. */
    static String symbol(String id) {
        String s = id.replaceAll("[^A-Za-z0-9_]", "_");
        return s.isEmpty() || Character.isDigit(s.charAt(0)) ? "_" + s : s;
    }

    private static String safe(String s) {
        return s.replace("*/", "* /").replace("\n", " ");
    }
}
