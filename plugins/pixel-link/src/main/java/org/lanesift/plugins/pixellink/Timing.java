package org.lanesift.plugins.pixellink;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

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
        JsonWriter j = JsonWriter.pretty().numberStyle(NumberStyle.decimals(6)).nonFiniteAsNull();
        j.beginObject().field("format", "lanesift-pixel-timing/1").field("instance", instance).field("mapping", mapping)
                .field("dual", dual).field("reverseSlots", reverseSlots).field("pixelsPerClock", pixelsPerClock)
                .field("clocks", clocks).field("pixels", pixels);
        j.name("frames").beginObjectInline().field("complete", framesComplete).field("partial", framesPartial)
                .field("suspect", framesSuspect).endObject();
        double tol = clockTolerancePercent / 100;
        freqJson(j.name("pixelClockHz"), pixelClockHz(), clockPerLine, tol);
        Sourced.of(pixelClockHz() / pixelsPerClock, "Hz", Source.derived("pixel clock / pixels per clock")).field(j, "linkClockHz");
        freqJson(j.name("refreshHz"), refresh.mean(), refresh, tol);
        j.name("horizontal").beginObject().field("unit", "pixels").field("syncPresent", hSyncPresent())
                .field("syncPolarity", pol(hsActive));
        statJson(j.name("active"), hActive);
        statJson(j.name("frontPorch"), hSyncPresent() ? hFront : null);
        statJson(j.name("syncWidth"), hSyncPresent() ? hSync : null);
        statJson(j.name("backPorch"), hSyncPresent() ? hBack : null);
        statJson(j.name("blanking"), hDeLow);
        statJson(j.name("total"), hTotalBest());
        j.endObject();
        j.name("vertical").beginObject().field("unit", "lines").field("syncPresent", vSyncPresent())
                .field("syncPolarity", pol(vsActive));
        statJson(j.name("active"), vActive);
        statJson(j.name("frontPorch"), vSyncPresent() ? vFront : null);
        statJson(j.name("syncWidth"), vSyncPresent() ? vSync : null);
        statJson(j.name("backPorch"), vSyncPresent() ? vBack : null);
        vBlankJson(j.name("blanking"));
        statJson(j.name("total"), vTotal);
        statJson(j.name("syncOffsetPixels"), vSyncPresent() && hSyncPresent() ? vSyncOffset : null);
        j.endObject();
        j.name("anomalies").beginObjectInline();
        for (Map.Entry<String, Long> e : anomalies.entrySet()) {
            j.field(e.getKey(), (long) e.getValue());
        }
        j.endObject().name("errors").beginArrayInline();
        for (String e : errors) {
            j.value(e);
        }
        return j.endArray().endObject().finish() + "\n";
    }

    private void vBlankJson(JsonWriter j) {
        if (vTotal.count() == 0 || vActive.count() == 0) {
            j.nullValue();
            return;
        }
        j.beginObjectInline().field("value", vTotal.typical() - vActive.typical()).field("min", vTotal.min() - vActive.max())
                .field("max", vTotal.max() - vActive.min()).field("varying", vTotal.varying() || vActive.varying())
                .field("samples", Math.min(vTotal.count(), vActive.count())).endObject();
    }

    /** Where a timing value with its spread comes from (the {@code source} member of the value, as host-api Sourced writes it). */
    private static final String STAT_SOURCE = Source.measured("the typical value over the decoded lines or frames; min and max over"
            + " the samples").text();
    private static final String FREQ_SOURCE = Source.measured("from the decoded clock or frame times; min and max over the samples").text();

    private static void statJson(JsonWriter j, Stat s) {
        if (s == null || s.count() == 0) {
            j.nullValue();
            return;
        }
        j.beginObjectInline().field("value", s.typical()).field("min", s.min()).field("max", s.max())
                .field("varying", s.varying()).field("samples", s.count()).field("source", STAT_SOURCE).endObject();
    }

    private static void freqJson(JsonWriter j, double value, DStat s, double tol) {
        if (!Double.isFinite(value)) {
            j.nullValue();
            return;
        }
        j.beginObjectInline().field("value", value);
        if (s.count() == 0) {
            j.name("min").nullValue().name("max").nullValue().field("varying", false).field("samples", 0);
        } else {
            j.field("min", s.min()).field("max", s.max()).field("varying", s.varying(tol)).field("samples", s.count());
        }
        j.field("source", FREQ_SOURCE).endObject();
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
