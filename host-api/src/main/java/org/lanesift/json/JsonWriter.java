package org.lanesift.json;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * A streaming JSON text writer (RFC 8259), JDK only. Values go in order; the writer inserts the
 * commas, colons, line breaks and indentation, escapes strings, and checks that the calls make a
 * well-formed text (a member value follows a name, containers close in order).
 *
 * <p>Layout: {@link #compact()} writes no white space at all. {@link #pretty()} puts each member
 * or element of an <em>expanded</em> container on its own line, indented two spaces per expanded
 * container around it, and writes {@code ": "} after names. A container begun with
 * {@link #beginObjectInline()} or {@link #beginArrayInline()} keeps its members on one line,
 * separated by {@code ", "}; a container opened inside it may still be expanded. An empty
 * container is always {@code {}} or {@code []}.
 *
 * <p>Numbers: a {@link NumberStyle} (default {@link NumberStyle#shortest()}). JSON has no NaN or
 * infinity: by default writing one throws an {@link IllegalArgumentException} that names the
 * member by its JSON pointer (RFC 6901); a writer set to {@link #nonFiniteAsNull()} writes
 * {@code null} instead, for reports whose format says unknown values are null.
 *
 * <p>Strings: {@code "} and {@code \} are escaped, control characters U+0000 to U+001F use the
 * two-character escapes where RFC 8259 has one ({@code \b \f \n \r \t}) and {@code \}{@code u00XX}
 * otherwise; characters outside the Basic Multilingual Plane are written as they are (a valid
 * surrogate pair), a lone surrogate as a {@code \}{@code uXXXX} escape so that nothing is lost in
 * UTF-8. Other characters, including non-ASCII, are written unescaped.
 *
 * <pre>{@code
 * String text = JsonWriter.pretty().beginObject()
 *         .field("name", "lane0").field("count", 3)
 *         .name("levels").beginArrayInline().value(0.25).value(1.5).endArray()
 *         .endObject().finish();
 * }</pre>
 */
public final class JsonWriter {
    private static final char[] HEX = "0123456789abcdef".toCharArray();

    /** One open container. */
    private static final class Frame {
        final boolean object;
        final boolean inline;
        int count;
        /** The name just written in an object, waiting for its value; else null. */
        String pending;
        /** The last name written (objects), for error messages. */
        String last;

        Frame(boolean object, boolean inline) {
            this.object = object;
            this.inline = inline;
        }
    }

    private final StringBuilder sb = new StringBuilder(1024);
    private final boolean pretty;
    private final List<Frame> stack = new ArrayList<>();
    private int expanded;
    private boolean topDone;
    private NumberStyle style = NumberStyle.shortest();
    private boolean nonFiniteNull;

    private JsonWriter(boolean pretty) {
        this.pretty = pretty;
    }

    /**
     * A writer with no white space: {@code {"a":1,"b":[1,2]}}.
     *
     * @return a new writer
     */
    public static JsonWriter compact() {
        return new JsonWriter(false);
    }

    /**
     * A writer that indents expanded containers by two spaces and writes {@code ": "} and
     * {@code ", "} in inline ones.
     *
     * @return a new writer
     */
    public static JsonWriter pretty() {
        return new JsonWriter(true);
    }

    /**
     * Sets how numbers are spelled from now on.
     *
     * @param s the style
     * @return this writer
     */
    public JsonWriter numberStyle(NumberStyle s) {
        if (s == null) {
            throw new NullPointerException("number style");
        }
        this.style = s;
        return this;
    }

    /**
     * Makes NaN and infinite numbers come out as {@code null} instead of failing.
     *
     * @return this writer
     */
    public JsonWriter nonFiniteAsNull() {
        this.nonFiniteNull = true;
        return this;
    }

    /**
     * Begins an object; in a pretty writer its members go on lines of their own.
     *
     * @return this writer
     */
    public JsonWriter beginObject() {
        return open(true, !pretty);
    }

    /**
     * Begins an object whose members stay on one line.
     *
     * @return this writer
     */
    public JsonWriter beginObjectInline() {
        return open(true, true);
    }

    /**
     * Begins an array; in a pretty writer its elements go on lines of their own.
     *
     * @return this writer
     */
    public JsonWriter beginArray() {
        return open(false, !pretty);
    }

    /**
     * Begins an array whose elements stay on one line.
     *
     * @return this writer
     */
    public JsonWriter beginArrayInline() {
        return open(false, true);
    }

    /**
     * Ends the innermost container, which must be an object with no name awaiting its value.
     *
     * @return this writer
     * @throws IllegalStateException if the innermost container is not an object
     */
    public JsonWriter endObject() {
        return close(true);
    }

    /**
     * Ends the innermost container, which must be an array.
     *
     * @return this writer
     * @throws IllegalStateException if the innermost container is not an array
     */
    public JsonWriter endArray() {
        return close(false);
    }

    /**
     * Writes a member name; the next call must write its value.
     *
     * @param name the name (any string; escaped as needed)
     * @return this writer
     * @throws IllegalStateException outside an object or when a name is already waiting
     */
    public JsonWriter name(String name) {
        if (name == null) {
            throw new NullPointerException("member name");
        }
        Frame f = top();
        if (f == null || !f.object) {
            throw new IllegalStateException("a member name (\"" + name + "\") belongs in an object, at " + pointer());
        }
        if (f.pending != null) {
            throw new IllegalStateException("member \"" + f.pending + "\" has no value yet, at " + pointer());
        }
        separate(f);
        string(name);
        sb.append(pretty ? ": " : ":");
        f.pending = name;
        f.last = name;
        return this;
    }

    /**
     * Writes a string, or {@code null} for a null reference.
     *
     * @param s the text
     * @return this writer
     */
    public JsonWriter value(String s) {
        before();
        if (s == null) {
            sb.append("null");
        } else {
            string(s);
        }
        return this;
    }

    /**
     * Writes an integer.
     *
     * @param v the value
     * @return this writer
     */
    public JsonWriter value(long v) {
        before();
        sb.append(v);
        return this;
    }

    /**
     * Writes a number in the current {@link NumberStyle}.
     *
     * @param v the value
     * @return this writer
     * @throws IllegalArgumentException if v is NaN or infinite and the writer is not set to
     *                                  {@link #nonFiniteAsNull()}; the message names the member
     */
    public JsonWriter value(double v) {
        if (!Double.isFinite(v) && !nonFiniteNull) {
            throw new IllegalArgumentException("JSON cannot hold " + v + " (at " + pointer() + ")");
        }
        before();
        sb.append(Double.isFinite(v) ? style.format(v) : "null");
        return this;
    }

    /**
     * Writes {@code true} or {@code false}.
     *
     * @param v the value
     * @return this writer
     */
    public JsonWriter value(boolean v) {
        before();
        sb.append(v);
        return this;
    }

    /**
     * Writes {@code null}.
     *
     * @return this writer
     */
    public JsonWriter nullValue() {
        before();
        sb.append("null");
        return this;
    }

    /**
     * Writes a parsed or built value, containers expanded as this writer expands them; numbers
     * keep their original text.
     *
     * @param v the value
     * @return this writer
     */
    public JsonWriter value(JsonValue v) {
        switch (v.kind()) {
            case OBJECT -> {
                beginObject();
                for (Map.Entry<String, JsonValue> e : v.members().entrySet()) {
                    name(e.getKey()).value(e.getValue());
                }
                endObject();
            }
            case ARRAY -> {
                beginArray();
                for (JsonValue e : v.elements()) {
                    value(e);
                }
                endArray();
            }
            case STRING -> value(v.asString());
            case NUMBER -> {
                before();
                sb.append(v.numberText());
            }
            case BOOLEAN -> value(v.asBoolean());
            case NULL -> nullValue();
            default -> throw new IllegalStateException(v.kind().toString());
        }
        return this;
    }

    /**
     * Writes a member with a string value ({@code null} for a null reference).
     *
     * @param name member name
     * @param v    value
     * @return this writer
     */
    public JsonWriter field(String name, String v) {
        return name(name).value(v);
    }

    /**
     * Writes a member with an integer value.
     *
     * @param name member name
     * @param v    value
     * @return this writer
     */
    public JsonWriter field(String name, long v) {
        return name(name).value(v);
    }

    /**
     * Writes a member with a number value.
     *
     * @param name member name
     * @param v    value
     * @return this writer
     * @throws IllegalArgumentException for NaN or infinity unless {@link #nonFiniteAsNull()}
     */
    public JsonWriter field(String name, double v) {
        return name(name).value(v);
    }

    /**
     * Writes a member with a boolean value.
     *
     * @param name member name
     * @param v    value
     * @return this writer
     */
    public JsonWriter field(String name, boolean v) {
        return name(name).value(v);
    }

    /**
     * Writes the first {@code count} numbers as an inline array.
     *
     * @param values the numbers
     * @param count  how many
     * @return this writer
     */
    public JsonWriter inlineArray(double[] values, int count) {
        beginArrayInline();
        for (int i = 0; i < count; i++) {
            value(values[i]);
        }
        return endArray();
    }

    /**
     * Writes the first {@code count} integers as an inline array.
     *
     * @param values the integers
     * @param count  how many
     * @return this writer
     */
    public JsonWriter inlineArray(long[] values, int count) {
        beginArrayInline();
        for (int i = 0; i < count; i++) {
            value(values[i]);
        }
        return endArray();
    }

    /**
     * The text of a complete value: every container closed.
     *
     * @return the JSON text (no trailing line break)
     * @throws IllegalStateException if nothing was written or a container is still open
     */
    public String finish() {
        if (!stack.isEmpty()) {
            throw new IllegalStateException(stack.size() + " container(s) still open, at " + pointer());
        }
        if (!topDone) {
            throw new IllegalStateException("nothing written");
        }
        return sb.toString();
    }

    /**
     * The text written so far, complete or not.
     *
     * @return the text
     */
    @Override
    public String toString() {
        return sb.toString();
    }

    /**
     * Quotes and escapes a string as {@link JsonWriter} does.
     *
     * @param s the text
     * @return the JSON string, quotes included
     */
    public static String quote(String s) {
        JsonWriter w = new JsonWriter(false);
        w.string(s);
        return w.sb.toString();
    }

    // ------------------------------------------------------------------ internals

    private Frame top() {
        return stack.isEmpty() ? null : stack.get(stack.size() - 1);
    }

    private JsonWriter open(boolean object, boolean inline) {
        before(true);
        sb.append(object ? '{' : '[');
        Frame f = new Frame(object, inline);
        stack.add(f);
        if (!inline) {
            expanded++;
        }
        return this;
    }

    private JsonWriter close(boolean object) {
        Frame f = top();
        if (f == null || f.object != object) {
            throw new IllegalStateException("end" + (object ? "Object" : "Array") + " without a matching begin, at " + pointer());
        }
        if (f.pending != null) {
            throw new IllegalStateException("member \"" + f.pending + "\" has no value, at " + pointer());
        }
        stack.remove(stack.size() - 1);
        if (!f.inline) {
            expanded--;
            if (f.count > 0) {
                newline();
            }
        }
        sb.append(object ? '}' : ']');
        if (stack.isEmpty()) {
            topDone = true;
        }
        return this;
    }

    /** Called before every scalar value. */
    private void before() {
        before(false);
    }

    /**
     * Called before every value: separators, and the checks that a value may stand here. A
     * top-level scalar completes the text; a top-level container completes when it closes.
     */
    private void before(boolean container) {
        Frame f = top();
        if (f == null) {
            if (topDone) {
                throw new IllegalStateException("a JSON text holds one top-level value; it is already written");
            }
            if (!container) {
                topDone = true;
            }
            return;
        }
        if (f.object) {
            if (f.pending == null) {
                throw new IllegalStateException("a value in an object needs a member name first, at " + pointer());
            }
            f.pending = null;
            return;
        }
        separate(f);
    }

    private void separate(Frame f) {
        if (f.count > 0) {
            sb.append(',');
        }
        if (!f.inline) {
            newline();
        } else if (f.count > 0 && pretty) {
            sb.append(' ');
        }
        f.count++;
    }

    private void newline() {
        sb.append('\n');
        for (int i = 0; i < expanded; i++) {
            sb.append("  ");
        }
    }

    private String pointer() {
        if (stack.isEmpty()) {
            return "the top level";
        }
        StringBuilder p = new StringBuilder();
        for (int i = 0; i < stack.size(); i++) {
            Frame f = stack.get(i);
            boolean inner = i == stack.size() - 1;
            p.append('/');
            // an outer array already counted the element that holds the inner containers
            String seg = f.object ? (f.pending != null ? f.pending : f.last != null ? f.last : "")
                    : Integer.toString(inner ? f.count : f.count - 1);
            p.append(seg.replace("~", "~0").replace("/", "~1"));
        }
        return p.toString();
    }

    private void string(String s) {
        sb.append('"');
        int n = s.length();
        for (int i = 0; i < n; i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> sb.append("\\\"");
                case '\\' -> sb.append("\\\\");
                case '\b' -> sb.append("\\b");
                case '\f' -> sb.append("\\f");
                case '\n' -> sb.append("\\n");
                case '\r' -> sb.append("\\r");
                case '\t' -> sb.append("\\t");
                default -> {
                    if (c < 0x20) {
                        unicodeEscape(c);
                    } else if (Character.isHighSurrogate(c) && i + 1 < n && Character.isLowSurrogate(s.charAt(i + 1))) {
                        sb.append(c).append(s.charAt(++i));
                    } else if (Character.isSurrogate(c)) {
                        unicodeEscape(c);
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        sb.append('"');
    }

    private void unicodeEscape(char c) {
        sb.append("\\u").append(HEX[(c >> 12) & 15]).append(HEX[(c >> 8) & 15]).append(HEX[(c >> 4) & 15]).append(HEX[c & 15]);
    }
}
