package org.lanesift.plugins.pixellink;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * A small strict JSON reader for mapping tables (objects, arrays, strings, numbers, booleans,
 * null). Errors name the source, line and column. Values are {@code Map}, {@code List},
 * {@code String}, {@code Double}, {@code Boolean} or {@code null}.
 */
final class MiniJson {
    private final String src;
    private final String where;
    private int pos;

    private MiniJson(String src, String where) {
        this.src = src;
        this.where = where;
    }

    /** Thrown for malformed JSON; the message names the source, line and column. */
    static final class JsonError extends Exception {
        private static final long serialVersionUID = 1L;

        JsonError(String message) {
            super(message);
        }
    }

    static Object parse(String text, String where) throws JsonError {
        MiniJson p = new MiniJson(text, where);
        p.ws();
        Object v = p.value(0);
        p.ws();
        if (p.pos != p.src.length()) {
            throw p.error("unexpected text after the JSON value");
        }
        return v;
    }

    private JsonError error(String what) {
        int line = 1;
        int col = 1;
        for (int i = 0; i < pos && i < src.length(); i++) {
            if (src.charAt(i) == '\n') {
                line++;
                col = 1;
            } else {
                col++;
            }
        }
        return new JsonError(where + ": line " + line + ", column " + col + ": " + what);
    }

    private void ws() {
        while (pos < src.length()) {
            char c = src.charAt(pos);
            if (c == ' ' || c == '\t' || c == '\n' || c == '\r') {
                pos++;
            } else {
                break;
            }
        }
    }

    private Object value(int depth) throws JsonError {
        if (depth > 64) {
            throw error("nesting deeper than 64 levels");
        }
        if (pos >= src.length()) {
            throw error("expected a value, found the end of the text");
        }
        char c = src.charAt(pos);
        switch (c) {
            case '{':
                return object(depth);
            case '[':
                return array(depth);
            case '"':
                return string();
            case 't':
                return word("true", Boolean.TRUE);
            case 'f':
                return word("false", Boolean.FALSE);
            case 'n':
                return word("null", null);
            default:
                if (c == '-' || (c >= '0' && c <= '9')) {
                    return number();
                }
                throw error("expected a value, found '" + c + "'");
        }
    }

    private Object word(String w, Object v) throws JsonError {
        if (!src.startsWith(w, pos)) {
            throw error("expected '" + w + "'");
        }
        pos += w.length();
        return v;
    }

    private Map<String, Object> object(int depth) throws JsonError {
        Map<String, Object> m = new LinkedHashMap<>();
        pos++;
        ws();
        if (pos < src.length() && src.charAt(pos) == '}') {
            pos++;
            return m;
        }
        while (true) {
            ws();
            if (pos >= src.length() || src.charAt(pos) != '"') {
                throw error("expected a member name in double quotes");
            }
            String k = string();
            ws();
            if (pos >= src.length() || src.charAt(pos) != ':') {
                throw error("expected ':' after member name \"" + k + "\"");
            }
            pos++;
            ws();
            if (m.containsKey(k)) {
                throw error("member \"" + k + "\" appears twice");
            }
            m.put(k, value(depth + 1));
            ws();
            if (pos < src.length() && src.charAt(pos) == ',') {
                pos++;
                continue;
            }
            if (pos < src.length() && src.charAt(pos) == '}') {
                pos++;
                return m;
            }
            throw error("expected ',' or '}' in object");
        }
    }

    private List<Object> array(int depth) throws JsonError {
        List<Object> l = new ArrayList<>();
        pos++;
        ws();
        if (pos < src.length() && src.charAt(pos) == ']') {
            pos++;
            return l;
        }
        while (true) {
            ws();
            l.add(value(depth + 1));
            ws();
            if (pos < src.length() && src.charAt(pos) == ',') {
                pos++;
                continue;
            }
            if (pos < src.length() && src.charAt(pos) == ']') {
                pos++;
                return l;
            }
            throw error("expected ',' or ']' in array");
        }
    }

    private String string() throws JsonError {
        StringBuilder sb = new StringBuilder();
        pos++;
        while (true) {
            if (pos >= src.length()) {
                throw error("unterminated string");
            }
            char c = src.charAt(pos++);
            if (c == '"') {
                return sb.toString();
            }
            if (c < 0x20) {
                throw error("control character in string");
            }
            if (c == '\\') {
                if (pos >= src.length()) {
                    throw error("unterminated escape");
                }
                char e = src.charAt(pos++);
                switch (e) {
                    case '"', '\\', '/' -> sb.append(e);
                    case 'b' -> sb.append('\b');
                    case 'f' -> sb.append('\f');
                    case 'n' -> sb.append('\n');
                    case 'r' -> sb.append('\r');
                    case 't' -> sb.append('\t');
                    case 'u' -> {
                        if (pos + 4 > src.length()) {
                            throw error("short \\u escape");
                        }
                        try {
                            sb.append((char) Integer.parseInt(src.substring(pos, pos + 4), 16));
                        } catch (NumberFormatException ex) {
                            throw error("bad \\u escape");
                        }
                        pos += 4;
                    }
                    default -> throw error("bad escape '\\" + e + "'");
                }
            } else {
                sb.append(c);
            }
        }
    }

    private Double number() throws JsonError {
        int start = pos;
        if (src.charAt(pos) == '-') {
            pos++;
        }
        while (pos < src.length()) {
            char c = src.charAt(pos);
            if ((c >= '0' && c <= '9') || c == '.' || c == 'e' || c == 'E' || c == '+' || c == '-') {
                pos++;
            } else {
                break;
            }
        }
        try {
            return Double.valueOf(src.substring(start, pos));
        } catch (NumberFormatException e) {
            pos = start;
            throw error("malformed number");
        }
    }

    /** Escapes a string for JSON output, with quotes. */
    static String quote(String s) {
        StringBuilder sb = new StringBuilder(s.length() + 2).append('"');
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> sb.append("\\\"");
                case '\\' -> sb.append("\\\\");
                case '\n' -> sb.append("\\n");
                case '\r' -> sb.append("\\r");
                case '\t' -> sb.append("\\t");
                default -> {
                    if (c < 0x20) {
                        sb.append(String.format("\\u%04x", (int) c));
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        return sb.append('"').toString();
    }
}
