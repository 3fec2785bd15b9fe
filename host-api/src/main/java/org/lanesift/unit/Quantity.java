package org.lanesift.unit;

import java.util.List;
import java.util.Locale;

/**
 * The one parser of numbers with SI prefixes and units, as users write them on the command line
 * and in chain files: {@code 10cm}, {@code 500MHz}, {@code 2ns}, {@code 4.7k}, {@code 450ohm},
 * {@code 1.5 us}. Prefixes are case-sensitive (m milli, M mega); micro is written {@code u},
 * U+00B5 or U+03BC. A value is returned in the unit the caller declares (which may itself carry a
 * prefix, such as {@code "mm"} or {@code "ps"}); a bare number is taken in that unit.
 *
 * <p>Source: SI Brochure, 9th edition (BIPM 2019), table 7 (SI prefixes), from memory; only the
 * prefixes from femto to tera are accepted, as no option of this program needs more.
 */
public final class Quantity {
    /** Prefix symbols, including the three spellings of micro. */
    private static final String[] PREFIXES = {"f", "p", "n", "u", "\u00b5", "\u03bc", "m", "c", "k", "M", "G", "T"};
    /** Powers of ten of {@link #PREFIXES}. */
    private static final int[] EXPONENTS = {-15, -12, -9, -6, -6, -6, -3, -2, 3, 6, 9, 12};
    /** Unit symbols a declared unit may be built from, with their accepted spellings (the first is the canonical one). */
    private static final List<List<String>> UNITS = List.of(
            List.of("s"), List.of("Hz"), List.of("V"), List.of("A"), List.of("W"), List.of("F"), List.of("H"),
            List.of("ohm", "ohms", "\u03a9", "\u2126"), List.of("m"), List.of("bit/s", "b/s", "bps"), List.of("B"));

    private Quantity() {
    }

    /**
     * Parses text such as {@code "10cm"} into a number of {@code unit}.
     *
     * @param text the text as written; a bare number (SI prefix allowed, as in {@code 4.7k}) is in {@code unit}
     * @param unit the declared unit, such as {@code "m"}, {@code "mm"}, {@code "Hz"}, {@code "ps"}, or empty for a plain number
     * @return the value in {@code unit}
     * @throws IllegalArgumentException naming what was expected, with an example
     */
    public static double parse(String text, String unit) {
        String u = unit == null ? "" : unit;
        String t = text == null ? "" : text.trim();
        Base declared = base(u);
        double declaredScale = declared == null ? 1 : declared.scale;
        String rest = t;
        double scale = 1;
        boolean hadUnit = false;
        if (declared != null) {
            for (String spelling : UNITS.get(declared.index)) {
                if (rest.endsWith(spelling)) {
                    rest = rest.substring(0, rest.length() - spelling.length()).trim();
                    hadUnit = true;
                    break;
                }
            }
        }
        int end = numberEnd(rest);
        String num = rest.substring(0, end);
        String prefix = rest.substring(end).trim();
        if (!prefix.isEmpty()) {
            int p = prefixIndex(prefix);
            if (p < 0) {
                throw new IllegalArgumentException(expected(u, text));
            }
            scale = Math.pow(10, EXPONENTS[p]);
        } else if (!hadUnit) {
            scale = declaredScale; // a bare number is in the declared unit
        }
        double v;
        try {
            v = Double.parseDouble(num);
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException(expected(u, text));
        }
        if (num.isEmpty() || !Double.isFinite(v)) {
            throw new IllegalArgumentException(expected(u, text));
        }
        double r = v * scale / declaredScale;
        // undo the rounding of scale / declaredScale when both are powers of ten (10cm in mm is 100, not 100.00000000000001)
        double rounded = Double.parseDouble(String.format(Locale.ROOT, "%.15g", r));
        return Double.isFinite(rounded) ? rounded : r;
    }

    /**
     * The text of the expectation for a unit, with an example, as used in error messages.
     *
     * @param unit the declared unit
     * @param text what was given
     * @return such as {@code "expected a number in Hz (SI prefixes allowed, such as 500MHz), got 'fast'"}
     */
    public static String expected(String unit, String text) {
        String u = unit == null ? "" : unit;
        Base b = base(u);
        String canonical = b == null ? u : UNITS.get(b.index).get(0);
        return "expected a number" + (u.isEmpty() ? "" : " in " + u) + " (SI prefixes allowed, such as "
                + example(canonical) + "), got '" + text + "'";
    }

    private static String example(String base) {
        return switch (base) {
            case "ohm" -> "4.7kohm";
            case "Hz" -> "500MHz";
            case "s" -> "2ns";
            case "F" -> "10pF";
            case "V" -> "3.3V";
            case "W" -> "0.25W";
            case "m" -> "10cm";
            case "bit/s" -> "200Mbit/s";
            default -> "4.7k";
        };
    }

    /** A declared unit split into a known base unit and the scale of its prefix. */
    private record Base(int index, double scale) {
    }

    private static Base base(String unit) {
        if (unit.isEmpty()) {
            return null;
        }
        for (int i = 0; i < UNITS.size(); i++) {
            for (String spelling : UNITS.get(i)) {
                if (unit.equals(spelling)) {
                    return new Base(i, 1);
                }
                if (unit.endsWith(spelling)) {
                    int p = prefixIndex(unit.substring(0, unit.length() - spelling.length()));
                    if (p >= 0) {
                        return new Base(i, Math.pow(10, EXPONENTS[p]));
                    }
                }
            }
        }
        return null; // a unit without prefixes, such as "%" or "UI": the number is taken as written
    }

    private static int prefixIndex(String p) {
        for (int i = 0; i < PREFIXES.length; i++) {
            if (PREFIXES[i].equals(p)) {
                return i;
            }
        }
        return -1;
    }

    /**
     * The scale of a unit written with an optional prefix against its base unit: {@code scaleOf("ns", "s")} is 1e-9.
     *
     * @param written  such as {@code "ns"}, {@code "s"}, {@code "\u00b5s"}
     * @param baseUnit such as {@code "s"}
     * @return the scale, or NaN when {@code written} is not the base unit with an SI prefix
     */
    public static double scaleOf(String written, String baseUnit) {
        if (written.equals(baseUnit)) {
            return 1;
        }
        if (!written.endsWith(baseUnit)) {
            return Double.NaN;
        }
        int p = prefixIndex(written.substring(0, written.length() - baseUnit.length()));
        return p < 0 ? Double.NaN : Math.pow(10, EXPONENTS[p]);
    }

    /**
     * The length of the number at the start of {@code s}: sign, digits, point, and an exponent only
     * when digits follow the {@code e}.
     *
     * @param s the text
     * @return characters of the leading number, 0 if there is none
     */
    public static int numberLength(String s) {
        return numberEnd(s);
    }

    /** End of the leading number: sign, digits, point, exponent (an 'e' only when digits follow). */
    private static int numberEnd(String s) {
        int i = 0;
        if (i < s.length() && (s.charAt(i) == '+' || s.charAt(i) == '-')) {
            i++;
        }
        while (i < s.length() && (Character.isDigit(s.charAt(i)) || s.charAt(i) == '.')) {
            i++;
        }
        if (i < s.length() && (s.charAt(i) == 'e' || s.charAt(i) == 'E')) {
            int j = i + 1;
            if (j < s.length() && (s.charAt(j) == '+' || s.charAt(j) == '-')) {
                j++;
            }
            if (j < s.length() && Character.isDigit(s.charAt(j))) {
                while (j < s.length() && Character.isDigit(s.charAt(j))) {
                    j++;
                }
                i = j;
            }
        }
        return i;
    }

    /**
     * Writes a value with the SI prefix (femto to tera) that puts its magnitude in [1, 1000), to
     * four significant digits: {@code format(5.714e-9, "s")} is {@code "5.714 ns"},
     * {@code format(3.5e8, "Hz")} is {@code "350.0 MHz"}. Zero, values outside the prefixes' range
     * and non-finite values are written without a prefix.
     *
     * @param value the value in {@code unit}
     * @param unit  the unit symbol without prefix, such as {@code "s"} or {@code "Hz"}
     * @return the text
     */
    public static String format(double value, String unit) {
        double a = Math.abs(value);
        int exp = 0;
        if (a > 0 && Double.isFinite(a)) {
            exp = (int) Math.floor(Math.log10(a) / 3) * 3;
            // rounding to four digits may carry into the next prefix (999.96 -> 1000)
            if (Math.abs(Double.parseDouble(String.format(java.util.Locale.ROOT, "%.4g", value / Math.pow(10, exp)))) >= 1000) {
                exp += 3;
            }
            exp = Math.max(-15, Math.min(12, exp));
        }
        String prefix = "";
        for (int k = 0; k < PREFIXES.length; k++) {
            if (EXPONENTS[k] == exp && exp != -2) {
                prefix = PREFIXES[k];
                break;
            }
        }
        return String.format(java.util.Locale.ROOT, "%.4g", value / Math.pow(10, exp)) + " " + prefix + unit;
    }
}
