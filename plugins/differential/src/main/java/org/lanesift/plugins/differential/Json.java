package org.lanesift.plugins.differential;

import java.util.Locale;

/** A minimal JSON text writer for the level report (no dependency on a JSON library). */
final class Json {
    private final StringBuilder sb = new StringBuilder();
    private boolean first = true;

    Json begin(char c) {
        comma();
        sb.append(c);
        first = true;
        return this;
    }

    Json end(char c) {
        sb.append(c);
        first = false;
        return this;
    }

    Json key(String k) {
        comma();
        str(k);
        sb.append(':');
        first = true;
        return this;
    }

    Json value(String s) {
        comma();
        str(s);
        return this;
    }

    Json value(double d) {
        comma();
        if (Double.isFinite(d)) {
            sb.append(d == 0 ? "0" : new java.math.BigDecimal(d).round(new java.math.MathContext(9)).stripTrailingZeros().toString());
        } else {
            sb.append("null");
        }
        return this;
    }

    Json value(long v) {
        comma();
        sb.append(v);
        return this;
    }

    Json value(boolean v) {
        comma();
        sb.append(v);
        return this;
    }

    Json field(String k, String v) {
        return key(k).value(v);
    }

    Json field(String k, double v) {
        return key(k).value(v);
    }

    Json field(String k, long v) {
        return key(k).value(v);
    }

    Json field(String k, boolean v) {
        return key(k).value(v);
    }

    private void comma() {
        if (!first) {
            sb.append(',');
        }
        first = false;
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

    @Override
    public String toString() {
        return sb.toString();
    }
}
