package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitStream;

/**
 * The byte-buffer CSV writers against oracles on seeded random blocks: the bits CSV byte for byte
 * against the writer before issue 19 ({@link LegacyBitsCsvWriter}); the analog CSV cell by cell,
 * times against exact decimal seconds ({@link Texts#seconds}) and volts read back with
 * {@link Float#parseFloat} as the very float written.
 */
class CsvGoldenTest {
    @TempDir
    Path tmp;

    private static long[] bits(Random r, int n, int oneIn) {
        long[] b = new long[(n + 63) / 64];
        for (int i = 0; i < n; i++) {
            if (r.nextInt(oneIn) == 0) {
                b[i >> 6] |= 1L << i;
            }
        }
        return b;
    }

    private static long time(Random r) {
        return switch (r.nextInt(4)) {
            case 0 -> r.nextLong();
            case 1 -> r.nextInt(2_000_000_000) * 1000L;
            case 2 -> -r.nextInt(1_000_000);
            default -> r.nextBoolean() ? Long.MIN_VALUE : Long.MAX_VALUE - 1;
        };
    }

    @Test
    void bitsCsvIsTheOldWritersByteForByte() throws Exception {
        Random r = new Random(1903L);
        Path a = tmp.resolve("old.csv");
        Path b = tmp.resolve("new.csv");
        try (LegacyBitsCsvWriter old = new LegacyBitsCsvWriter(a); BitsCsvWriter now = new BitsCsvWriter(b)) {
            for (int k = 0; k < 40; k++) {
                int n = r.nextInt(5000);
                long[] t = new long[n];
                long[] edge = new long[n];
                long[] setup = new long[n];
                long[] hold = new long[n];
                for (int i = 0; i < n; i++) {
                    t[i] = time(r);
                    edge[i] = r.nextInt(3) == 0 ? r.nextLong() : r.nextInt(1_000_000);
                    setup[i] = r.nextInt(5) == 0 ? BitStream.UNKNOWN_MARGIN : time(r);
                    hold[i] = r.nextInt(5) == 0 ? BitStream.UNKNOWN_MARGIN : time(r);
                }
                byte[] slot = null;
                if (r.nextBoolean()) {
                    slot = new byte[n];
                    r.nextBytes(slot);
                }
                BitStream s = new BitStream("d", 0, 1, n, bits(r, n, 2), t, edge, bits(r, n, 2), slot, setup, hold, bits(r, n, 9),
                        1000.0);
                old.write(s);
                now.write(s);
            }
        }
        assertArrayEquals(Files.readAllBytes(a), Files.readAllBytes(b));
    }

    @Test
    void analogCsvHasExactTimesAndVoltsThatReadBack() throws Exception {
        Random r = new Random(1904L);
        Path f = tmp.resolve("a.csv");
        AnalogBlock block;
        try (AnalogCsvWriter w = new AnalogCsvWriter(f, "lane0 P")) {
            int n = 20_000;
            float[] v = new float[n];
            for (int i = 0; i < n; i++) {
                v[i] = r.nextInt(3) == 0 ? Float.intBitsToFloat(r.nextInt()) : (float) (r.nextGaussian() * 0.2 + 1.2);
            }
            long[] invalid = bits(r, n, 10);
            block = new AnalogBlock("lane0 P", 3, -1_000_000_007L, 400_000.3, v, n, invalid);
            w.write(block);
        }
        List<String> lines = Files.readAllLines(f);
        assertEquals("time (s),lane0 P (V)", lines.get(0));
        assertEquals(block.length() + 1, lines.size());
        for (int i = 0; i < block.length(); i++) {
            String[] cells = lines.get(i + 1).split(",", -1);
            assertEquals(Texts.seconds(block.timeFs(i)), cells[0]);
            if (block.isValid(i)) {
                float want = block.volts()[i];
                if (Float.isNaN(want)) {
                    assertEquals("NaN", cells[1]);
                    continue;
                }
                assertEquals(Float.floatToRawIntBits(want), Float.floatToRawIntBits(Float.parseFloat(cells[1])), cells[1]);
            } else {
                assertEquals("", cells[1]);
            }
        }
    }
}
