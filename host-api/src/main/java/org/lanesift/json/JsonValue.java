package org.lanesift.json;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * One JSON value: an object (members in text order), an array, a string, a number, a boolean or
 * null. Values read by {@link JsonReader} know the line and column where they begin; built ones
 * have line and column 0. Values are immutable. {@link #equals(Object)} compares content only
 * (numbers by numeric value, objects as unordered maps), never the position.
 */
public final class JsonValue {
    /** The six kinds of JSON value. */
    public enum Kind {
        /** Members, name to value. */
        OBJECT,
        /** Ordered elements. */
        ARRAY,
        /** Text. */
        STRING,
        /** A finite number. */
        NUMBER,
        /** true or false. */
        BOOLEAN,
        /** null. */
        NULL
    }

    private static final JsonValue NULL = new JsonValue(Kind.NULL, null, null, 0, 0);
    private static final JsonValue TRUE = new JsonValue(Kind.BOOLEAN, Boolean.TRUE, null, 0, 0);
    private static final JsonValue FALSE = new JsonValue(Kind.BOOLEAN, Boolean.FALSE, null, 0, 0);

    private final Kind kind;
    /** Map, List, String, Double or Boolean; null for NULL. */
    private final Object value;
    /** The number's text, for NUMBER. */
    private final String text;
    private final int line;
    private final int column;

    JsonValue(Kind kind, Object value, String text, int line, int column) {
        this.kind = kind;
        this.value = value;
        this.text = text;
        this.line = line;
        this.column = column;
    }

    /**
     * A string value.
     *
     * @param s the text, not null
     * @return the value
     */
    public static JsonValue string(String s) {
        return new JsonValue(Kind.STRING, Objects.requireNonNull(s, "string"), null, 0, 0);
    }

    /**
     * A number value, spelled in {@link NumberStyle#shortest()}.
     *
     * @param v a finite number
     * @return the value
     * @throws IllegalArgumentException if v is NaN or infinite
     */
    public static JsonValue number(double v) {
        return new JsonValue(Kind.NUMBER, v, NumberStyle.shortest().format(v), 0, 0);
    }

    /**
     * A boolean value.
     *
     * @param b the boolean
     * @return the value
     */
    public static JsonValue bool(boolean b) {
        return b ? TRUE : FALSE;
    }

    /**
     * The null value.
     *
     * @return the value
     */
    public static JsonValue nullValue() {
        return NULL;
    }

    /**
     * An array value.
     *
     * @param elements the elements, copied
     * @return the value
     */
    public static JsonValue array(List<JsonValue> elements) {
        List<JsonValue> l = new ArrayList<>(elements.size());
        for (JsonValue v : elements) {
            l.add(Objects.requireNonNull(v, "array element"));
        }
        return new JsonValue(Kind.ARRAY, Collections.unmodifiableList(l), null, 0, 0);
    }

    /**
     * An object value; members keep the map's iteration order.
     *
     * @param members name to value, copied
     * @return the value
     */
    public static JsonValue object(Map<String, JsonValue> members) {
        Map<String, JsonValue> m = new LinkedHashMap<>();
        for (Map.Entry<String, JsonValue> e : members.entrySet()) {
            m.put(Objects.requireNonNull(e.getKey(), "member name"), Objects.requireNonNull(e.getValue(), "member value"));
        }
        return new JsonValue(Kind.OBJECT, Collections.unmodifiableMap(m), null, 0, 0);
    }

    /**
     * The kind of value.
     *
     * @return the kind
     */
    public Kind kind() {
        return kind;
    }

    /**
     * The line where the value begins in the text it was read from, counting from 1; 0 for a
     * built value.
     *
     * @return the line
     */
    public int line() {
        return line;
    }

    /**
     * The column where the value begins, counting characters from 1; 0 for a built value.
     *
     * @return the column
     */
    public int column() {
        return column;
    }

    /**
     * Whether this is an object.
     *
     * @return true for an object
     */
    public boolean isObject() {
        return kind == Kind.OBJECT;
    }

    /**
     * Whether this is an array.
     *
     * @return true for an array
     */
    public boolean isArray() {
        return kind == Kind.ARRAY;
    }

    /**
     * Whether this is a string.
     *
     * @return true for a string
     */
    public boolean isString() {
        return kind == Kind.STRING;
    }

    /**
     * Whether this is a number.
     *
     * @return true for a number
     */
    public boolean isNumber() {
        return kind == Kind.NUMBER;
    }

    /**
     * Whether this is true or false.
     *
     * @return true for a boolean
     */
    public boolean isBoolean() {
        return kind == Kind.BOOLEAN;
    }

    /**
     * Whether this is null.
     *
     * @return true for null
     */
    public boolean isNull() {
        return kind == Kind.NULL;
    }

    /**
     * The members of an object, in text order.
     *
     * @return an unmodifiable map
     * @throws IllegalStateException if this is not an object
     */
    @SuppressWarnings("unchecked")
    public Map<String, JsonValue> members() {
        expect(Kind.OBJECT);
        return (Map<String, JsonValue>) value;
    }

    /**
     * The elements of an array.
     *
     * @return an unmodifiable list
     * @throws IllegalStateException if this is not an array
     */
    @SuppressWarnings("unchecked")
    public List<JsonValue> elements() {
        expect(Kind.ARRAY);
        return (List<JsonValue>) value;
    }

    /**
     * A member of an object.
     *
     * @param name member name
     * @return its value, or null (the Java reference) if the object has no such member
     * @throws IllegalStateException if this is not an object
     */
    public JsonValue get(String name) {
        return members().get(name);
    }

    /**
     * The value an RFC 6901 JSON pointer leads to from here ({@code /fields/volts/value},
     * {@code /options/2}; {@code ~1} stands for {@code /} and {@code ~0} for {@code ~} in a name).
     *
     * @param pointer the pointer, "" for this value itself
     * @return the value, or null if the path leads nowhere
     * @throws IllegalArgumentException if the pointer is not empty and does not start with '/'
     */
    public JsonValue at(String pointer) {
        if (pointer.isEmpty()) {
            return this;
        }
        if (pointer.charAt(0) != '/') {
            throw new IllegalArgumentException("a JSON pointer starts with '/', got \"" + pointer + "\"");
        }
        JsonValue v = this;
        for (String raw : pointer.substring(1).split("/", -1)) {
            String seg = raw.replace("~1", "/").replace("~0", "~");
            if (v.kind == Kind.OBJECT) {
                v = v.members().get(seg);
            } else if (v.kind == Kind.ARRAY && seg.matches("0|[1-9][0-9]{0,8}")) {
                int i = Integer.parseInt(seg);
                v = i < v.elements().size() ? v.elements().get(i) : null;
            } else {
                return null;
            }
            if (v == null) {
                return null;
            }
        }
        return v;
    }

    /**
     * The text of a string.
     *
     * @return the text
     * @throws IllegalStateException if this is not a string
     */
    public String asString() {
        expect(Kind.STRING);
        return (String) value;
    }

    /**
     * The value of a number (the nearest double to its text).
     *
     * @return the number
     * @throws IllegalStateException if this is not a number
     */
    public double asDouble() {
        expect(Kind.NUMBER);
        return (Double) value;
    }

    /**
     * The number as it was spelled in the text.
     *
     * @return the number text
     * @throws IllegalStateException if this is not a number
     */
    public String numberText() {
        expect(Kind.NUMBER);
        return text;
    }

    /**
     * The value of a boolean.
     *
     * @return true or false
     * @throws IllegalStateException if this is not a boolean
     */
    public boolean asBoolean() {
        expect(Kind.BOOLEAN);
        return (Boolean) value;
    }

    /**
     * A short description for error messages: {@code an object}, {@code an array}, or the
     * value's compact JSON text ({@code "35"}, {@code 2}, {@code true}, {@code null}).
     *
     * @return the description
     */
    public String describe() {
        return kind == Kind.OBJECT ? "an object" : kind == Kind.ARRAY ? "an array" : toString();
    }

    private void expect(Kind k) {
        if (kind != k) {
            throw new IllegalStateException("expected " + k.name().toLowerCase(java.util.Locale.ROOT) + ", this is " + describe());
        }
    }

    /**
     * Compact JSON text of the value.
     *
     * @return the text
     */
    @Override
    public String toString() {
        return JsonWriter.compact().value(this).finish();
    }

    /**
     * Content equality: same kind and equal content; numbers by numeric value.
     *
     * @param o the other object
     * @return true if equal
     */
    @Override
    public boolean equals(Object o) {
        if (this == o) {
            return true;
        }
        if (!(o instanceof JsonValue v) || v.kind != kind) {
            return false;
        }
        if (kind == Kind.NUMBER) {
            return (double) (Double) value == (double) (Double) v.value;
        }
        return Objects.equals(value, v.value);
    }

    /**
     * Hash code consistent with {@link #equals(Object)}.
     *
     * @return the hash
     */
    @Override
    public int hashCode() {
        if (kind == Kind.NUMBER) {
            double d = (Double) value;
            return Double.hashCode(d == 0 ? 0.0 : d);
        }
        return kind.hashCode() * 31 + Objects.hashCode(value);
    }
}
