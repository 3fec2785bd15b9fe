package org.lanesift.json;

import java.util.Locale;

/**
 * How a {@link JsonWriter} spells a {@code double}. Every style gives a valid RFC 8259 number and
 * refuses NaN and the infinities, which JSON cannot hold.
 *
 * <ul>
 *   <li>{@link #shortest()}: whole numbers below 10<sup>15</sup> without a fraction ({@code 12}),
 *       others as the shortest text that reads back as the same double ({@code 0.1},
 *       {@code 1.5e-7}).</li>
 *   <li>{@link #significant(int)}: whole numbers below 10<sup>15</sup> without a fraction, others
 *       rounded to that many significant digits with trailing zeros dropped ({@code 0.274999976},
 *       {@code 1.5e-07}: the exponent has at least two digits).</li>
 *   <li>{@link #decimals(int)}: always that many digits after the point ({@code 59.940476}).</li>
 * </ul>
 */
public final class NumberStyle {
    private static final NumberStyle SHORTEST = new NumberStyle(0, -1);

    /** 0 = shortest, 1 = significant digits, 2 = fixed decimals. */
    private final int kind;
    /** Digits or decimals. */
    private final int digits;
    /**
     * The locale the format strings run in. Locale.US spells these conversions exactly as
     * Locale.ROOT does ('0' to '9', '.', '-', no grouping), and the JDK's formatter takes its
     * digits and separator for Locale.US without building a DecimalFormatSymbols per call, which
     * was most of the cost of a report with many numbers (JFR profile of {@code lanesift bench}).
     */
    private static final Locale SPELLING = Locale.US;
    /** The format string for the kinds that use one. */
    private final String pattern;

    private NumberStyle(int kind, int digits) {
        this.kind = kind;
        this.digits = digits;
        this.pattern = kind == 1 ? "%." + digits + "g" : kind == 2 ? "%." + digits + "f" : null;
    }

    /**
     * The shortest text that reads back as the same double; whole numbers below 10<sup>15</sup>
     * have no fraction.
     *
     * @return the style
     */
    public static NumberStyle shortest() {
        return SHORTEST;
    }

    /**
     * Rounds to a number of significant digits and drops trailing zeros; whole numbers below
     * 10<sup>15</sup> are written exactly, without a fraction.
     *
     * @param digits significant digits, 1 to 17
     * @return the style
     * @throws IllegalArgumentException if digits is out of range
     */
    public static NumberStyle significant(int digits) {
        if (digits < 1 || digits > 17) {
            throw new IllegalArgumentException("significant digits must be 1 to 17, got " + digits);
        }
        return new NumberStyle(1, digits);
    }

    /**
     * A fixed number of digits after the decimal point, whole numbers included ({@code 60.000000}).
     *
     * @param places digits after the point, 0 to 17 (0 writes no point)
     * @return the style
     * @throws IllegalArgumentException if places is out of range
     */
    public static NumberStyle decimals(int places) {
        if (places < 0 || places > 17) {
            throw new IllegalArgumentException("decimal places must be 0 to 17, got " + places);
        }
        return new NumberStyle(2, places);
    }

    /**
     * Spells a number in this style.
     *
     * @param v a finite number
     * @return JSON number text
     * @throws IllegalArgumentException if v is NaN or infinite
     */
    public String format(double v) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("JSON cannot hold " + v);
        }
        if (kind == 2) {
            return String.format(SPELLING, pattern, v);
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        if (kind == 0) {
            return Double.toString(v).replace('E', 'e');
        }
        // The JDK's %g rounds the shortest decimal text of a double, not its exact value. For
        // normal doubles that text has 15 to 17 digits and the double rounding is off by less than
        // one unit in the last place of the double; below Double.MIN_NORMAL the text can be as
        // short as 10 digits, and 1.005579095e-314 (exactly 1.00557909496...e-314) came out as
        // 1.0055791e-314. There the exact value is rounded first, which %g then writes unchanged.
        Object arg = Math.abs(v) < Double.MIN_NORMAL
                ? new java.math.BigDecimal(v).round(new java.math.MathContext(digits, java.math.RoundingMode.HALF_UP))
                : (Object) v;
        String t = String.format(SPELLING, pattern, arg);
        int e = t.indexOf('e');
        String mant = e < 0 ? t : t.substring(0, e);
        String exp = e < 0 ? "" : t.substring(e);
        if (mant.indexOf('.') >= 0) {
            int end = mant.length();
            while (mant.charAt(end - 1) == '0') {
                end--;
            }
            if (mant.charAt(end - 1) == '.') {
                end--;
            }
            mant = mant.substring(0, end);
        }
        return mant + exp;
    }

    @Override
    public String toString() {
        return kind == 0 ? "shortest" : kind == 1 ? "significant(" + digits + ")" : "decimals(" + digits + ")";
    }
}
