package org.lanesift.plugins.deskew;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * A minimal JSON reader and number formatter for the skew table, so the plugin needs nothing
 * beyond the JDK (RFC 8259 grammar). Objects become {@code LinkedHashMap} (order kept, duplicate
 * keys rejected), arrays {@code ArrayList}, numbers {@code Double}, plus String, Boolean and
 * {@link #NULL}. Errors name the source, the line and column, and what was expected.
 */
final class Json {
    /** The JSON literal null. */
    static final Object NULL = new Object() {
        @Override
        public String toString() {
            return "null";
        }
    };

    /** Nesting limit, so a hostile file cannot exhaust the stack. */
    private static final int MAX_DEPTH = 64;

    private final String source;
    private final String s;
    private int pos;

    private Json(String source, String text) {
        this.source = source;
        this.s = text;
    }

    /** A syntax error with position. */
    static final class ParseException extends IllegalArgumentException {
        private static final long serialVersionUID = 1L;

        ParseException(String message) {
            super(message);
        }
    }

    /**
     * Parses one JSON value that fills the whole text.
     *
     * @param source file name for messages
     * @param text   the text
     * @return the value
     */
    static Object parse(String source, String text) {
        Json p = new Json(source, text);
        p.ws();
        Object v = p.value(0);
        p.ws();
        if (p.pos != p.s.length()) {
            throw p.error("expected the end of the file after the top-level value");
        }
        return v;
    }

    private ParseException error(String what) {
        int line = 1;
        int col = 1;
        for (int i = 0; i < pos && i < s.length(); i++) {
            if (s.charAt(i) == '\n') {
                line++;
                col = 1;
            } else {
                col++;
            }
        }
        return new ParseException(source + ":" + line + ":" + col + ": " + what);
    }

    private void ws() {
        while (pos < s.length()) {
            char c = s.charAt(pos);
            if (c == ' ' || c == '\t' || c == '\n' || c == '\r') {
                pos++;
            } else {
                break;
            }
        }
    }

    private Object value(int depth) {
        if (depth > MAX_DEPTH) {
            throw error("nesting deeper than " + MAX_DEPTH + " levels");
        }
        if (pos >= s.length()) {
            throw error("unexpected end of file, expected a value");
        }
        char c = s.charAt(pos);
        switch (c) {
            case '{':
                return object(depth);
            case '[':
                return array(depth);
            case '"':
                return string();
            case 't':
                return literal("true", Boolean.TRUE);
            case 'f':
                return literal("false", Boolean.FALSE);
            case 'n':
                return literal("null", NULL);
            default:
                if (c == '-' || (c >= '0' && c <= '9')) {
                    return number();
                }
                throw error("unexpected character '" + c + "', expected a value");
        }
    }

    private Object literal(String word, Object v) {
        if (!s.startsWith(word, pos)) {
            throw error("expected '" + word + "'");
        }
        pos += word.length();
        return v;
    }

    private Map<String, Object> object(int depth) {
        Map<String, Object> m = new LinkedHashMap<>();
        pos++;
        ws();
        if (pos < s.length() && s.charAt(pos) == '}') {
            pos++;
            return m;
        }
        while (true) {
            ws();
            if (pos >= s.length() || s.charAt(pos) != '"') {
                throw error("expected a quoted member name");
            }
            int at = pos;
            String k = string();
            ws();
            if (pos >= s.length() || s.charAt(pos) != ':') {
                throw error("expected ':' after member name \"" + k + "\"");
            }
            pos++;
            ws();
            Object v = value(depth + 1);
            if (m.containsKey(k)) {
                pos = at;
                throw error("member \"" + k + "\" appears twice");
            }
            m.put(k, v);
            ws();
            if (pos < s.length() && s.charAt(pos) == ',') {
                pos++;
                continue;
            }
            if (pos < s.length() && s.charAt(pos) == '}') {
                pos++;
                return m;
            }
            throw error("expected ',' or '}' in an object");
        }
    }

    private List<Object> array(int depth) {
        List<Object> l = new ArrayList<>();
        pos++;
        ws();
        if (pos < s.length() && s.charAt(pos) == ']') {
            pos++;
            return l;
        }
        while (true) {
            ws();
            l.add(value(depth + 1));
            ws();
            if (pos < s.length() && s.charAt(pos) == ',') {
                pos++;
                continue;
            }
            if (pos < s.length() && s.charAt(pos) == ']') {
                pos++;
                return l;
            }
            throw error("expected ',' or ']' in an array");
        }
    }

    private String string() {
        StringBuilder b = new StringBuilder();
        pos++;
        while (true) {
            if (pos >= s.length()) {
                throw error("unterminated string");
            }
            char c = s.charAt(pos++);
            if (c == '"') {
                return b.toString();
            }
            if (c < 0x20) {
                pos--;
                throw error("control character in a string (escape it)");
            }
            if (c != '\\') {
                b.append(c);
                continue;
            }
            if (pos >= s.length()) {
                throw error("unterminated escape");
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
                    if (pos + 4 > s.length()) {
                        throw error("short \\u escape");
                    }
                    try {
                        b.append((char) Integer.parseInt(s.substring(pos, pos + 4), 16));
                    } catch (NumberFormatException ex) {
                        throw error("bad \\u escape, expected four hex digits");
                    }
                    pos += 4;
                }
                default -> {
                    pos--;
                    throw error("unknown escape '\\" + e + "'");
                }
            }
        }
    }

    private Double number() {
        int start = pos;
        if (s.charAt(pos) == '-') {
            pos++;
        }
        while (pos < s.length() && "0123456789.eE+-".indexOf(s.charAt(pos)) >= 0) {
            pos++;
        }
        String t = s.substring(start, pos);
        if (!t.matches("-?(0|[1-9][0-9]*)(\\.[0-9]+)?([eE][+-]?[0-9]+)?")) {
            pos = start;
            throw error("malformed number '" + t + "'");
        }
        return Double.parseDouble(t);
    }

    /**
     * Quotes a string for JSON.
     *
     * @param v the text
     * @return the quoted text
     */
    static String quote(String v) {
        StringBuilder b = new StringBuilder("\"");
        for (int i = 0; i < v.length(); i++) {
            char c = v.charAt(i);
            switch (c) {
                case '"' -> b.append("\\\"");
                case '\\' -> b.append("\\\\");
                case '\n' -> b.append("\\n");
                case '\r' -> b.append("\\r");
                case '\t' -> b.append("\\t");
                default -> {
                    if (c < 0x20) {
                        b.append(String.format(Locale.ROOT, "\\u%04x", (int) c));
                    } else {
                        b.append(c);
                    }
                }
            }
        }
        return b.append('"').toString();
    }

    /**
     * Formats a finite number so that parsing it back gives the same double.
     *
     * @param d the number
     * @return JSON number text
     */
    static String number(double d) {
        if (!Double.isFinite(d)) {
            throw new IllegalArgumentException("JSON cannot hold " + d);
        }
        if (d == Math.rint(d) && Math.abs(d) < 1e15) {
            return Long.toString((long) d);
        }
        return Double.toString(d).replace('E', 'e');
    }
}
