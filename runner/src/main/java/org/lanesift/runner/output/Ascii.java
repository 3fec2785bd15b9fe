package org.lanesift.runner.output;

/**
 * The writers' one number formatter: primitive values as ASCII text written straight into a
 * {@code byte[]}, with no {@code String} per number and no allocation per value. Each method writes
 * at {@code at} and returns the position after the text; the caller makes room for at most
 * {@link #MAX_NUMBER} bytes per number.
 *
 * <ul>
 * <li>{@link #putLong}: decimal integer, the text of {@link Long#toString(long)};</li>
 * <li>{@link #putSecondsFs}: a femtosecond count as exact decimal seconds, without trailing zeros
 * ({@code -1234} becomes {@code -0.000000000001234}); no floating-point rounding is involved;</li>
 * <li>{@link #putBinary}: an unsigned binary number, the text of {@link Long#toBinaryString(long)};</li>
 * <li>{@link #putFloat}: a float as the shortest decimal (at most 9 significant digits) that reads
 * back as the same float, laid out as {@link Float#toString(float)} lays it out ({@code 0.1},
 * {@code 1.0}, {@code 1.0E-4}).</li>
 * </ul>
 */
final class Ascii {
    /** The longest text of one number: a binary long (64 digits). */
    static final int MAX_NUMBER = 64;
    private static final long PER_S = 1_000_000_000_000_000L;
    /** "00".."99": two digits at a time. */
    private static final byte[] PAIRS = new byte[200];
    /** "0000".."9999": four digits at a time. */
    private static final byte[] QUADS = new byte[40_000];
    /** Powers of ten that a double holds exactly, 1e0 to 1e22. */
    private static final double[] POW10 = new double[23];

    static {
        for (int i = 0; i < 100; i++) {
            PAIRS[2 * i] = (byte) ('0' + i / 10);
            PAIRS[2 * i + 1] = (byte) ('0' + i % 10);
        }
        for (int i = 0; i < 10_000; i++) {
            QUADS[4 * i] = (byte) ('0' + i / 1000);
            QUADS[4 * i + 1] = (byte) ('0' + i / 100 % 10);
            QUADS[4 * i + 2] = (byte) ('0' + i / 10 % 10);
            QUADS[4 * i + 3] = (byte) ('0' + i % 10);
        }
        double p = 1;
        for (int i = 0; i < POW10.length; i++) {
            POW10[i] = p;
            p *= 10;
        }
    }

    private Ascii() {
    }

    /** Number of decimal digits of a non-negative long. */
    static int digits(long v) {
        long p = 10;
        for (int i = 1; i < 19; i++) {
            if (v < p) {
                return i;
            }
            p *= 10;
        }
        return 19;
    }

    /**
     * Writes a long in decimal.
     *
     * @param dst destination
     * @param at  where to start
     * @param v   the value
     * @return position after the text
     */
    static int putLong(byte[] dst, int at, long v) {
        if (v < 0) {
            if (v == Long.MIN_VALUE) {
                // |MIN_VALUE| does not fit a long: write "-922337203685477580" then the last digit
                dst[at++] = '-';
                at = putDigits(dst, at, 922337203685477580L, 18);
                dst[at++] = '8';
                return at;
            }
            dst[at++] = '-';
            v = -v;
        }
        return putDigits(dst, at, v, digits(v));
    }

    /** Writes a non-negative value as exactly {@code n} digits, zero-padded on the left. */
    static int putDigits(byte[] dst, int at, long v, int n) {
        int end = at + n;
        int i = end;
        // eight digits at a time (two table look-ups of four), then four, then two
        while (v >= 100_000_000L && i - 8 >= at) {
            long q = v / 100_000_000L;
            int r = (int) (v - q * 100_000_000L);
            v = q;
            int hi = r / 10_000;
            int lo = r - hi * 10_000;
            i -= 8;
            System.arraycopy(QUADS, 4 * hi, dst, i, 4);
            System.arraycopy(QUADS, 4 * lo, dst, i + 4, 4);
        }
        int w = (int) v; // below 10^8 now (or n was too small, which callers never ask)
        while (w >= 10_000) {
            int q = w / 10_000;
            int d = w - q * 10_000;
            w = q;
            i -= 4;
            System.arraycopy(QUADS, 4 * d, dst, i, 4);
        }
        while (w >= 100) {
            int q = w / 100;
            int d = w - q * 100;
            w = q;
            dst[--i] = PAIRS[2 * d + 1];
            dst[--i] = PAIRS[2 * d];
        }
        if (w >= 10) {
            dst[--i] = PAIRS[2 * w + 1];
            dst[--i] = PAIRS[2 * w];
        } else {
            dst[--i] = (byte) ('0' + w);
        }
        while (i > at) {
            dst[--i] = '0';
        }
        return end;
    }

    /**
     * Writes femtoseconds as exact decimal seconds.
     *
     * @param dst destination
     * @param at  where to start
     * @param fs  time in femtoseconds
     * @return position after the text
     */
    static int putSecondsFs(byte[] dst, int at, long fs) {
        long whole = fs / PER_S;
        long frac = fs % PER_S;
        if (fs < 0) {
            dst[at++] = '-';
            whole = -whole; // at most 9223: no overflow, even for Long.MIN_VALUE
            frac = -frac;
        }
        at = putDigits(dst, at, whole, digits(whole));
        if (frac != 0) {
            dst[at++] = '.';
            int n = 15;
            while (frac % 10 == 0) {
                frac /= 10;
                n--;
            }
            at = putDigits(dst, at, frac, n);
        }
        return at;
    }

    /**
     * Writes the bits of a value in binary without leading zeros ({@code 0} for zero).
     *
     * @param dst destination
     * @param at  where to start
     * @param v   the value, taken as unsigned
     * @return position after the text
     */
    static int putBinary(byte[] dst, int at, long v) {
        int n = Math.max(1, 64 - Long.numberOfLeadingZeros(v));
        for (int i = n - 1; i >= 0; i--) {
            dst[at++] = (byte) ('0' + ((v >>> i) & 1L));
        }
        return at;
    }

    /**
     * Writes a float as the shortest decimal that reads back as the same float (at most 9
     * significant digits; a candidate too close to the float's rounding boundary for the
     * double-precision check to be sure is skipped in favour of one more digit), in the layout of
     * {@link Float#toString(float)}: plain from 10<sup>-3</sup> up to below 10<sup>7</sup> with at
     * least one digit after the point, otherwise {@code d.dddE[-]n}. NaN, the infinities and
     * subnormal floats are written by {@link Float#toString(float)} (they allocate; they are rare).
     *
     * @param dst destination
     * @param at  where to start
     * @param f   the value
     * @return position after the text
     */
    static int putFloat(byte[] dst, int at, float f) {
        if (!Float.isFinite(f) || (f != 0 && Math.abs(f) < Float.MIN_NORMAL)) {
            String s = Float.toString(f);
            for (int i = 0; i < s.length(); i++) {
                dst[at++] = (byte) s.charAt(i);
            }
            return at;
        }
        if (Float.floatToRawIntBits(f) < 0) {
            dst[at++] = '-';
            f = -f;
        }
        if (f == 0) {
            dst[at++] = '0';
            dst[at++] = '.';
            dst[at++] = '0';
            return at;
        }
        double x = f;
        // half the distance to each neighbour: the float's rounding interval (exact in double)
        double below = (x - Math.nextDown(f)) / 2;
        double above = (Math.nextUp(f) - x) / 2;
        int e10 = (int) Math.floor(Math.log10(x));
        // x / 10^e10 is within [1, 10): a float is never within 1e-16 of a power of ten it is not equal to
        double m = scale(x, -e10);
        if (m < 1) {
            e10--;
        } else if (m >= 10) {
            e10++;
        }
        long digits = 0;
        int k;
        for (k = 1; k < 9; k++) {
            int s = k - 1 - e10; // scale so that k digits are left of the point
            double r = scale(x, s);
            digits = Math.round(r);
            double err = digits - r;
            double limit = scale(err >= 0 ? above : below, s);
            // the scaled values carry a few roundings of relative size 2^-53; stay well clear
            if (Math.abs(err) < limit - 1e-13 * r) {
                break;
            }
        }
        if (k == 9) {
            // 9 digits are always within the interval (half a unit of the 9th digit is at most
            // 5e-9 of the value, half a float step at least 2^-25 of it)
            digits = Math.round(scale(x, 8 - e10));
        }
        if (digits == POW10_LONG[k]) {
            digits /= 10; // rounded up to the next power of ten
            e10++;
        }
        while (k > 1 && digits % 10 == 0) {
            digits /= 10;
            k--;
        }
        return layout(dst, at, digits, k, e10);
    }

    private static final long[] POW10_LONG = {1L, 10L, 100L, 1_000L, 10_000L, 100_000L, 1_000_000L, 10_000_000L,
        100_000_000L, 1_000_000_000L, 10_000_000_000L};

    /** x times 10^s, by exact powers of ten (at most three roundings for a float's range). */
    private static double scale(double x, int s) {
        while (s > 22) {
            x *= POW10[22];
            s -= 22;
        }
        while (s < -22) {
            x /= POW10[22];
            s += 22;
        }
        return s >= 0 ? x * POW10[s] : x / POW10[-s];
    }

    /** Writes digits d1.d2...dk x 10^e10 as Float.toString lays it out. */
    private static int layout(byte[] dst, int at, long digits, int k, int e10) {
        int start = at;
        at = putDigits(dst, at, digits, k); // the k significant digits, to be moved into place
        if (e10 >= -3 && e10 < 7) {
            if (e10 >= 0) {
                int intDigits = e10 + 1;
                if (k <= intDigits) {
                    // whole number: pad with zeros, then ".0"
                    for (int i = k; i < intDigits; i++) {
                        dst[at++] = '0';
                    }
                    dst[at++] = '.';
                    dst[at++] = '0';
                    return at;
                }
                // insert the point after intDigits digits
                System.arraycopy(dst, start + intDigits, dst, start + intDigits + 1, k - intDigits);
                dst[start + intDigits] = '.';
                return at + 1;
            }
            int zeros = -e10 - 1; // 0.000ddd
            System.arraycopy(dst, start, dst, start + 2 + zeros, k);
            dst[start] = '0';
            dst[start + 1] = '.';
            for (int i = 0; i < zeros; i++) {
                dst[start + 2 + i] = '0';
            }
            return start + 2 + zeros + k;
        }
        // d.dddE[-]n
        if (k == 1) {
            dst[at++] = '.';
            dst[at++] = '0';
        } else {
            System.arraycopy(dst, start + 1, dst, start + 2, k - 1);
            dst[start + 1] = '.';
            at++;
        }
        dst[at++] = 'E';
        return putLong(dst, at, e10);
    }
}
