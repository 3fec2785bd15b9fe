package org.lanesift.runner.link;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.lanesift.json.JsonWriter;

/** Writes a chain model (maps, lists, strings, numbers, booleans; docs/chain-file.md) as a pretty JSON file. */
public final class ChainModels {
    private ChainModels() {
    }

    /**
     * Writes the model to a file, ending with a newline.
     *
     * @param file  the chain file to write
     * @param model the chain model, as {@link LinkChains} builds it
     * @throws IOException when the file cannot be written
     */
    public static void write(Path file, Map<String, Object> model) throws IOException {
        JsonWriter w = JsonWriter.pretty();
        writeJson(w, model);
        Files.writeString(file, w.finish() + "\n", StandardCharsets.UTF_8);
    }

    /**
     * The model as pretty JSON text with a final newline (also used for the {@code sift} report).
     *
     * @param model maps, lists, strings, numbers (non-finite ones become null), booleans and parsed JSON values
     * @return the JSON text
     */
    public static String text(Map<String, Object> model) {
        JsonWriter w = JsonWriter.pretty().nonFiniteAsNull();
        writeJson(w, model);
        return w.finish() + "\n";
    }

    private static void writeJson(JsonWriter w, Object v) {
        if (v instanceof Map<?, ?> m) {
            w.beginObject();
            for (Map.Entry<?, ?> e : m.entrySet()) {
                w.name(e.getKey().toString());
                writeJson(w, e.getValue());
            }
            w.endObject();
        } else if (v instanceof List<?> l) {
            w.beginArray();
            for (Object o : l) {
                writeJson(w, o);
            }
            w.endArray();
        } else if (v instanceof String str) {
            w.value(str);
        } else if (v instanceof Boolean b) {
            w.value(b);
        } else if (v instanceof Integer || v instanceof Long) {
            w.value(((Number) v).longValue());
        } else if (v instanceof Number n) {
            w.value(n.doubleValue());
        } else if (v instanceof org.lanesift.json.JsonValue j) {
            w.value(j);
        } else if (v == null) {
            w.nullValue();
        } else {
            throw new IllegalArgumentException("chain model: unexpected " + v);
        }
    }
}
