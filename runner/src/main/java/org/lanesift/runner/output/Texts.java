package org.lanesift.runner.output;

/** Exact text forms shared by the writers. */
final class Texts {
    private Texts() {
    }

    /**
     * Femtoseconds as exact decimal seconds, e.g. {@code -1234} becomes {@code -0.000000000001234}.
     * No floating-point rounding is involved.
     */
    static void seconds(StringBuilder sb, long fs) {
        if (fs == Long.MIN_VALUE) {
            sb.append("-9223.372036854775808");
            return;
        }
        if (fs < 0) {
            sb.append('-');
            fs = -fs;
        }
        long whole = fs / 1_000_000_000_000_000L;
        long frac = fs % 1_000_000_000_000_000L;
        sb.append(whole);
        if (frac != 0) {
            sb.append('.');
            String f = Long.toString(frac);
            for (int i = f.length(); i < 15; i++) {
                sb.append('0');
            }
            int end = f.length();
            while (f.charAt(end - 1) == '0') {
                end--;
            }
            sb.append(f, 0, end);
        }
    }

    static String seconds(long fs) {
        StringBuilder sb = new StringBuilder(24);
        seconds(sb, fs);
        return sb.toString();
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
