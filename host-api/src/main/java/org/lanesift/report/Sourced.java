package org.lanesift.report;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;
import org.lanesift.json.JsonValue;
import org.lanesift.json.JsonWriter;

/**
 * One reported value with its unit and where it comes from: the one shape of a value with
 * provenance in every JSON report ({@code {"value": ..., "unit": ..., "source": "..."}}, the unit
 * left out for a plain number or text) and in report.md lines ({@code "- name: value unit (source)"}).
 *
 * @param value  a number, text, boolean, list or map (as the report model holds them), or null
 * @param unit   the unit of a number ({@code "ps"}, {@code "Hz"}, {@code "UI"}), or null
 * @param source where it comes from
 */
public record Sourced(Object value, String unit, Source source) {
    /**
     * Checks that the source is present.
     *
     * @param value  the value, or null
     * @param unit   its unit, or null
     * @param source where it comes from
     */
    public Sourced {
        Objects.requireNonNull(source, "source");
    }

    /**
     * A number with its unit.
     *
     * @param value the number (non-finite when it could not be found)
     * @param unit  its unit, or null
     * @param s     where it comes from
     * @return the value
     */
    public static Sourced of(double value, String unit, Source s) {
        return new Sourced(value, unit, s);
    }

    /**
     * Writes the value as the next value of the writer (after a {@code name}).
     *
     * @param w the writer
     * @return the writer
     * @throws IllegalArgumentException if the value is a list or map (use {@link #model()} for those)
     */
    public JsonWriter write(JsonWriter w) {
        w.beginObjectInline();
        w.name("value");
        if (value == null) {
            w.nullValue();
        } else if (value instanceof Integer || value instanceof Long) {
            w.value(((Number) value).longValue());
        } else if (value instanceof Number n) {
            w.value(n.doubleValue());
        } else if (value instanceof Boolean b) {
            w.value(b);
        } else if (value instanceof String s) {
            w.value(s);
        } else {
            throw new IllegalArgumentException("a sourced value written directly must be a number, text or boolean: " + value);
        }
        if (unit != null) {
            w.field("unit", unit);
        }
        w.field("source", source.text());
        return w.endObject();
    }

    /**
     * Writes a named member holding the value.
     *
     * @param w    the writer, inside an object
     * @param name the member name
     * @return the writer
     */
    public JsonWriter field(JsonWriter w, String name) {
        return write(w.name(name));
    }

    /** @return the same three members as a map, for report models rendered as JSON */
    public Map<String, Object> model() {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("value", value);
        if (unit != null) {
            m.put("unit", unit);
        }
        m.put("source", source.text());
        return m;
    }

    /**
     * The value as a parsed JSON object, for reports assembled from {@link JsonValue}s.
     *
     * @return {@code {"value": ..., "unit": ..., "source": ...}}
     * @throws IllegalArgumentException if the value is not a number, text, boolean or null
     */
    public JsonValue json() {
        Map<String, JsonValue> m = new LinkedHashMap<>();
        if (value == null) {
            m.put("value", JsonValue.nullValue());
        } else if (value instanceof Number n) {
            m.put("value", JsonValue.number(n.doubleValue()));
        } else if (value instanceof Boolean b) {
            m.put("value", JsonValue.bool(b));
        } else if (value instanceof String t) {
            m.put("value", JsonValue.string(t));
        } else {
            throw new IllegalArgumentException("a sourced value as JSON must be a number, text or boolean: " + value);
        }
        if (unit != null) {
            m.put("unit", JsonValue.string(unit));
        }
        m.put("source", JsonValue.string(source.text()));
        return JsonValue.object(m);
    }

    /**
     * Reads a member that may be a plain value or a value with its source.
     *
     * @param v a parsed member value, or null
     * @return the {@code value} member when {@code v} is an object with {@code value} and
     *         {@code source}, otherwise {@code v} itself (null stays null)
     */
    public static JsonValue plain(JsonValue v) {
        if (v != null && v.isObject() && v.members().containsKey("value") && v.members().containsKey("source")) {
            return v.get("value");
        }
        return v;
    }

    /**
     * One report.md list line.
     *
     * @param name      what the value is
     * @param valueText the value as it should read (formatted by the caller)
     * @return {@code "- name: valueText (source)"} with a newline
     */
    public String markdown(String name, String valueText) {
        return "- " + name + ": " + valueText + " (" + source.text() + ")\n";
    }
}
