package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import java.io.BufferedWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * inspect on a synthetic capture built so that every answer is known by construction: an LVDS-like
 * pair (offset 1.2 V, swing +/-175 mV, inside the ANSI/TIA/EIA-644-A driver limits of 247-454 mV
 * differential and 1.125-1.375 V offset, from memory), a clock of 20 samples per period, and a
 * single-ended random data line. Noise is far below the hysteresis, so the edge counts are exact.
 */
class InspectorTest {
    static final double RATE = 1e9;

    @Test
    void quantisedLevelsAreFoundWithinAFewMillivolts(@TempDir Path dir) throws Exception {
        // a symmetric -0.21 / +0.19 V data line at 450 Mbit/s (a 225 MHz clock, both edges) sampled at 10 GS/s
        // by an ADC with 2 mV codes: a histogram peak finder read it as -0.289 / +0.203 V
        Path f = dir.resolve("quantised.csv");
        Random r = new Random(4);
        int n = 60_000;
        double ui = 1 / 450e6;
        double dt = 1 / 10e9;
        boolean prev = false;
        boolean cur = true;
        int bitIndex = 0;
        try (BufferedWriter w = Files.newBufferedWriter(f)) {
            w.write("Time (s),D0 (V)\n");
            for (int i = 0; i < n; i++) {
                double t = i * dt;
                int b = (int) (t / ui);
                while (bitIndex < b) {
                    prev = cur;
                    cur = r.nextBoolean();
                    bitIndex++;
                }
                double from = prev ? 0.19 : -0.21;
                double to = cur ? 0.19 : -0.21;
                double x = 0.5 * (1 + Math.tanh((t - b * ui - 250e-12) / 110e-12));
                double v = 0.002 * Math.rint((from + (to - from) * x + 0.003 * r.nextGaussian()) / 0.002);
                w.write(String.format(Locale.ROOT, "%.12e,%.3f%n", t, v));
            }
        }
        InspectReport.Channel c = Inspector.inspect(f, Map.of()).channels().get(0);
        assertEquals(-0.21, c.lowLevel(), 0.003);
        assertEquals(0.19, c.highLevel(), 0.003);
        assertEquals(-0.01, c.threshold(), 0.003);
    }

    @Test
    void levelsEdgesPairsAndClocks(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("bench.csv");
        Random r = new Random(11);
        int n = 40_000;
        int bitSamples = 10;
        int pairEdges = 0;
        int dataEdges = 0;
        boolean bit = false;
        boolean dataBit = false;
        try (BufferedWriter w = Files.newBufferedWriter(f)) {
            w.write("Time (s),LANE0_P (V),LANE0_N (V),CLK (V),DATA (V)\n");
            for (int i = 0; i < n; i++) {
                if (i % bitSamples == 0 && i > 0) {
                    boolean nb = r.nextBoolean();
                    pairEdges += nb != bit ? 1 : 0;
                    bit = nb;
                    boolean nd = r.nextInt(3) == 0 ? !dataBit : dataBit;
                    dataEdges += nd != dataBit ? 1 : 0;
                    dataBit = nd;
                }
                double s = bit ? 0.175 : -0.175;
                double p = 1.2 + s + r.nextGaussian() * 0.003;
                double m = 1.2 - s + r.nextGaussian() * 0.003;
                double clk = (i % 20) < 10 ? 0.0 : 3.3;
                double d = (dataBit ? 3.3 : 0) + r.nextGaussian() * 0.01;
                w.write(String.format(Locale.ROOT, "%.9e,%.5f,%.5f,%.3f,%.4f%n", i / RATE, p, m, clk, d));
            }
        }
        InspectReport rep = Inspector.inspect(f, Map.of());
        assertEquals("csv", rep.format());
        assertEquals(List.of("LANE0_P", "LANE0_N", "CLK", "DATA"), rep.channels().stream().map(InspectReport.Channel::name).toList());
        InspectReport.Channel p = rep.channels().get(0);
        assertEquals("ANALOG", p.kind());
        assertEquals(n, p.samples());
        assertEquals(RATE, p.sampleRateHz(), 1e-3);
        assertEquals(n / RATE, p.durationS(), 1e-12);
        double bin = (p.max() - p.min()) / 256; // the tolerance of the histogram finder inspect used before
        assertEquals(1.025, p.lowLevel(), 2 * bin);
        assertEquals(1.375, p.highLevel(), 2 * bin);
        assertEquals(1.2, p.threshold(), 2 * bin);
        assertEquals(0.035, p.hysteresis(), 2 * bin);
        assertEquals(pairEdges, p.edges(), "one edge per change of bit");
        assertEquals(pairEdges, rep.channels().get(1).edges());

        InspectReport.Channel clk = rep.channels().get(2);
        assertEquals(0.0, clk.lowLevel(), 3.3 / 256);
        assertEquals(3.3, clk.highLevel(), 3.3 / 256);
        assertEquals(2 * (n / 20) - 1, clk.edges(), "a rise and a fall every 20 samples, less the first rise at sample 10");
        assertEquals(RATE / 20, clk.fundamentalHz(), RATE / 20 * 1e-6);
        assertEquals(dataEdges, rep.channels().get(3).edges());

        assertEquals(1, rep.pairs().size());
        assertEquals("LANE0_P", rep.pairs().get(0).first());
        assertEquals("LANE0_N", rep.pairs().get(0).second());
        assertTrue(rep.pairs().get(0).correlation() < -0.99, "r = " + rep.pairs().get(0).correlation());

        assertEquals(List.of("CLK"), rep.clocks().stream().map(InspectReport.Clock::channel).toList(),
                "random data has irregular intervals");
        assertEquals(RATE / 20, rep.clocks().get(0).frequencyHz(), RATE / 20 * 1e-6);
        assertTrue(rep.clocks().get(0).periodCv() < 1e-6);

        String text = rep.toText();
        assertTrue(text.contains("LANE0_P & LANE0_N (r = -"), text);
        assertTrue(text.contains("CLK 50.00 MHz"), text);

        JsonValue j = JsonReader.parse("inspect --json", rep.toJson());
        assertEquals(InspectReport.SCHEMA, j.get("schema").asString());
        assertEquals(4, j.get("channels").elements().size());
        assertEquals(Long.toString(pairEdges), j.at("/channels/0/edges").numberText());
        assertEquals("V", j.at("/channels/0/unit").asString());
        assertNull(j.at("/channels/0/words"), "fields that do not apply are left out");
        assertEquals("LANE0_N", j.at("/differentialPairs/0/second").asString());
        assertEquals("CLK", j.at("/clocks/0/channel").asString());
    }

    /**
     * Issue 16: a D-PHY-like capture (invented, written here): a data lane that sits in LP-11 (both
     * legs high, about 1.2 V) most of the time with short high-speed bursts (+/-100 mV around
     * 200 mV) is still found as a pair, though its levels correlate positively; the clock pair is
     * listed once; the next command names the file. Levels: docs/reference-facts.md#d-phy-levels-and-states.
     */
    @Test
    void lowPowerDataLanesArePairsAndAClockPairIsListedOnce(@TempDir Path dir) throws Exception {
        Random r = new Random(23);
        boolean[] bit = new boolean[1];
        // every 20 us: 15 us LP-11, 0.2 us LP-01, 0.2 us LP-00, 4.6 us high-speed burst of 4-sample bits
        double[][] lp = {{1.2, 1.2}, {0.0, 1.2}, {0.0, 0.0}};
        Path f = csv(dir.resolve("dphy bench.csv"), "CKX_P (V),CKX_N (V),DLX_P (V),DLX_N (V)", 120_000, i -> {
            double c = (i / 4) % 2 == 0 ? 0.1 : -0.1; // continuous high-speed clock, one edge per bit
            int inCycle = i % 20_000;
            int state = inCycle < 15_000 ? 0 : inCycle < 15_200 ? 1 : inCycle < 15_400 ? 2 : 3;
            if (state == 3 && i % 4 == 0) {
                bit[0] = r.nextBoolean();
            }
            double d = bit[0] ? 0.1 : -0.1;
            double p = state < 3 ? lp[state][0] : 0.2 + d;
            double m = state < 3 ? lp[state][1] : 0.2 - d;
            return new double[] {0.2 + c + r.nextGaussian() * 0.002, 0.2 - c + r.nextGaussian() * 0.002,
                p + r.nextGaussian() * 0.002, m + r.nextGaussian() * 0.002};
        });
        InspectReport rep = Inspector.inspect(f, Map.of());
        List<String> pairs = rep.pairs().stream().map(p -> p.first() + "&" + p.second()).sorted().toList();
        assertEquals(List.of("CKX_P&CKX_N", "DLX_P&DLX_N"), pairs, rep::toText);
        InspectReport.Pair data = rep.pairs().stream().filter(p -> p.first().equals("DLX_P")).findFirst().orElseThrow();
        assertTrue(data.correlation() > 0, "the levels alone would not pair it: r = " + data.correlation());
        assertTrue(data.stepCorrelation() < -0.8, "steps r = " + data.stepCorrelation());

        assertEquals(1, rep.clocks().size(), rep::toText);
        assertEquals("CKX_P", rep.clocks().get(0).channel());
        assertEquals("CKX_N", rep.clocks().get(0).otherLeg());
        assertEquals(RATE / 8, rep.clocks().get(0).frequencyHz(), RATE / 8 * 1e-3);

        String text = rep.toText();
        assertTrue(text.contains("CKX_P & CKX_N 125.0 MHz"), text);
        List<String> next = text.lines().filter(l -> l.startsWith("next: ")).toList();
        assertEquals(1, next.size(), text);
        // pairs and a clock: the one command for the whole job, on this file
        assertTrue(next.get(0).startsWith("next: lanesift sift --capture '" + f + "' --out "), next.get(0));
        JsonValue j = JsonReader.parse("inspect --json", rep.toJson());
        assertEquals("CKX_N", j.at("/clocks/0/otherLeg").asString());
        assertEquals(next.get(0).substring("next: ".length()), j.get("next").asString());
    }

    /** Writes a CSV capture at {@link #RATE}: a time column, then the columns {@code row} gives for each sample index. */
    static Path csv(Path f, String header, int n, java.util.function.IntFunction<double[]> row) throws Exception {
        try (BufferedWriter w = Files.newBufferedWriter(f)) {
            w.write("Time (s)," + header + "\n");
            StringBuilder line = new StringBuilder();
            for (int i = 0; i < n; i++) {
                line.setLength(0);
                line.append(String.format(Locale.ROOT, "%.9e", i / RATE));
                for (double v : row.apply(i)) {
                    line.append(',').append(String.format(Locale.ROOT, "%.5f", v));
                }
                w.write(line.append('\n').toString());
            }
        }
        return f;
    }

    @Test
    void logicCaptureNeedsOnePass() {
        InspectReport rep = Inspector.inspect(CsvReaderTest.res("scopes-and-states.vcd"), Map.of("realRateHz", "1e11"));
        assertEquals("vcd", rep.format());
        InspectReport.Channel clk = rep.channels().get(0);
        assertEquals("EDGES", clk.kind());
        assertEquals(3, clk.edges());
        assertEquals(100e-12, clk.unknownS(), 1e-18, "dump off from #30 to #40 at 10 ps");
        InspectReport.Channel word = rep.channels().get(3);
        assertEquals(5, word.words());
        assertEquals(3, word.suspectWords());
        assertEquals(3, word.widthBits());
        InspectReport.Channel v = rep.channels().get(4);
        assertEquals(10, v.invalidSamples());
        assertEquals(-1.25, v.min(), 0);
        assertEquals(3.0, v.max(), 0);
        assertTrue(rep.clocks().isEmpty());
    }

    @Test
    void millivoltColumnsAreReportedInVolts() {
        InspectReport rep = Inspector.inspect(CsvReaderTest.res("scope-meta.csv"), Map.of());
        InspectReport.Channel ch2 = rep.channels().get(1);
        assertEquals("V", ch2.unit(), "the mV column was scaled to volts");
        assertEquals(1.025, ch2.min(), 1e-6);
        assertEquals(1.375, ch2.max(), 1e-6);
        assertEquals(3, ch2.edges());
    }
}
