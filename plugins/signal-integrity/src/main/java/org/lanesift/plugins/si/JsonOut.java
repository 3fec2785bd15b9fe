package org.lanesift.plugins.si;

import java.nio.charset.StandardCharsets;
import java.util.Locale;

/**
 * A small JSON writer for the reports of this module (the module depends on host-api only). It
 * writes pretty-printed objects and arrays; non-finite numbers are written as {@code null}.
 */
final class JsonOut {
    private final StringBuilder sb = new StringBuilder();
    private int depth;
    private boolean first = true;
    private boolean afterName;

    JsonOut beginObject() {
        open('{');
        return this;
    }

    JsonOut endObject() {
        close('}');
        return this;
    }

    JsonOut beginArray() {
        open('[');
        return this;
    }

    JsonOut endArray() {
        close(']');
        return this;
    }

    JsonOut name(String n) {
        comma();
        newline();
        str(n);
        sb.append(": ");
        afterName = true;
        return this;
    }

    JsonOut value(double d) {
        before();
        num(d);
        return this;
    }

    JsonOut value(long l) {
        before();
        sb.append(l);
        return this;
    }

    JsonOut value(String s) {
        before();
        if (s == null) {
            sb.append("null");
        } else {
            str(s);
        }
        return this;
    }

    JsonOut value(boolean b) {
        before();
        sb.append(b);
        return this;
    }

    JsonOut field(String n, double d) {
        return name(n).value(d);
    }

    JsonOut field(String n, long l) {
        return name(n).value(l);
    }

    JsonOut field(String n, String s) {
        return name(n).value(s);
    }

    JsonOut field(String n, boolean b) {
        return name(n).value(b);
    }

    /** Writes a compact array of numbers on one line. */
    JsonOut numbers(String n, double[] values, int count) {
        name(n);
        before();
        sb.append('[');
        for (int i = 0; i < count; i++) {
            if (i > 0) {
                sb.append(", ");
            }
            num(values[i]);
        }
        sb.append(']');
        return this;
    }

    /** Writes a compact array of integers on one line. */
    JsonOut numbers(String n, long[] values, int count) {
        name(n);
        before();
        sb.append('[');
        for (int i = 0; i < count; i++) {
            if (i > 0) {
                sb.append(", ");
            }
            sb.append(values[i]);
        }
        sb.append(']');
        return this;
    }

    byte[] bytes() {
        return (sb.toString() + "\n").getBytes(StandardCharsets.UTF_8);
    }

    @Override
    public String toString() {
        return sb.toString();
    }

    private void num(double d) {
        if (!Double.isFinite(d)) {
            sb.append("null");
        } else if (d == Math.rint(d) && Math.abs(d) < 1e15) {
            sb.append((long) d);
        } else {
            sb.append(String.format(Locale.ROOT, "%.9g", d).replaceFirst("(\\.\\d*?)0+(e|$)", "$1$2").replace(".e", "e")
                    .replaceFirst("\\.$", ""));
        }
    }

    private void open(char c) {
        before();
        sb.append(c);
        depth++;
        first = true;
    }

    private void close(char c) {
        depth--;
        if (!first) {
            newline();
        }
        sb.append(c);
        first = false;
    }

    private void before() {
        if (afterName) {
            afterName = false;
            return;
        }
        comma();
        if (depth > 0) {
            newline();
        }
    }

    private void comma() {
        if (!first) {
            sb.append(',');
        }
        first = false;
    }

    private void newline() {
        sb.append('\n');
        for (int i = 0; i < depth; i++) {
            sb.append("  ");
        }
    }

    private void str(String s) {
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
}
