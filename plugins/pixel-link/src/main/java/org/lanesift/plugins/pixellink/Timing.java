package org.lanesift.plugins.pixellink;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Everything measured about the video timing of one link, and its two report forms: JSON
 * ({@code docs/timing-report.md}) and plain text in the units a firmware author writes into a
 * timing table (pixel clock in Hz, horizontal values in pixels, vertical values in lines, refresh
 * in Hz).
 */
final class Timing {
    final Stat hActive = new Stat();
    final Stat hFront = new Stat();
    final Stat hSync = new Stat();
    final Stat hBack = new Stat();
    final Stat hTotal = new Stat();
    /** DE period (rise to rise) within a frame, pixels. */
    final Stat hDePeriod = new Stat();
    /** DE low time within a frame, pixels. */
    final Stat hDeLow = new Stat();
    final Stat vActive = new Stat();
    final Stat vFront = new Stat();
    final Stat vSync = new Stat();
    final Stat vBack = new Stat();
    final Stat vTotal = new Stat();
    /** VS leading edge after the HS leading edge of its line, pixels. */
    final Stat vSyncOffset = new Stat();
    /** Pixel clock measured per line, Hz. */
    final DStat clockPerLine = new DStat();
    /** Pixel clock measured per frame period, Hz. */
    final DStat clockPerFrame = new DStat();
    final DStat refresh = new DStat();
    double linkClockSumDtFs;
    long linkClockIntervals;
    int hsActive = -1;
    int vsActive = -1;
    long framesComplete;
    long framesPartial;
    long framesSuspect;
    long pixels;
    long clocks;
    final Map<String, Long> anomalies = new LinkedHashMap<>();
    final List<String> errors = new ArrayList<>();

    String mapping = "";
    boolean dual;
    boolean reverseSlots;
    int pixelsPerClock = 1;
    double clockTolerancePercent = 0.5;

    void anomaly(String kind) {
        anomalies.merge(kind, 1L, Long::sum);
    }

    /** Mean link clock from every gap-free pair of clock periods, Hz; NaN when unmeasured. */
    double linkClockHz() {
        return linkClockIntervals == 0 ? Double.NaN : 1e15 * linkClockIntervals / linkClockSumDtFs;
    }

    /** Pixels and time summed over every measured line period (DE rise to DE rise inside a frame). */
    long linePixels;
    long lineTimeFs;

    /**
     * Pixel clock, Hz: pixels over time summed over the line periods wholly inside the capture
     * (robust against irregular first and last clock periods of a capture); the mean clock period
     * of the bit streams when no line was measured.
     */
    double pixelClockHz() {
        if (linePixels > 0 && lineTimeFs > 0) {
            return 1e15 * linePixels / lineTimeFs;
        }
        return linkClockHz() * pixelsPerClock;
    }

    boolean hSyncPresent() {
        return hsActive >= 0;
    }

    boolean vSyncPresent() {
        return vsActive >= 0;
    }

    /** H total: from HS when present, else from the DE period. */
    Stat hTotalBest() {
        return hSyncPresent() && hTotal.count() > 0 ? hTotal : hDePeriod;
    }

    private static String pol(int active) {
        return active < 0 ? "not-present" : active == 1 ? "positive" : "negative";
    }

    // ---------------------------------------------------------------- JSON

    String toJson(String instance) {
        StringBuilder sb = new StringBuilder(2048);
        sb.append("{\n");
        kv(sb, 1, "format", MiniJson.quote("lanesift-pixel-timing/1")).append(",\n");
        kv(sb, 1, "instance", MiniJson.quote(instance)).append(",\n");
        kv(sb, 1, "mapping", MiniJson.quote(mapping)).append(",\n");
        kv(sb, 1, "dual", Boolean.toString(dual)).append(",\n");
        kv(sb, 1, "reverseSlots", Boolean.toString(reverseSlots)).append(",\n");
        kv(sb, 1, "pixelsPerClock", Integer.toString(pixelsPerClock)).append(",\n");
        kv(sb, 1, "clocks", Long.toString(clocks)).append(",\n");
        kv(sb, 1, "pixels", Long.toString(pixels)).append(",\n");
        sb.append("  \"frames\": {\"complete\": ").append(framesComplete).append(", \"partial\": ").append(framesPartial)
                .append(", \"suspect\": ").append(framesSuspect).append("},\n");
        double tol = clockTolerancePercent / 100;
        sb.append("  \"pixelClockHz\": ").append(freqJson(pixelClockHz(), clockPerLine, tol)).append(",\n");
        sb.append("  \"linkClockHz\": ").append(num(pixelClockHz() / pixelsPerClock)).append(",\n");
        sb.append("  \"refreshHz\": ").append(freqJson(refresh.mean(), refresh, tol)).append(",\n");
        sb.append("  \"horizontal\": {\n");
        kv(sb, 2, "unit", "\"pixels\"").append(",\n");
        kv(sb, 2, "syncPresent", Boolean.toString(hSyncPresent())).append(",\n");
        kv(sb, 2, "syncPolarity", MiniJson.quote(pol(hsActive))).append(",\n");
        kv(sb, 2, "active", statJson(hActive)).append(",\n");
        kv(sb, 2, "frontPorch", statJson(hSyncPresent() ? hFront : null)).append(",\n");
        kv(sb, 2, "syncWidth", statJson(hSyncPresent() ? hSync : null)).append(",\n");
        kv(sb, 2, "backPorch", statJson(hSyncPresent() ? hBack : null)).append(",\n");
        kv(sb, 2, "blanking", statJson(hDeLow)).append(",\n");
        kv(sb, 2, "total", statJson(hTotalBest())).append("\n");
        sb.append("  },\n");
        sb.append("  \"vertical\": {\n");
        kv(sb, 2, "unit", "\"lines\"").append(",\n");
        kv(sb, 2, "syncPresent", Boolean.toString(vSyncPresent())).append(",\n");
        kv(sb, 2, "syncPolarity", MiniJson.quote(pol(vsActive))).append(",\n");
        kv(sb, 2, "active", statJson(vActive)).append(",\n");
        kv(sb, 2, "frontPorch", statJson(vSyncPresent() ? vFront : null)).append(",\n");
        kv(sb, 2, "syncWidth", statJson(vSyncPresent() ? vSync : null)).append(",\n");
        kv(sb, 2, "backPorch", statJson(vSyncPresent() ? vBack : null)).append(",\n");
        kv(sb, 2, "blanking", vBlankJson()).append(",\n");
        kv(sb, 2, "total", statJson(vTotal)).append(",\n");
        kv(sb, 2, "syncOffsetPixels", statJson(vSyncPresent() && hSyncPresent() ? vSyncOffset : null)).append("\n");
        sb.append("  },\n");
        sb.append("  \"anomalies\": {");
        boolean first = true;
        for (Map.Entry<String, Long> e : anomalies.entrySet()) {
            sb.append(first ? "" : ", ").append(MiniJson.quote(e.getKey())).append(": ").append(e.getValue());
            first = false;
        }
        sb.append("},\n");
        sb.append("  \"errors\": [");
        for (int i = 0; i < errors.size(); i++) {
            sb.append(i == 0 ? "" : ", ").append(MiniJson.quote(errors.get(i)));
        }
        sb.append("]\n}\n");
        return sb.toString();
    }

    private String vBlankJson() {
        if (vTotal.count() == 0 || vActive.count() == 0) {
            return "null";
        }
        long b = vTotal.typical() - vActive.typical();
        boolean varying = vTotal.varying() || vActive.varying();
        return "{\"value\": " + b + ", \"min\": " + (vTotal.min() - vActive.max()) + ", \"max\": "
                + (vTotal.max() - vActive.min()) + ", \"varying\": " + varying + ", \"samples\": "
                + Math.min(vTotal.count(), vActive.count()) + "}";
    }

    private static StringBuilder kv(StringBuilder sb, int indent, String k, String v) {
        sb.append("  ".repeat(indent)).append('"').append(k).append("\": ").append(v);
        return sb;
    }

    private static String statJson(Stat s) {
        if (s == null || s.count() == 0) {
            return "null";
        }
        return "{\"value\": " + s.typical() + ", \"min\": " + s.min() + ", \"max\": " + s.max() + ", \"varying\": "
                + s.varying() + ", \"samples\": " + s.count() + "}";
    }

    private static String freqJson(double value, DStat s, double tol) {
        if (!Double.isFinite(value)) {
            return "null";
        }
        if (s.count() == 0) {
            return "{\"value\": " + num(value) + ", \"min\": null, \"max\": null, \"varying\": false, \"samples\": 0}";
        }
        return "{\"value\": " + num(value) + ", \"min\": " + num(s.min()) + ", \"max\": " + num(s.max()) + ", \"varying\": "
                + s.varying(tol) + ", \"samples\": " + s.count() + "}";
    }

    private static String num(double d) {
        if (!Double.isFinite(d)) {
            return "null";
        }
        return String.format(Locale.ROOT, "%.6f", d);
    }

    // ---------------------------------------------------------------- text

    String toText(String instance) {
        StringBuilder sb = new StringBuilder(1024);
        sb.append("Pixel link timing, instance ").append(instance).append(" (mapping ").append(mapping)
                .append(dual ? ", dual link: odd/even pixels" : ", single link").append(reverseSlots ? ", slots reversed" : "")
                .append(")\n");
        sb.append("Frames: ").append(framesComplete).append(" complete, ").append(framesPartial).append(" partial, ")
                .append(framesSuspect).append(" suspect; ").append(pixels).append(" pixels in ").append(clocks)
                .append(" clock periods\n");
        double tol = clockTolerancePercent / 100;
        double pc = pixelClockHz();
        sb.append(String.format(Locale.ROOT, "Pixel clock: %s%n", freqText(pc, clockPerLine, tol, 0)));
        if (dual) {
            sb.append(String.format(Locale.ROOT, "Link clock:  %s (each of the two links)%n", freqText(pc / 2, null, tol, 0)));
        }
        sb.append(String.format(Locale.ROOT, "Refresh:     %s%n", freqText(refresh.mean(), refresh, tol, 3)));
        sb.append("Horizontal, in pixels:\n");
        line(sb, "active", hActive);
        line(sb, "front porch", hSyncPresent() ? hFront : null);
        line(sb, "sync width", hSyncPresent() ? hSync : null);
        line(sb, "back porch", hSyncPresent() ? hBack : null);
        line(sb, "blanking", hDeLow);
        line(sb, "total", hTotalBest());
        sb.append("  sync polarity  ").append(hSyncPresent() ? pol(hsActive) : "no HS pulses: timing inferred from DE").append('\n');
        sb.append("Vertical, in lines:\n");
        line(sb, "active", vActive);
        line(sb, "front porch", vSyncPresent() ? vFront : null);
        line(sb, "sync width", vSyncPresent() ? vSync : null);
        line(sb, "back porch", vSyncPresent() ? vBack : null);
        line(sb, "total", vTotal);
        sb.append("  sync polarity  ").append(vSyncPresent() ? pol(vsActive) : "no VS pulses: timing inferred from DE").append('\n');
        if (vSyncPresent() && hSyncPresent() && vSyncOffset.count() > 0) {
            sb.append("  VS starts ").append(vSyncOffset.typical()).append(" pixels after the HS leading edge of its line")
                    .append(vSyncOffset.varying() ? " (varies " + vSyncOffset.min() + ".." + vSyncOffset.max() + ")" : "").append('\n');
        }
        if (!anomalies.isEmpty()) {
            sb.append("Anomalies:");
            for (Map.Entry<String, Long> e : anomalies.entrySet()) {
                sb.append(' ').append(e.getKey()).append(" x").append(e.getValue());
            }
            sb.append('\n');
        }
        for (String e : errors) {
            sb.append("Error: ").append(e).append('\n');
        }
        sb.append("Values are the most frequent per line (horizontal) or per frame (vertical); 'varies' gives min..max over every measured line or frame.\n");
        return sb.toString();
    }

    private static void line(StringBuilder sb, String name, Stat s) {
        sb.append(String.format(Locale.ROOT, "  %-14s ", name));
        if (s == null) {
            sb.append("not present\n");
        } else if (s.count() == 0) {
            sb.append("not measured\n");
        } else {
            sb.append(s.typical());
            if (s.varying()) {
                sb.append("  VARYING ").append(s.min()).append("..").append(s.max());
            }
            sb.append('\n');
        }
    }

    private static String freqText(double v, DStat s, double tol, int decimals) {
        if (!Double.isFinite(v)) {
            return "not measured";
        }
        String f = "%." + decimals + "f Hz";
        String out = String.format(Locale.ROOT, f, v);
        if (s != null && s.varying(tol)) {
            out += String.format(Locale.ROOT, "  VARYING " + f + " .. " + f, s.min(), s.max());
        }
        return out;
    }
}
