package org.lanesift.runner.output;

import java.io.BufferedWriter;
import java.io.Closeable;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.json.JsonWriter;

/**
 * Writes annotations as JSON Lines, one object a line, in arrival order; the schema is in
 * {@code docs/annotations-jsonl.md}. Each line is written by the project's one JSON writer
 * ({@link JsonWriter}, compact, shortest round-trip numbers).
 */
final class AnnotationJsonlWriter implements Closeable {
    private final BufferedWriter out;
    long count;

    AnnotationJsonlWriter(Path file) throws IOException {
        out = Files.newBufferedWriter(file, StandardCharsets.UTF_8);
    }

    void write(String source, Annotation a) throws IOException {
        JsonWriter g = JsonWriter.compact().beginObject();
        g.field("source", source);
        g.field("start_fs", a.startFs());
        g.field("end_fs", a.endFs());
        g.field("track", a.track());
        g.field("kind", a.kind());
        g.field("severity", a.severity().name().toLowerCase(Locale.ROOT));
        g.field("label", a.label());
        g.name("fields").beginObject();
        for (Map.Entry<String, Field> e : a.fields().entrySet()) {
            Field f = e.getValue();
            g.name(e.getKey()).beginObject();
            g.field("type", f.type().name().toLowerCase(Locale.ROOT));
            switch (f.type()) {
                case NUMBER -> {
                    Object v = f.value();
                    if (v instanceof Long l) {
                        g.field("value", l);
                    } else {
                        double d = (Double) v;
                        if (Double.isFinite(d)) {
                            g.field("value", d);
                        } else {
                            g.name("value").nullValue();
                            g.field("special", Double.isNaN(d) ? "NaN" : d > 0 ? "Infinity" : "-Infinity");
                        }
                    }
                    g.field("unit", f.unit());
                }
                case TEXT, ENUM -> g.field("value", (String) f.value());
                case BYTES -> g.field("value", Texts.hex((byte[]) f.value()));
                default -> throw new IllegalStateException("field type " + f.type());
            }
            g.endObject();
        }
        g.endObject();
        g.endObject();
        out.write(g.finish());
        out.write('\n');
        count++;
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
