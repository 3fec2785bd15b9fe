package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.AnalogBlock;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PortSpec;

/** The CSV source on the layouts scopes and analysers write (invented example files, see resources/capture). */
class CsvReaderTest {
    static Path res(String name) {
        return Path.of("src/test/resources/capture", name);
    }

    private static List<String> portNames(Path p, Map<String, Object> extra) {
        Map<String, Object> o = new HashMap<>(extra);
        o.put("file", p.toString());
        OptionValues ov = OptionValues.validate(CsvSource.DESCRIPTOR, o);
        return CsvSource.DESCRIPTOR.outputs(ov).stream().map(PortSpec::name).toList();
    }

    /**
     * The metadata lines the demo writes now (keys of our own, docs/capture-csv.md) are skipped like
     * any other; the older layout with instrument-style keys is still read
     * ({@link #metadataUnitsBlankAndRepeatedHeaderLines()}, scope-meta.csv).
     */
    @Test
    void theDemoLayoutWithItsOwnMetadataKeysIsRead() {
        Path f = res("demo-meta.csv");
        assertEquals(List.of("CH1", "CH2"), portNames(f, Map.of()));
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString()));
        assertArrayEquals(new double[] {1.025, 1.025, 1.375, 1.375}, c.analog("CH1"), 1e-6);
        assertArrayEquals(new double[] {1.375, 1.375, 1.025, 1.025}, c.analog("CH2"), 1e-6);
        AnalogBlock first = c.blocks("CH1").stream().map(AnalogBlock.class::cast).findFirst().orElseThrow();
        assertEquals(-2_000_000L, first.startFs());
        assertEquals(1_000_000.0, first.periodFs(), 1e-6);
    }

    @Test
    void metadataUnitsBlankAndRepeatedHeaderLines() {
        Path f = res("scope-meta.csv");
        assertEquals(List.of("CH1", "CH2"), portNames(f, Map.of()));
        for (int block : new int[] {1, 3, 65536}) {
            Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString(), "blockSamples", block));
            double[] a = c.analog("CH1");
            double[] b = c.analog("CH2");
            assertArrayEquals(new double[] {1.025, 1.025, 1.375, 1.375, 1.025, 1.025, 1.375, 1.375}, a, 1e-6);
            // CH2 is in mV: 1375 mV = 1.375 V
            assertArrayEquals(new double[] {1.375, 1.375, 1.025, 1.025, 1.375, 1.375, 1.025, 1.025}, b, 1e-6);
            AnalogBlock first = c.blocks("CH1").stream().map(AnalogBlock.class::cast).findFirst().orElseThrow();
            assertEquals(-2_000_000L, first.startFs(), "the first time, -2 ns, is the start");
            assertEquals(1_000_000.0, first.periodFs(), 1e-6, "1 ns between rows");
        }
    }

    @Test
    void semicolonsWithDecimalCommaAndCrLf() {
        Path f = res("semicolon-decimal-comma.csv");
        assertEquals(List.of("Kanal_A", "Kanal_B"), portNames(f, Map.of()));
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString()));
        assertArrayEquals(new double[] {0.5, 0.25, -0.15, 0}, c.analog("Kanal_A"), 1e-7);
        assertArrayEquals(new double[] {-0.5, -0.25, 0.15, 0}, c.analog("Kanal_B"), 1e-7);
        AnalogBlock b = (AnalogBlock) c.blocks("Kanal_A").get(0);
        assertEquals(1e9, b.periodFs(), 1e-3, "1 us between rows");
    }

    @Test
    void sampleIndexColumnNeedsTheRate() {
        Path f = res("tab-index.tsv");
        assertEquals(List.of("lane", "lane-"), portNames(f, Map.of()), "'+' becomes '_' and is trimmed, '-' is kept");
        RuntimeException e = assertThrows(RuntimeException.class,
                () -> Collected.run(new CsvSource(), Map.of("file", f.toString())));
        OptionException oe = assertInstanceOf(OptionException.class, e instanceof OptionException ? e : e.getCause());
        assertEquals("rateHz", oe.option());
        assertTrue(oe.getMessage().contains("tab-index.tsv has a sample-index column"), oe.getMessage());
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString(), "rateHz", 1e6));
        assertArrayEquals(new double[] {0.1, 0.2, 0.3}, c.analog("lane"), 1e-7);
        AnalogBlock b = (AnalogBlock) c.blocks("lane").get(0);
        assertEquals(100L * 1_000_000_000L, b.startFs(), "sample 100 at 1 MS/s is at 100 us");
    }

    @Test
    void noHeaderAndAnEmptyCellIsInvalid() {
        Path f = res("no-header.csv");
        assertEquals(List.of("ch1", "ch2"), portNames(f, Map.of()));
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString(), "rateHz", 1e3));
        assertArrayEquals(new double[] {1.5, 1.6, 1.7, 1.8}, c.analog("ch1"), 1e-6);
        double[] b = c.analog("ch2");
        assertTrue(Double.isNaN(b[2]), "the empty cell is marked invalid, not read as 0");
        assertEquals(2.8, b[3], 1e-6);
    }

    @Test
    void unitsOnTheirOwnLineAndQuotedFields() {
        Path f = res("units-line.csv");
        assertEquals(List.of("CH_1", "CH_1_2"), portNames(f, Map.of()));
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString()));
        assertArrayEquals(new double[] {1, 3, 5}, c.analog("CH_1"), 0);
        assertArrayEquals(new double[] {2, 4, 6}, c.analog("CH_1_2"), 0);
    }

    @Test
    void explicitSeparatorOption() {
        Path f = res("semicolon-decimal-comma.csv");
        Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString(), "separator", ";", "decimalComma", "true"));
        assertEquals(4, c.analog("Kanal_A").length);
        assertThrows(CaptureFormatException.class,
                () -> Collected.run(new CsvSource(), Map.of("file", f.toString(), "separator", ",")));
    }

    /** A larger file, cut into blocks of several sizes: the samples must not depend on the cut. */
    @Test
    void sameSamplesForEveryBlockSize(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("big.csv");
        Random r = new Random(5);
        int n = 20_000;
        float[] p = new float[n];
        float[] q = new float[n];
        try (BufferedWriter w = Files.newBufferedWriter(f)) {
            w.write("TIME,P (V),N (V)\n");
            for (int i = 0; i < n; i++) {
                p[i] = (float) (1.2 + r.nextGaussian() * 0.1);
                q[i] = (float) (1.2 - r.nextGaussian() * 0.1);
                w.write(String.format(Locale.ROOT, "%.6e,%.6e,%.6e%n", (i - 1000) * 4e-10, p[i], q[i]));
            }
        }
        double[] ref = null;
        for (int block : new int[] {65536, 997, 4096}) {
            Collected c = Collected.run(new CsvSource(), Map.of("file", f.toString(), "blockSamples", block));
            double[] a = c.analog("P");
            assertEquals(n, a.length);
            for (int i = 0; i < n; i += 1234) {
                assertEquals(Float.parseFloat(String.format(Locale.ROOT, "%.6e", p[i])), a[i], 0.0, "sample " + i);
            }
            if (ref == null) {
                ref = a;
            } else {
                assertArrayEquals(ref, a, 0.0, "block size " + block);
            }
            AnalogBlock b0 = (AnalogBlock) c.blocks("N").get(0);
            assertEquals(-400_000_000L, b0.startFs());
            assertEquals(400_000.0, b0.periodFs(), 1e-3);
        }
    }
}
