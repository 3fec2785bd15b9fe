package org.lanesift.runner.output;

/** Exact text forms shared by the writers. */
final class Texts {
    private Texts() {
    }

    /**
     * Femtoseconds as exact decimal seconds, e.g. {@code -1234} becomes {@code -0.000000000001234}
     * (the text of {@link Ascii#putSecondsFs}).
     */
    static String seconds(long fs) {
        byte[] b = new byte[Ascii.MAX_NUMBER];
        return new String(b, 0, Ascii.putSecondsFs(b, 0, fs), java.nio.charset.StandardCharsets.US_ASCII);
    }

    /** A name safe for file names and VCD references: letters, digits, '_', '-' and '.'. */
    static String safe(String s) {
        StringBuilder sb = new StringBuilder(s.length());
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            sb.append((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' || c == '-'
                    || c == '.' ? c : '_');
        }
        return sb.length() == 0 ? "_" : sb.toString();
    }

    static String hex(byte[] b) {
        StringBuilder sb = new StringBuilder(b.length * 2);
        for (byte x : b) {
            sb.append(Character.forDigit((x >> 4) & 15, 16)).append(Character.forDigit(x & 15, 16));
        }
        return sb.toString();
    }
}
