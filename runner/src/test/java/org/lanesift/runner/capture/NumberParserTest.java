package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The hand-written CSV number parser against the reference, {@link Double#parseDouble} of the
 * JDK (which rounds correctly, Java SE API specification of Double.valueOf), on a large random
 * corpus: printf-style %e and %f at every precision, shortest round-trip forms, long digit
 * strings with extreme exponents (the fallback path), and the same numbers written with a decimal
 * comma by the JDK's German and French locales. Equality is bit for bit.
 */
class NumberParserTest {
    private final NumberParser np = new NumberParser();

    private void same(String text, boolean decimalComma) {
        byte[] b = text.getBytes(StandardCharsets.ISO_8859_1);
        double got = np.parse(b, 0, b.length, decimalComma);
        assertTrue(np.ok, () -> "rejected '" + text + "'");
        double want = Double.parseDouble(decimalComma ? text.replace(',', '.') : text);
        // the one-pass field parser of the CSV reader, with a separator and another field after it
        byte sep = decimalComma ? (byte) ';' : (byte) ',';
        byte[] row = (text + (char) sep + "9").getBytes(StandardCharsets.ISO_8859_1);
        double field = np.parseField(row, 0, row.length, sep, decimalComma);
        assertTrue(np.ok && np.stop == b.length, () -> "field parser stopped wrongly in '" + text + "'");
        assertEquals(Double.doubleToLongBits(want), Double.doubleToLongBits(field), () -> "field '" + text + "'");
        if (Double.doubleToLongBits(got) != Double.doubleToLongBits(want)) {
            assertEquals(want, got, 0.0, "'" + text + "' parsed as " + got + ", Double.parseDouble gives " + want);
            assertEquals(Double.doubleToLongBits(want), Double.doubleToLongBits(got), "sign of zero for '" + text + "'");
        }
    }

    private static double randomDouble(Random r) {
        return switch (r.nextInt(4)) {
            case 0 -> Double.longBitsToDouble(r.nextLong());          // anything, all exponents
            case 1 -> (r.nextDouble() - 0.5) * Math.pow(10, r.nextInt(40) - 20);
            case 2 -> r.nextGaussian() * 0.2 + 1.2;                     // volts around a common mode
            default -> (r.nextInt(2_000_001) - 1_000_000) * 1e-9;       // times on a ns grid
        };
    }

    @Test
    void printfAndShortestFormsMatchTheJdk() {
        Random r = new Random(20261201L);
        int n = 0;
        while (n < 150_000) {
            double x = randomDouble(r);
            if (!Double.isFinite(x)) {
                continue;
            }
            int prec = r.nextInt(18);
            same(String.format(Locale.ROOT, "%." + prec + "e", x), false);
            same(Double.toString(x), false);
            if (Math.abs(x) < 1e12) {
                same(String.format(Locale.ROOT, "%." + prec + "f", x), false);
            }
            n++;
        }
    }

    @Test
    void decimalCommaLocalesMatchTheJdk() {
        Random r = new Random(7L);
        Locale[] locales = {Locale.GERMANY, Locale.FRANCE, new Locale("es", "ES"), new Locale("pl", "PL")};
        int checked = 0;
        for (int i = 0; i < 150_000; i++) {
            double x = randomDouble(r);
            if (!Double.isFinite(x) || Math.abs(x) > 1e12) {
                continue;
            }
            Locale loc = locales[i % locales.length];
            int prec = r.nextInt(16);
            String e = String.format(loc, "%." + prec + "e", x);
            String f = String.format(loc, "%." + prec + "f", x);
            assertTrue(prec == 0 || f.contains(","), () -> "locale " + loc + " wrote '" + f + "' without a decimal comma");
            same(e, true);
            same(f, true);
            checked += 2;
        }
        assertTrue(checked > 250_000);
    }

    @Test
    void longDigitStringsAndExtremeExponentsMatchTheJdk() {
        Random r = new Random(99L);
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < 200_000; i++) {
            sb.setLength(0);
            if (r.nextBoolean()) {
                sb.append(r.nextBoolean() ? '-' : '+');
            }
            int digits = 1 + r.nextInt(25);
            int point = r.nextInt(digits + 1);
            for (int k = 0; k < digits; k++) {
                if (k == point) {
                    sb.append('.');
                }
                sb.append((char) ('0' + r.nextInt(10)));
            }
            if (r.nextInt(3) > 0) {
                sb.append(r.nextBoolean() ? 'e' : 'E').append(r.nextInt(700) - 350);
            }
            same(sb.toString(), false);
            same(sb.toString().replace('.', ','), true);
        }
    }

    @ParameterizedTest
    @ValueSource(strings = {"", "-", "+", ".", "e5", "1e", "1e+", "1.2.3", "--1", "1-", "abc", "0x10", "1,5", "1 2", "1e5x",
        "nan1", "infinit", "12f", "1d"})
    void rejectsWhatIsNotANumber(String text) {
        byte[] b = text.getBytes(StandardCharsets.ISO_8859_1);
        np.parse(b, 0, b.length, false);
        assertFalse(np.ok, "accepted '" + text + "'");
    }

    @ParameterizedTest
    @ValueSource(strings = {"1.234,5", "1,2,3", "1.5"})
    void decimalCommaModeRejectsDotsAndGrouping(String text) {
        byte[] b = text.getBytes(StandardCharsets.ISO_8859_1);
        np.parse(b, 0, b.length, true);
        assertFalse(np.ok, "accepted '" + text + "' with a decimal comma");
    }

    @Test
    void specialValuesAndSpaces() {
        byte[] b = "  NaN ".getBytes(StandardCharsets.ISO_8859_1);
        assertTrue(Double.isNaN(np.parse(b, 0, b.length, false)) && np.ok);
        b = "-Infinity".getBytes(StandardCharsets.ISO_8859_1);
        assertEquals(Double.NEGATIVE_INFINITY, np.parse(b, 0, b.length, false));
        b = " 2.5e-3\r".getBytes(StandardCharsets.ISO_8859_1);
        assertEquals(2.5e-3, np.parse(b, 0, b.length, false));
        assertEquals(-4, np.lastExp10, "2.5e-3 is printed to 1e-4");
    }
}
