package org.lanesift.runner.link;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.json.JsonWriter;
import org.lanesift.report.Source;
import org.lanesift.report.Sourced;

/**
 * Merges the per-instance skew tables that one estimation pass writes ({@code <instance>-skew.json},
 * docs/skew-table.md) into the one table a {@code deskew} node reads through {@code offsetsFile}.
 * An entry whose confidence is below {@value #MIN_CONFIDENCE} is not applied: it is written as
 * 0 ps with method {@code manual}, and a note says so.
 */
public final class SkewTables {
    /** Entries below this confidence are replaced by 0 ps (common practice: do not apply a guess). */
    public static final double MIN_CONFIDENCE = 0.5;

    private SkewTables() {
    }

    /**
     * Merges the tables of a pass.
     *
     * @param passDir the output folder of the estimation pass
     * @param prefix  the instance-id prefix of the tables to merge ({@code legs-} or {@code lanes})
     * @param target  the merged table to write
     * @param notes   receives one line per entry that was not applied
     * @return {@code target}
     * @throws IOException when a table cannot be read or the target written
     */
    public static Path merge(Path passDir, String prefix, Path target, List<String> notes) throws IOException {
        Map<String, JsonValue> channels = new LinkedHashMap<>();
        try (var files = Files.list(passDir)) {
            for (Path f : files.filter(p -> p.getFileName().toString().startsWith(prefix)
                    && p.getFileName().toString().endsWith("-skew.json")).sorted().toList()) {
                JsonValue t = JsonReader.read(f, f.getFileName().toString());
                for (Map.Entry<String, JsonValue> en : t.get("channels").members().entrySet()) {
                    Map<String, JsonValue> entry = new LinkedHashMap<>(en.getValue().members());
                    double conf = number(entry.get("confidence"), 1);
                    if (conf < MIN_CONFIDENCE) {
                        notes.add(en.getKey() + ": estimate " + fmt(number(entry.get("offsetPs"), 0)) + " ps has confidence "
                                + fmt(conf) + ", not applied (0 ps used)");
                        entry.put("offsetPs", Sourced.of(0.0, "ps", Source.assumed("0 ps: the estimate's confidence is below "
                                + MIN_CONFIDENCE + ", not applied")).json());
                        entry.put("method", JsonValue.string("manual"));
                    }
                    channels.put(en.getKey(), JsonValue.object(entry));
                }
            }
        }
        JsonWriter w = JsonWriter.pretty().beginObject()
                .field("format", "lanesift-skew-table")
                .field("version", 1)
                .field("mode", prefix.startsWith("legs") ? "legs" : "lanes")
                .name("channels").value(JsonValue.object(channels))
                .endObject();
        Files.writeString(target, w.finish() + "\n", StandardCharsets.UTF_8);
        return target;
    }

    private static double number(JsonValue v, double absent) {
        JsonValue n = Sourced.plain(v);
        return n != null && n.isNumber() ? n.asDouble() : absent;
    }

    private static String fmt(double d) {
        return String.format(Locale.ROOT, "%.3g", d);
    }
}
