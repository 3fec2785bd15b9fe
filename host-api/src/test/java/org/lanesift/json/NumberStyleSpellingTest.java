package org.lanesift.json;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link NumberStyle} formats in Locale.US for speed; its text must stay what the Locale.ROOT
 * spelling gives, digit for digit, over numbers of every sign and magnitude.
 */
class NumberStyleSpellingTest {

    /** The Locale.ROOT spelling: format, then drop trailing zeros of the mantissa (significant digits). */
    private static String rootSignificant(double v, int digits) {
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        String t = String.format(Locale.ROOT, "%." + digits + "g", v);
        int e = t.indexOf('e');
        String mant = e < 0 ? t : t.substring(0, e);
        if (mant.indexOf('.') >= 0) {
            mant = mant.replaceAll("0+$", "").replaceAll("\\.$", "");
        }
        return mant + (e < 0 ? "" : t.substring(e));
    }

    @Test
    void significantAndDecimalsMatchTheRootLocaleSpelling() {
        Random r = new Random(19);
        int[] sig = {1, 3, 6, 9, 17};
        int[] dec = {0, 3, 6, 17};
        for (int i = 0; i < 4_000; i++) {
            double v = switch (i % 4) {
                case 0 -> r.nextGaussian();
                case 1 -> (r.nextBoolean() ? 1 : -1) * r.nextDouble() * Math.pow(10, r.nextInt(60) - 30);
                case 2 -> Double.longBitsToDouble(r.nextLong());
                default -> (r.nextInt(2_000_000) - 1_000_000) / 1000.0;
            };
            if (!Double.isFinite(v)) {
                continue;
            }
            for (int d : sig) {
                assertEquals(rootSignificant(v, d), NumberStyle.significant(d).format(v), "significant(" + d + ") of " + v);
            }
            for (int d : dec) {
                assertEquals(String.format(Locale.ROOT, "%." + d + "f", v), NumberStyle.decimals(d).format(v),
                        "decimals(" + d + ") of " + v);
            }
        }
    }
}
