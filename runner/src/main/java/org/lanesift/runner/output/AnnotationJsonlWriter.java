package org.lanesift.runner.output;

import com.fasterxml.jackson.core.JsonEncoding;
import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.util.MinimalPrettyPrinter;
import java.io.BufferedOutputStream;
import java.io.Closeable;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;

/**
 * Writes annotations as JSON Lines, one object a line, in arrival order; the schema is in
 * {@code docs/annotations-jsonl.md}.
 */
final class AnnotationJsonlWriter implements Closeable {
    private final OutputStream stream;
    private final JsonGenerator g;
    long count;

    AnnotationJsonlWriter(Path file) throws IOException {
        stream = new BufferedOutputStream(Files.newOutputStream(file), 1 << 16);
        g = new JsonFactory().createGenerator(stream, JsonEncoding.UTF8);
        g.setPrettyPrinter(new MinimalPrettyPrinter(""));
        g.disable(JsonGenerator.Feature.AUTO_CLOSE_TARGET);
        g.disable(JsonGenerator.Feature.FLUSH_PASSED_TO_STREAM);
    }

    void write(String source, Annotation a) throws IOException {
        g.writeStartObject();
        g.writeStringField("source", source);
        g.writeNumberField("start_fs", a.startFs());
        g.writeNumberField("end_fs", a.endFs());
        g.writeStringField("track", a.track());
        g.writeStringField("kind", a.kind());
        g.writeStringField("severity", a.severity().name().toLowerCase(Locale.ROOT));
        g.writeStringField("label", a.label());
        g.writeObjectFieldStart("fields");
        for (Map.Entry<String, Field> e : a.fields().entrySet()) {
            Field f = e.getValue();
            g.writeObjectFieldStart(e.getKey());
            g.writeStringField("type", f.type().name().toLowerCase(Locale.ROOT));
            switch (f.type()) {
                case NUMBER -> {
                    Object v = f.value();
                    if (v instanceof Long l) {
                        g.writeNumberField("value", l);
                    } else {
                        double d = (Double) v;
                        if (Double.isFinite(d)) {
                            g.writeNumberField("value", d);
                        } else {
                            g.writeNullField("value");
                            g.writeStringField("special", Double.isNaN(d) ? "NaN" : d > 0 ? "Infinity" : "-Infinity");
                        }
                    }
                    g.writeStringField("unit", f.unit());
                }
                case TEXT, ENUM -> g.writeStringField("value", (String) f.value());
                case BYTES -> g.writeStringField("value", Texts.hex((byte[]) f.value()));
                default -> throw new IllegalStateException("field type " + f.type());
            }
            g.writeEndObject();
        }
        g.writeEndObject();
        g.writeEndObject();
        g.flush();
        stream.write('\n');
        count++;
    }

    @Override
    public void close() throws IOException {
        g.close();
        stream.close();
    }
}
