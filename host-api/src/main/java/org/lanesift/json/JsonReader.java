package org.lanesift.json;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.lanesift.plugin.InputFiles;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * A strict JSON reader (RFC 8259), JDK only: parses one text into a {@link JsonValue} tree.
 *
 * <p>Strict means: exactly one value, surrounded by optional white space (a leading byte order
 * mark U+FEFF is skipped, as RFC 8259 section 8.1 allows); no comments, trailing commas, single
 * quotes, leading zeros, {@code +}, NaN or infinities; no raw control characters inside strings.
 * Beyond the grammar it refuses a member name that appears twice in one object (RFC 8259 leaves
 * that to the reader), a number too large for a double, nesting deeper than a limit (default
 * {@value #DEFAULT_MAX_DEPTH} containers), so a hostile file cannot exhaust the stack, and a text
 * longer than a limit (default {@value #DEFAULT_MAX_BYTES} bytes, or characters for a text given
 * as a string), so a wrong file cannot exhaust the heap. Escaped surrogate pairs
 * ({@code \}{@code uD83D}{@code \}{@code uDE00}) become one character outside the Basic
 * Multilingual Plane.
 *
 * <p>This is the project's one JSON reader: chain files, raw capture sidecars, skew tables, slot
 * mapping files and every test that looks into a report read through it, with the same limits.
 * Every fault is a {@link JsonParseException} whose message reads
 * {@code source line L column C at POINTER: what was found and what was expected}, where POINTER
 * is the RFC 6901 JSON pointer of the offending place ({@code the top level} for the whole text).
 */
public final class JsonReader {
    /** The default nesting limit. */
    public static final int DEFAULT_MAX_DEPTH = 64;
    /** The default size limit: bytes of a file, or characters of a text. */
    public static final int DEFAULT_MAX_BYTES = 4 << 20;

    private final String source;
    private final String s;
    private final int maxDepth;
    private int pos;
    private int line = 1;
    private int lineStart;
    /** The path to the value being read: member names, or null where an array index stands. */
    private final String[] names;
    /** Array indices of the path, where {@link #names} holds null. */
    private final int[] indices;
    /** How many path segments are valid. */
    private int segments;

    private JsonReader(String source, String text, int maxDepth) {
        this.source = source;
        this.s = text;
        this.maxDepth = maxDepth;
        this.names = new String[maxDepth];
        this.indices = new int[maxDepth];
    }

    /**
     * Reads a UTF-8 file that holds exactly one JSON value, within the default limits. Only a
     * regular file is read ({@link InputFiles}); the size limit counts the bytes read.
     *
     * @param file      the file
     * @param shownName what to call the file in messages (usually as the user named it)
     * @return the value
     * @throws JsonParseException naming the file, line, column and JSON pointer of a fault, a file
     *                            over {@value #DEFAULT_MAX_BYTES} bytes, or bytes that are not UTF-8
     * @throws IOException        if the file cannot be read (a missing file is a
     *                            {@link java.nio.file.NoSuchFileException})
     */
    public static JsonValue read(Path file, String shownName) throws IOException {
        byte[] bytes = InputFiles.readAtMost(file, shownName, DEFAULT_MAX_BYTES);
        if (bytes.length > DEFAULT_MAX_BYTES) {
            throw new JsonParseException(shownName, 1, 1, "", "the file has more than " + DEFAULT_MAX_BYTES
                    + " bytes; expected at most " + DEFAULT_MAX_BYTES + " bytes of JSON");
        }
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            throw notUtf8(shownName, bytes);
        }
        return parse(shownName, text);
    }

    /** Names the first byte that is not UTF-8 by line and column (columns count bytes here). */
    private static JsonParseException notUtf8(String shownName, byte[] bytes) {
        var dec = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        ByteBuffer in = ByteBuffer.wrap(bytes);
        java.nio.CharBuffer out = java.nio.CharBuffer.allocate(bytes.length + 1);
        dec.decode(in, out, true);
        int bad = in.position();
        int ln = 1;
        int start = 0;
        for (int i = 0; i < bad; i++) {
            if (bytes[i] == '\n') {
                ln++;
                start = i + 1;
            }
        }
        return new JsonParseException(shownName, ln, bad - start + 1, "",
                String.format(Locale.ROOT, "byte 0x%02X is not UTF-8; expected a UTF-8 text", bytes[bad] & 0xff));
    }

    /**
     * Parses a text that holds exactly one JSON value.
     *
     * @param source what to call the text in messages (a file name)
     * @param text   the text
     * @return the value
     * @throws JsonParseException naming source, line and column
     */
    public static JsonValue parse(String source, String text) {
        return parse(source, text, DEFAULT_MAX_DEPTH);
    }

    /**
     * Parses a text that holds exactly one JSON value, with a nesting limit.
     *
     * @param source   what to call the text in messages (a file name)
     * @param text     the text
     * @param maxDepth most containers nested in one another, at least 1
     * @return the value
     * @throws JsonParseException naming source, line and column
     */
    public static JsonValue parse(String source, String text, int maxDepth) {
        if (maxDepth < 1) {
            throw new IllegalArgumentException("maxDepth must be at least 1, got " + maxDepth);
        }
        if (text.length() > DEFAULT_MAX_BYTES) {
            throw new JsonParseException(source, 1, 1, "", "the text has " + text.length() + " characters; expected at most "
                    + DEFAULT_MAX_BYTES + " characters of JSON");
        }
        JsonReader r = new JsonReader(source, text, maxDepth);
        if (text.startsWith("\uFEFF")) {
            r.pos = 1;
            r.lineStart = 1;
        }
        r.ws();
        JsonValue v = r.value(0);
        r.ws();
        if (r.pos != text.length()) {
            throw r.error(r.pos, "expected the end of the file after the top-level value, found " + r.found());
        }
        return v;
    }

    private JsonParseException error(int at, String what) {
        int ln = 1;
        int start = 0;
        for (int i = 0; i < at && i < s.length(); i++) {
            if (s.charAt(i) == '\n') {
                ln++;
                start = i + 1;
            }
        }
        int col = at - start + 1;
        if (start == 0 && s.startsWith("\uFEFF")) {
            col--;
        }
        return new JsonParseException(source, ln, col, pointer(), what);
    }

    /** The RFC 6901 pointer of the current path. */
    private String pointer() {
        StringBuilder p = new StringBuilder();
        for (int i = 0; i < segments; i++) {
            p.append('/');
            if (names[i] == null) {
                p.append(indices[i]);
            } else {
                p.append(names[i].replace("~", "~0").replace("/", "~1"));
            }
        }
        return p.toString();
    }

    /** The character at pos, described for a message. */
    private String found() {
        if (pos >= s.length()) {
            return "the end of the file";
        }
        char c = s.charAt(pos);
        if (c < 0x20 || c == 0x7f || Character.isSurrogate(c) || Character.isWhitespace(c) || Character.isSpaceChar(c) || c == 0xFEFF) {
            return String.format(Locale.ROOT, "U+%04X", (int) c);
        }
        return "'" + c + "'";
    }

    private void ws() {
        while (pos < s.length()) {
            char c = s.charAt(pos);
            if (c == '\n') {
                line++;
                lineStart = pos + 1;
            } else if (c != ' ' && c != '\t' && c != '\r') {
                return;
            }
            pos++;
        }
    }

    private int column() {
        return pos - lineStart + 1;
    }

    private JsonValue value(int depth) {
        if (pos >= s.length()) {
            throw error(pos, "unexpected end of file, expected a value");
        }
        char c = s.charAt(pos);
        switch (c) {
            case '{':
            case '[':
                if (depth >= maxDepth) {
                    throw error(pos, "nesting deeper than " + maxDepth + " levels; expected at most " + maxDepth
                            + " objects and arrays inside one another");
                }
                return c == '{' ? object(depth + 1) : array(depth + 1);
            case '"': {
                int ln = line;
                int col = column();
                return new JsonValue(JsonValue.Kind.STRING, string(), null, ln, col);
            }
            case 't':
                return literal("true", JsonValue.Kind.BOOLEAN, Boolean.TRUE);
            case 'f':
                return literal("false", JsonValue.Kind.BOOLEAN, Boolean.FALSE);
            case 'n':
                return literal("null", JsonValue.Kind.NULL, null);
            default:
                if (c == '-' || (c >= '0' && c <= '9')) {
                    return number();
                }
                throw error(pos, "expected a value, found " + found());
        }
    }

    private JsonValue literal(String word, JsonValue.Kind kind, Object v) {
        if (!s.startsWith(word, pos)) {
            throw error(pos, "expected '" + word + "'");
        }
        JsonValue out = new JsonValue(kind, v, null, line, column());
        pos += word.length();
        return out;
    }

    private JsonValue object(int depth) {
        int ln = line;
        int col = column();
        Map<String, JsonValue> m = new LinkedHashMap<>();
        pos++;
        ws();
        if (pos < s.length() && s.charAt(pos) == '}') {
            pos++;
            return new JsonValue(JsonValue.Kind.OBJECT, Collections.unmodifiableMap(m), null, ln, col);
        }
        int seg = segments;
        while (true) {
            ws();
            if (pos >= s.length() || s.charAt(pos) != '"') {
                throw error(pos, "expected a quoted member name");
            }
            int at = pos;
            String k = string();
            names[seg] = k;
            segments = seg + 1;
            if (m.containsKey(k)) {
                throw error(at, "member " + JsonWriter.quote(k) + " appears twice; expected each name once in an object");
            }
            ws();
            if (pos >= s.length() || s.charAt(pos) != ':') {
                throw error(pos, "expected ':' after member name " + JsonWriter.quote(k));
            }
            pos++;
            ws();
            JsonValue v = value(depth);
            m.put(k, v);
            boolean more = another('}', "an object");
            segments = seg;
            if (!more) {
                return new JsonValue(JsonValue.Kind.OBJECT, Collections.unmodifiableMap(m), null, ln, col);
            }
        }
    }

    private JsonValue array(int depth) {
        int ln = line;
        int col = column();
        List<JsonValue> l = new ArrayList<>();
        pos++;
        ws();
        if (pos < s.length() && s.charAt(pos) == ']') {
            pos++;
            return new JsonValue(JsonValue.Kind.ARRAY, Collections.unmodifiableList(l), null, ln, col);
        }
        int seg = segments;
        names[seg] = null;
        while (true) {
            ws();
            indices[seg] = l.size();
            segments = seg + 1;
            l.add(value(depth));
            boolean more = another(']', "an array");
            segments = seg;
            if (!more) {
                return new JsonValue(JsonValue.Kind.ARRAY, Collections.unmodifiableList(l), null, ln, col);
            }
        }
    }

    /**
     * After a member or element: true (and past the comma) if another one follows, false (and
     * past the bracket) if the container closes here.
     */
    private boolean another(char close, String what) {
        ws();
        char c = pos < s.length() ? s.charAt(pos) : 0;
        if (c == ',' || c == close) {
            pos++;
            return c == ',';
        }
        throw error(pos, "expected ',' or '" + close + "' in " + what + ", found " + found());
    }

    private String string() {
        int start = pos;
        pos++;
        StringBuilder b = null;
        int run = pos;
        while (true) {
            if (pos >= s.length()) {
                throw error(start, "unterminated string");
            }
            char c = s.charAt(pos);
            if (c == '"') {
                String out = b == null ? s.substring(run, pos) : b.append(s, run, pos).toString();
                pos++;
                return out;
            }
            if (c < 0x20) {
                throw error(pos, String.format(Locale.ROOT, "control character U+%04X in a string (write it as an escape)", (int) c));
            }
            if (c != '\\') {
                pos++;
                continue;
            }
            if (b == null) {
                b = new StringBuilder();
            }
            b.append(s, run, pos);
            int esc = pos;
            pos++;
            if (pos >= s.length()) {
                throw error(esc, "unterminated escape");
            }
            char e = s.charAt(pos++);
            switch (e) {
                case '"', '\\', '/' -> b.append(e);
                case 'b' -> b.append('\b');
                case 'f' -> b.append('\f');
                case 'n' -> b.append('\n');
                case 'r' -> b.append('\r');
                case 't' -> b.append('\t');
                case 'u' -> {
                    int v = 0;
                    for (int i = 0; i < 4; i++) {
                        int d = pos < s.length() ? hex(s.charAt(pos)) : -1;
                        if (d < 0) {
                            throw error(esc, "bad \\u escape, expected four hex digits");
                        }
                        v = v * 16 + d;
                        pos++;
                    }
                    b.append((char) v);
                }
                default -> throw error(esc, "unknown escape '\\" + e + "'; expected one of \\\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX");
            }
            run = pos;
        }
    }

    private JsonValue number() {
        int ln = line;
        int col = column();
        int start = pos;
        while (pos < s.length() && "0123456789.eE+-".indexOf(s.charAt(pos)) >= 0) {
            pos++;
        }
        String t = s.substring(start, pos);
        if (!wellFormed(t)) {
            throw error(start, "malformed number '" + t + "'");
        }
        double d = Double.parseDouble(t);
        if (Double.isInfinite(d)) {
            throw error(start, "number '" + t + "' is too large for a double");
        }
        return new JsonValue(JsonValue.Kind.NUMBER, d, t, ln, col);
    }

    /** RFC 8259 section 6: {@code -? (0 | [1-9][0-9]*) (. [0-9]+)? ([eE] [+-]? [0-9]+)?}. */
    private static boolean wellFormed(String t) {
        int i = 0;
        int n = t.length();
        if (i < n && t.charAt(i) == '-') {
            i++;
        }
        if (i < n && t.charAt(i) == '0') {
            i++;
        } else {
            int d = digits(t, i);
            if (d == i) {
                return false;
            }
            i = d;
        }
        if (i < n && t.charAt(i) == '.') {
            int d = digits(t, i + 1);
            if (d == i + 1) {
                return false;
            }
            i = d;
        }
        if (i < n && (t.charAt(i) == 'e' || t.charAt(i) == 'E')) {
            i++;
            if (i < n && (t.charAt(i) == '+' || t.charAt(i) == '-')) {
                i++;
            }
            int d = digits(t, i);
            if (d == i) {
                return false;
            }
            i = d;
        }
        return i == n;
    }

    private static int hex(char c) {
        if (c >= '0' && c <= '9') {
            return c - '0';
        }
        if (c >= 'a' && c <= 'f') {
            return c - 'a' + 10;
        }
        if (c >= 'A' && c <= 'F') {
            return c - 'A' + 10;
        }
        return -1;
    }

    private static int digits(String t, int i) {
        while (i < t.length() && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
            i++;
        }
        return i;
    }
}
