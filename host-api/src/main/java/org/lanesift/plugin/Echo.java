package org.lanesift.plugin;

/**
 * How a message shows text that came from the user's files or command line: control characters
 * (NUL, ESC, line breaks, DEL, C1 controls) escaped as {@code \xNN} or {@code \}{@code uNNNN}, and
 * cut to a short length, so an error line stays one readable line whatever the input held and never
 * carries more of a file than the offending token.
 */
public final class Echo {
    /** Characters of an echoed value kept by {@link #of(String)}. */
    public static final int VALUE_CHARS = 60;

    private Echo() {
    }

    /**
     * An echoed value, escaped and cut to {@link #VALUE_CHARS}.
     *
     * @param s the text as found
     * @return the text to put in a message
     */
    public static String of(String s) {
        return of(s, VALUE_CHARS);
    }

    /**
     * Text escaped and cut to at most {@code maxChars} characters of the original, with a note of
     * how much was left out.
     *
     * @param s        the text as found (null shows as "null")
     * @param maxChars characters of the original to keep, at least 1
     * @return the text to put in a message
     */
    public static String of(String s, int maxChars) {
        if (s == null) {
            return "null";
        }
        int keep = Math.min(s.length(), Math.max(1, maxChars));
        if (keep < s.length() && Character.isHighSurrogate(s.charAt(keep - 1))) {
            keep--;
        }
        StringBuilder sb = new StringBuilder(keep + 16);
        escape(s, 0, keep, sb);
        if (keep < s.length()) {
            sb.append("...(").append(s.length()).append(" characters)");
        }
        return sb.toString();
    }

    /**
     * Escapes control characters; keeps everything else.
     *
     * @param s the text
     * @return the escaped text, as long as needed
     */
    public static String escape(String s) {
        StringBuilder sb = new StringBuilder(s.length() + 8);
        escape(s, 0, s.length(), sb);
        return sb.toString();
    }

    private static void escape(String s, int from, int to, StringBuilder sb) {
        for (int i = from; i < to; i++) {
            char c = s.charAt(i);
            if (c < 0x20 || c == 0x7f) {
                sb.append(String.format(java.util.Locale.ROOT, "\\x%02X", (int) c));
            } else if ((c >= 0x80 && c < 0xa0) || c == 0x2028 || c == 0x2029 || c == 0xfeff) {
                sb.append(String.format(java.util.Locale.ROOT, "\\u%04X", (int) c));
            } else {
                sb.append(c);
            }
        }
    }
}
