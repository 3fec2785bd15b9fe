package org.lanesift.runner.capture;

/**
 * Parses decimal numbers straight from bytes, without building strings, as fast as the CSV reader
 * needs. Accepts an optional sign, digits with one decimal mark ('.' or, in decimal-comma mode,
 * ','), an optional exponent ({@code e}/{@code E}, optional sign, digits), and {@code nan},
 * {@code inf}, {@code infinity} in any case. Surrounding spaces are skipped.
 *
 * <p>The result is the correctly rounded double, the same as {@link Double#parseDouble}: numbers
 * with at most 15-16 significant digits ({@code < 2^53}) and a decimal exponent within +/-22 are
 * converted exactly with one multiplication or division of two exactly representable doubles
 * (Clinger's fast path, W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990);
 * the rare others fall back to {@link Double#parseDouble}.
 *
 * <p>Not thread-safe: {@link #ok} reports the last call.
 */
final class NumberParser {
    private static final double[] POW10 = {
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
        1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
    private static final long TWO53 = 1L << 53;


    /** Whether the last {@link #parse} call found a number. */
    boolean ok;
    /** Decimal exponent of the last digit of the last number read (its printing resolution is 10^this). */
    int lastExp10;
    private char[] scratch = new char[64];

    /**
     * Parses {@code b[from, to)}.
     *
     * @param b            bytes
     * @param from         first byte
     * @param to           end, exclusive
     * @param decimalComma whether ',' is the decimal mark (then '.' is not accepted)
     * @return the value; check {@link #ok} for failure
     */
    double parse(byte[] b, int from, int to, boolean decimalComma) {
        while (from < to && (b[from] == ' ' || b[from] == '\t')) {
            from++;
        }
        while (to > from && (b[to - 1] == ' ' || b[to - 1] == '\t' || b[to - 1] == '\r')) {
            to--;
        }
        double v = scan(b, from, to, decimalComma);
        if (ok && stop != to) {
            ok = false;
        }
        return v;
    }

    /**
     * Parses one field that starts at {@code from} and ends at the next {@code sep} or at
     * {@code limit}, in one pass. On success {@link #ok} is set and {@link #stop} is the index of
     * the separator (or {@code limit}); on failure the caller falls back to {@link #parse}.
     */
    double parseField(byte[] b, int from, int limit, byte sep, boolean decimalComma) {
        while (from < limit && b[from] == ' ') {
            from++;
        }
        double v = scan(b, from, limit, decimalComma);
        if (ok) {
            int j = stop;
            while (j < limit && (b[j] == ' ' || (b[j] == '\t' && sep != '\t'))) {
                j++;
            }
            if (j < limit && b[j] != sep) {
                ok = false;
            }
            stop = j;
        }
        return v;
    }

    /** Index just after the number the last call read. */
    int stop;

    private double scan(byte[] b, int from, int to, boolean decimalComma) {
        ok = false;
        int i = from;
        if (i >= to) {
            return 0;
        }
        boolean neg = false;
        if (b[i] == '-' || b[i] == '+') {
            neg = b[i] == '-';
            i++;
        }
        byte mark = decimalComma ? (byte) ',' : (byte) '.';
        long m = 0;            // the first 18 significant digits
        int nd = 0;            // digits in m from the first non-zero one
        int tail = 0;          // significant digits beyond those 18
        int frac = 0;          // digits after the decimal mark
        int digits = 0;
        int inFrac = 0;
        boolean dropped = false; // a non-zero digit did not fit into m
        for (; i < to; i++) {
            int c = b[i];
            int d = c - '0';
            if (d >= 0 && d <= 9) {
                digits++;
                frac += inFrac;
                if (nd < 18) {
                    m = m * 10 + d;
                    if (m != 0) {
                        nd++;
                    }
                } else {
                    tail++;
                    dropped |= d != 0;
                }
            } else if (c == mark && inFrac == 0) {
                inFrac = 1;
            } else {
                break;
            }
        }
        int exp10 = tail - frac;
        if (digits == 0) {
            int j = i;
            while (j < to && ((b[j] | 0x20) >= 'a' && (b[j] | 0x20) <= 'z')) {
                j++;
            }
            stop = j;
            return special(b, from, j, neg);
        }
        if (i < to && (b[i] == 'e' || b[i] == 'E')) {
            i++;
            boolean eneg = false;
            if (i < to && (b[i] == '-' || b[i] == '+')) {
                eneg = b[i] == '-';
                i++;
            }
            int e = 0;
            int ed = 0;
            for (; i < to; i++) {
                int d = b[i] - '0';
                if (d < 0 || d > 9) {
                    break;
                }
                ed++;
                if (e < 100_000) {
                    e = e * 10 + d;
                }
            }
            if (ed == 0) {
                stop = i;
                return 0;
            }
            exp10 += eneg ? -e : e;
        }
        stop = i;
        ok = true;
        lastExp10 = exp10 - tail;
        if (m == 0) {
            return neg ? -0.0 : 0.0;
        }
        if (m >= TWO53 && !dropped) {
            while (m % 10 == 0) { // trailing zeros of a long mantissa
                m /= 10;
                exp10++;
            }
        }
        if (!dropped && m < TWO53 && exp10 >= -22 && exp10 <= 22) {
            double v = m;
            v = exp10 < 0 ? v / POW10[-exp10] : v * POW10[exp10];
            return neg ? -v : v;
        }
        return slow(b, from, i, decimalComma);
    }

    private double special(byte[] b, int from, int to, boolean neg) {
        int start = from;
        if (b[start] == '-' || b[start] == '+') {
            start++;
        }
        int n = to - start;
        if (n == 3 && lower(b, start, "nan")) {
            ok = true;
            return Double.NaN;
        }
        if ((n == 3 && lower(b, start, "inf")) || (n == 8 && lower(b, start, "infinity"))) {
            ok = true;
            return neg ? Double.NEGATIVE_INFINITY : Double.POSITIVE_INFINITY;
        }
        return 0;
    }

    private static boolean lower(byte[] b, int from, String word) {
        for (int k = 0; k < word.length(); k++) {
            if ((b[from + k] | 0x20) != word.charAt(k)) {
                return false;
            }
        }
        return true;
    }

    private double slow(byte[] b, int from, int to, boolean decimalComma) {
        int n = to - from;
        if (scratch.length < n) {
            scratch = new char[n];
        }
        for (int k = 0; k < n; k++) {
            char c = (char) (b[from + k] & 0xff);
            scratch[k] = decimalComma && c == ',' ? '.' : c;
        }
        try {
            return Double.parseDouble(new String(scratch, 0, n));
        } catch (NumberFormatException e) {
            ok = false;
            return 0;
        }
    }
}
