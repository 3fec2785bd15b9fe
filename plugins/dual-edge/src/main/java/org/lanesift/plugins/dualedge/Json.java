package org.lanesift.plugins.dualedge;

import java.util.Locale;

/** A minimal JSON writer for the report: objects, arrays, strings, numbers (non-finite as null). */
final class Json {
    private final StringBuilder sb = new StringBuilder(4096);
    private boolean needComma;
    private int depth;

    Json beginObject() {
        sep();
        sb.append('{');
        depth++;
        needComma = false;
        return this;
    }

    Json endObject() {
        depth--;
        newline();
        sb.append('}');
        needComma = true;
        return this;
    }

    Json beginArray() {
        sep();
        sb.append('[');
        needComma = false;
        return this;
    }

    Json endArray() {
        sb.append(']');
        needComma = true;
        return this;
    }

    Json key(String k) {
        if (needComma) {
            sb.append(',');
        }
        newline();
        string(k);
        sb.append(": ");
        needComma = false;
        return this;
    }

    Json value(String s) {
        sep();
        if (s == null) {
            sb.append("null");
        } else {
            string(s);
        }
        needComma = true;
        return this;
    }

    Json value(double d) {
        sep();
        if (!Double.isFinite(d)) {
            sb.append("null");
        } else if (d == Math.rint(d) && Math.abs(d) < 1e15) {
            sb.append((long) d);
        } else {
            sb.append(String.format(Locale.ROOT, "%.9g", d).replaceAll("0+(e|$)", "$1").replaceAll("\\.(e|$)", "$1"));
        }
        needComma = true;
        return this;
    }

    Json value(long v) {
        sep();
        sb.append(v);
        needComma = true;
        return this;
    }

    Json value(boolean b) {
        sep();
        sb.append(b);
        needComma = true;
        return this;
    }

    private void sep() {
        if (needComma) {
            sb.append(", ");
        }
    }

    private void newline() {
        sb.append('\n');
        for (int i = 0; i < depth; i++) {
            sb.append("  ");
        }
    }

    private void string(String s) {
        sb.append('"');
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
                        sb.append(String.format(Locale.ROOT, "\\u%04x", (int) c));
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        sb.append('"');
    }

    @Override
    public String toString() {
        return sb.toString();
    }
}
