package org.lanesift.plugins.deskew;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.json.JsonWriter;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * A skew table: for each channel name, the time offset to <b>apply</b> to it, in picoseconds,
 * with the confidence of the estimate and the method that produced it. The {@code skew-estimate}
 * plugin writes it; the {@code deskew} plugin reads it back through its {@code offsetsFile}
 * option; users keep one per probe set. The file format is documented in
 * {@code docs/skew-table.md}.
 *
 * <p><b>Sign convention.</b> A positive offset <b>delays</b> the channel: output time = input
 * time + offset. Applying every offset of a table aligns the channels.
 */
public final class SkewTable {
    /** Value of the {@code format} member. */
    public static final String FORMAT = "lanesift-skew-table";
    /** The format version this code writes and reads. */
    public static final int VERSION = 1;
    static final String CONVENTION = "offsetPs is the correction to apply: output time = input time + offsetPs;"
            + " a positive offset delays the channel";

    /**
     * One channel's row.
     *
     * @param name       channel name as carried by its blocks
     * @param offsetPs   correction to apply, picoseconds; positive delays the channel
     * @param confidence 0 (no trust) to 1 (certain); 1 for manual entries and for the reference channel
     * @param method     how it was obtained, such as {@code "manual"}, {@code "reference"},
     *                   {@code "legs-xcorr"}, {@code "clock-edge"}, {@code "clock-centre"}, {@code "lanes"}
     * @param edges      transitions or samples the estimate rests on, 0 when not applicable
     * @param suspect    why the estimate is not to be trusted (ambiguous, weak, near half an
     *                   interval), or empty when nothing is known against it
     */
    public record Entry(String name, double offsetPs, double confidence, String method, long edges, String suspect) {
        /** Checks the values. */
        public Entry {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(method, "method");
            Objects.requireNonNull(suspect, "suspect");
            if (name.isEmpty()) {
                throw new IllegalArgumentException("skew table: channel name is empty");
            }
            if (!Double.isFinite(offsetPs)) {
                throw new IllegalArgumentException("skew table: offset of '" + name + "' is not a finite number");
            }
            if (!(confidence >= 0 && confidence <= 1)) {
                throw new IllegalArgumentException("skew table: confidence of '" + name + "' must be 0 to 1, got " + confidence);
            }
        }

        /**
         * A row with nothing known against it.
         *
         * @param name       channel name
         * @param offsetPs   correction to apply, picoseconds
         * @param confidence 0 to 1
         * @param method     how it was obtained
         * @param edges      transitions or samples behind it
         */
        public Entry(String name, double offsetPs, double confidence, String method, long edges) {
            this(name, offsetPs, confidence, method, edges, "");
        }

        /** @return true when the row carries a suspect reason */
        public boolean isSuspect() {
            return !suspect.isEmpty();
        }
    }

    private final String mode;
    private final Map<String, Entry> entries;

    /**
     * Creates a table.
     *
     * @param mode    how it was made ({@code "manual"}, {@code "legs"}, {@code "clock"}, {@code "lanes"})
     * @param entries rows, channel names unique
     */
    public SkewTable(String mode, List<Entry> entries) {
        this.mode = Objects.requireNonNull(mode, "mode");
        Map<String, Entry> m = new LinkedHashMap<>();
        for (Entry e : entries) {
            if (m.put(e.name(), e) != null) {
                throw new IllegalArgumentException("skew table: channel '" + e.name() + "' appears twice");
            }
        }
        this.entries = java.util.Collections.unmodifiableMap(m);
    }

    /**
     * How the table was made.
     *
     * @return the mode text
     */
    public String mode() {
        return mode;
    }

    /**
     * The rows in file order.
     *
     * @return rows
     */
    public List<Entry> entries() {
        return List.copyOf(entries.values());
    }

    /**
     * Looks up a channel.
     *
     * @param name channel name
     * @return its row, or null
     */
    public Entry get(String name) {
        return entries.get(name);
    }

    /**
     * Writes the table as JSON (UTF-8 text, one channel a line).
     *
     * @return the JSON text
     */
    public String toJson() {
        JsonWriter j = JsonWriter.pretty().beginObject().field("format", FORMAT).field("version", VERSION)
                .field("convention", CONVENTION).field("mode", mode).name("channels").beginObject();
        for (Entry e : entries.values()) {
            j.name(e.name()).beginObjectInline();
            Sourced.of(round(e.offsetPs()), "ps", offsetSource(e.method())).field(j, "offsetPs");
            Sourced.of(round(e.confidence()), null, confidenceSource(e.method())).field(j, "confidence");
            j.field("method", e.method()).field("edges", e.edges());
            if (e.isSuspect()) {
                j.field("suspect", e.suspect());
            }
            j.endObject();
        }
        return j.endObject().endObject().finish() + "\n";
    }

    /**
     * Where a row's offset comes from, after its method: given for a manual entry, 0 by definition
     * for the reference channel, measured by {@code skew-estimate} otherwise.
     *
     * @param method the row's method
     * @return the source
     */
    static Source offsetSource(String method) {
        return switch (method) {
            case "manual" -> Source.given("a manual entry");
            case "reference" -> Source.derived("the reference channel: 0 by definition");
            default -> Source.measured("skew-estimate, method " + method);
        };
    }

    private static Source confidenceSource(String method) {
        return switch (method) {
            case "manual", "reference" -> Source.assumed("1: a given offset and the reference are trusted");
            default -> Source.measured("skew-estimate, method " + method);
        };
    }

    /** Keeps a femtosecond of resolution in ps (three decimals) and drops float noise. */
    private static double round(double v) {
        return Math.round(v * 1000.0) / 1000.0;
    }

    /**
     * Reads a table file.
     *
     * @param file the file
     * @return the table
     * @throws IllegalArgumentException naming the file, the position or JSON pointer and what was expected
     */
    public static SkewTable read(Path file) {
        String name = file.toString();
        try {
            return of(name, JsonReader.read(file, name));
        } catch (NoSuchFileException e) {
            Path dir = file.toAbsolutePath().normalize().getParent();
            throw new IllegalArgumentException(name + ": no such skew table file (looked in folder " + dir + ")");
        } catch (IOException e) {
            throw new IllegalArgumentException(name + ": cannot read the skew table: " + e.getMessage());
        }
    }

    /**
     * Parses table text.
     *
     * @param source file name for messages
     * @param text   JSON text
     * @return the table
     * @throws IllegalArgumentException naming the source, the position or JSON pointer and what was expected
     */
    public static SkewTable parse(String source, String text) {
        return of(source, JsonReader.parse(source, text));
    }

    private static SkewTable of(String source, JsonValue top) {
        if (!top.isObject()) {
            throw new IllegalArgumentException(source + ": expected a JSON object at the top level (pointer \"\")");
        }
        JsonValue f = top.get("format");
        if (f == null || !f.isString() || !FORMAT.equals(f.asString())) {
            throw new IllegalArgumentException(source + ": /format must be \"" + FORMAT + "\", got " + describe(f));
        }
        JsonValue v = top.get("version");
        if (v == null || !v.isNumber() || v.asDouble() != VERSION) {
            throw new IllegalArgumentException(source + ": /version must be " + VERSION + ", got " + describe(v));
        }
        JsonValue m = top.get("mode");
        if (m != null && !m.isString()) {
            throw new IllegalArgumentException(source + ": /mode must be a string, got " + describe(m));
        }
        String mode = m == null ? "manual" : m.asString();
        JsonValue channels = top.get("channels");
        if (channels == null || !channels.isObject()) {
            throw new IllegalArgumentException(source + ": /channels must be an object of channel name to entry, got " + describe(channels));
        }
        List<Entry> out = new ArrayList<>();
        for (Map.Entry<String, JsonValue> e : channels.members().entrySet()) {
            String cname = e.getKey();
            String ptr = "/channels/" + cname.replace("~", "~0").replace("/", "~1");
            if (cname.isEmpty()) {
                throw new IllegalArgumentException(source + ": " + ptr + ": channel name must not be empty");
            }
            JsonValue row = e.getValue();
            if (!row.isObject()) {
                throw new IllegalArgumentException(source + ": " + ptr + " must be an object with offsetPs, got " + describe(row));
            }
            JsonValue o = Sourced.plain(row.get("offsetPs"));
            if (o == null || !o.isNumber()) {
                throw new IllegalArgumentException(source + ": " + ptr + "/offsetPs must be a number of picoseconds, got " + describe(o));
            }
            double off = o.asDouble();
            if (Math.abs(off) > 1e9) {
                throw new IllegalArgumentException(source + ": " + ptr + "/offsetPs " + off + " is beyond +/-1e9 ps (1 ms)");
            }
            double conf = 1;
            JsonValue c = Sourced.plain(row.get("confidence"));
            if (c != null) {
                if (!c.isNumber() || !(c.asDouble() >= 0 && c.asDouble() <= 1)) {
                    throw new IllegalArgumentException(source + ": " + ptr + "/confidence must be a number from 0 to 1, got " + describe(c));
                }
                conf = c.asDouble();
            }
            String method = "manual";
            JsonValue me = row.get("method");
            if (me != null) {
                if (!me.isString()) {
                    throw new IllegalArgumentException(source + ": " + ptr + "/method must be a string, got " + describe(me));
                }
                method = me.asString();
            }
            long edges = 0;
            JsonValue ed = row.get("edges");
            if (ed != null) {
                double edd = ed.isNumber() ? ed.asDouble() : -1;
                if (edd < 0 || edd != Math.rint(edd) || edd > 9e15) {
                    throw new IllegalArgumentException(source + ": " + ptr + "/edges must be a whole number at least 0, got " + describe(ed));
                }
                edges = (long) edd;
            }
            String suspect = "";
            JsonValue su = row.get("suspect");
            if (su != null) {
                if (!su.isString()) {
                    throw new IllegalArgumentException(source + ": " + ptr + "/suspect must be a string (why the estimate is"
                            + " suspect), got " + describe(su));
                }
                suspect = su.asString();
            }
            out.add(new Entry(cname, off, conf, method, edges, suspect));
        }
        return new SkewTable(mode, out);
    }

    private static String describe(JsonValue v) {
        return v == null ? "nothing (member missing)" : v.describe();
    }

    @Override
    public String toString() {
        StringBuilder b = new StringBuilder("SkewTable[" + mode);
        for (Entry e : entries.values()) {
            b.append(String.format(Locale.ROOT, ", %s %+.3f ps (%.2f)", e.name(), e.offsetPs(), e.confidence()));
        }
        return b.append(']').toString();
    }
}
