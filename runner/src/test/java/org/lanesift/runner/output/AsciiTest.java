package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.nio.charset.StandardCharsets;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The writers' number formatter against the JDK as oracle, on large seeded corpora: longs against
 * {@link Long#toString(long)}, binary against {@link Long#toBinaryString(long)}, femtoseconds as
 * seconds against exact decimal arithmetic ({@link BigDecimal}), floats read back by
 * {@link Float#parseFloat} and by {@link Double#parseDouble} then narrowed (both must give the same
 * float, bit for bit) and never longer than {@link Float#toString(float)}.
 */
class AsciiTest {
    private final byte[] buf = new byte[Ascii.MAX_NUMBER + 8];

    private String text(int end) {
        return new String(buf, 3, end - 3, StandardCharsets.US_ASCII);
    }

    /** Longs of every length: uniform bits, small, near powers of ten, and the extremes. */
    private static long randomLong(Random r) {
        return switch (r.nextInt(5)) {
            case 0 -> r.nextLong();
            case 1 -> r.nextLong() >> r.nextInt(64);
            case 2 -> (long) Math.pow(10, r.nextInt(19)) + r.nextInt(3) - 1;
            case 3 -> -(long) Math.pow(10, r.nextInt(19)) + r.nextInt(3) - 1;
            default -> r.nextInt(2001) - 1000;
        };
    }

    @Test
    void longsAreLongToString() {
        Random r = new Random(19_1L);
        for (long v : new long[] {0, 1, -1, 9, 10, 99, 100, Long.MAX_VALUE, Long.MIN_VALUE, Long.MIN_VALUE + 1}) {
            assertEquals(Long.toString(v), text(Ascii.putLong(buf, 3, v)));
        }
        for (int i = 0; i < 500_000; i++) {
            long v = randomLong(r);
            assertEquals(Long.toString(v), text(Ascii.putLong(buf, 3, v)));
        }
    }

    @Test
    void binaryIsLongToBinaryString() {
        Random r = new Random(19_2L);
        for (int i = 0; i < 200_000; i++) {
            long v = i < 3 ? i - 1 : randomLong(r);
            assertEquals(Long.toBinaryString(v), text(Ascii.putBinary(buf, 3, v)));
        }
    }

    @Test
    void secondsAreExactDecimals() {
        Random r = new Random(19_3L);
        for (int i = 0; i < 500_000; i++) {
            long fs = i == 0 ? Long.MIN_VALUE : i == 1 ? Long.MAX_VALUE : i == 2 ? 0 : randomLong(r);
            // Source: java.math.BigDecimal, exact decimal arithmetic of the JDK
            String want = BigDecimal.valueOf(fs).movePointLeft(15).stripTrailingZeros().toPlainString();
            assertEquals(want, text(Ascii.putSecondsFs(buf, 3, fs)), () -> "fs " + fs);
        }
        assertEquals("-0.000000000001234", text(Ascii.putSecondsFs(buf, 3, -1234)));
        assertEquals("0.0000000025", text(Ascii.putSecondsFs(buf, 3, 2_500_000)));
    }

    private static float randomFloat(Random r) {
        return switch (r.nextInt(5)) {
            case 0 -> Float.intBitsToFloat(r.nextInt());                    // anything, all exponents
            case 1 -> (float) ((r.nextDouble() - 0.5) * Math.pow(10, r.nextInt(24) - 12));
            case 2 -> (float) (r.nextGaussian() * 0.2 + 1.2);               // volts around a common mode
            case 3 -> (r.nextInt(20001) - 10000) * 1e-4f;                    // volts on a coarse grid
            default -> (float) Math.pow(10, r.nextInt(20) - 10) * (r.nextBoolean() ? 1 : -1);
        };
    }

    @Test
    void floatsReadBackExactlyAndAreNeverLongerThanTheJdks() {
        Random r = new Random(19_4L);
        int same = 0;
        int n = 0;
        for (int i = 0; i < 500_000; i++) {
            float f = i < 6 ? new float[] {0f, -0f, 1f, 0.1f, 1e7f, 1e-3f}[i] : randomFloat(r);
            String got = text(Ascii.putFloat(buf, 3, f));
            String jdk = Float.toString(f);
            if (Float.isNaN(f)) {
                assertEquals(jdk, got);
                continue;
            }
            n++;
            assertEquals(Float.floatToRawIntBits(f), Float.floatToRawIntBits(Float.parseFloat(got)), () -> f + " written " + got);
            assertEquals(Float.floatToRawIntBits(f), Float.floatToRawIntBits((float) Double.parseDouble(got)),
                    () -> f + " written " + got);
            assertTrue(got.length() <= jdk.length(), () -> got + " is longer than " + jdk);
            same += got.equals(jdk) ? 1 : 0;
        }
        // the layout is the JDK's; the texts differ where the JDK 17 writes more digits than needed (about 4 %)
        assertTrue(same > 0.9 * n, same + " of " + n + " as Float.toString");
        assertEquals("1.0", text(Ascii.putFloat(buf, 3, 1f)));
        assertEquals("-0.0", text(Ascii.putFloat(buf, 3, -0f)));
        assertEquals("1.0E7", text(Ascii.putFloat(buf, 3, 1e7f)));
        assertEquals("1.0E-4", text(Ascii.putFloat(buf, 3, 1e-4f)));
        assertEquals("0.001", text(Ascii.putFloat(buf, 3, 1e-3f)));
        assertEquals("1234567.0", text(Ascii.putFloat(buf, 3, 1234567f)));
        assertEquals("1.25", text(Ascii.putFloat(buf, 3, 1.25f)));
    }
}
