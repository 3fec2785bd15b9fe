package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.testkit.ExternalTool;

/**
 * The worked example of docs/chain-file.md, taken from the document itself, runs with the real
 * plugins on a synthetic capture of a 25 MHz clock pair and a DDR data pair, and recovers every
 * bit that was put in.
 */
class DocsExampleTest {
    @TempDir
    Path tmp;

    /** The first fenced block of a language after a heading of a document in docs/. */
    static String fenced(String docName, String heading, String language) throws Exception {
        String doc = Files.readString(Path.of("..", "docs", docName));
        int at = doc.indexOf(heading);
        assertTrue(at >= 0, docName + " has no heading " + heading);
        int start = doc.indexOf("```" + language + "\n", at) + ("```" + language).length();
        return doc.substring(start, doc.indexOf("```", start));
    }

    static String workedExample() throws Exception {
        return fenced("chain-file.md", "## Worked example", "json");
    }

    /**
     * Writes bench-capture.csv: a 25 MHz clock pair and a DDR data pair at 2.5 GS/s, the data bits
     * centred on the clock edges; the data pair arrives {@code laneSkewS} late and its N leg another
     * {@code legSkewS}.
     *
     * @return the bits, bit m centred on the clock edge at m * 20 ns
     */
    private boolean[] writeCapture(double laneSkewS, double legSkewS) throws Exception {
        double rate = 2.5e9;
        double period = 40e-9;
        double half = period / 2;
        int n = 25_000;
        Random rnd = new Random(5);
        boolean[] bits = new boolean[(int) (n / rate / half) + 3];
        for (int i = 0; i < bits.length; i++) {
            bits[i] = rnd.nextBoolean();
        }
        try (BufferedWriter w = Files.newBufferedWriter(tmp.resolve("bench-capture.csv"))) {
            w.write("time (s),CLK_P (V),CLK_N (V),D0_P (V),D0_N (V)\n");
            for (int k = 0; k < n; k++) {
                double t = k / rate;
                double c = Math.tanh(12 * Math.sin(2 * Math.PI * t / period));
                w.write(String.format(Locale.ROOT, "%.12g,%.6f,%.6f,%.6f,%.6f%n", t, 1.2 + 0.175 * c, 1.2 - 0.175 * c,
                        1.2 + 0.175 * data(bits, t - laneSkewS, half), 1.2 - 0.175 * data(bits, t - laneSkewS - legSkewS, half)));
            }
        }
        return bits;
    }

    /** The data level at time t: bit m is centred on the clock edge at m * half; it changes at m * half - half / 2, taking 1 ns. */
    private static double data(boolean[] bits, double t, double half) {
        int m = Math.max(0, (int) Math.floor((t + half / 2) / half));
        double since = t + half / 2 - m * half;
        double cur = bits[m] ? 1 : -1;
        double prev = m > 0 && bits[m - 1] ? 1 : -1;
        return prev + (cur - prev) * Math.min(1, since / 1e-9);
    }

    @Test
    void theDocumentedChainRecoversTheBits() throws Exception {
        double half = 20e-9;
        boolean[] bits = writeCapture(0, 0);
        Files.writeString(tmp.resolve("lane0.json"), workedExample());
        Path out = tmp.resolve("lane0-out");
        EndToEndTest.Cli r = EndToEndTest.cli("run", tmp.resolve("lane0.json").toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        List<String> rows = Files.readAllLines(out.resolve("ddr-bits0-bits.csv"));
        assertEquals("time (s),bit,clock_edge,slot,edge,setup (s),hold (s),flagged", rows.get(0));
        assertTrue(rows.size() > 390, "bits: " + (rows.size() - 1));
        for (String row : rows.subList(1, rows.size())) {
            String[] c = row.split(",", -1);
            double t = Double.parseDouble(c[0]);
            int m = (int) Math.round(t / half);
            assertTrue(Math.abs(t - m * half) < 1e-11, "sampled at a clock crossing: " + row);
            assertEquals(bits[m] ? "1" : "0", c[1], "bit at clock edge " + m + ": " + row);
        }
        for (String f : List.of("annotations.jsonl", "report.md", "clk-levels.json", "d0-levels.json")) {
            assertTrue(Files.exists(out.resolve(f)), f);
        }
        // clk.logic and d0.logic are by-products (clk and d0 feed ddr through their edges): not written by default
        assertFalse(Files.exists(out.resolve("signals.vcd")), "no by-products in signals.vcd by default");
        String report = Files.readString(out.resolve("report.md"));
        assertTrue(report.contains("Left out, not written: clk.logic, d0.logic."), report);
    }

    @Test
    void theDocumentedCReaderCountsThePackedBitsOfTheDocumentedChain() throws Exception {
        Path gcc = ExternalTool.require("gcc");
        writeCapture(0, 0);
        Files.writeString(tmp.resolve("lane0.json"), workedExample());
        Path out = tmp.resolve("packed");
        EndToEndTest.Cli r = EndToEndTest.cli("run", tmp.resolve("lane0.json").toString(), "--out", out.toString(), "-q",
                "--outputs", "csv,binary");
        assertEquals(0, r.code(), r::toString);
        assertFalse(Files.exists(out.resolve("annotations.jsonl")), "annotations not selected");
        assertFalse(Files.exists(out.resolve("d0-levels.json")), "artifacts not selected");
        List<String> rows = Files.readAllLines(out.resolve("ddr-bits0-bits.csv"));
        long bits = rows.size() - 1;
        long ones = rows.stream().skip(1).filter(x -> x.split(",", -1)[1].equals("1")).count();
        long flagged = rows.stream().skip(1).filter(x -> x.endsWith(",1")).count();
        assertTrue(bits > 390 && ones > 100 && ones < bits - 100, "bits " + bits + ", ones " + ones);

        // Source: gcc (Debian package gcc) compiling the C reader printed in docs/bits-binary.md, the outside reference
        // for the layout: it counts bits, ones and flagged bits from the file alone
        Files.writeString(tmp.resolve("bitcount.c"), fenced("bits-binary.md", "## Reading a `.bits` file in C", "c"));
        ExternalTool.run(tmp, java.time.Duration.ofSeconds(60), List.of(gcc.toString(), "-O2", "-Wall", "-o", "bitcount", "bitcount.c"));
        String counted = ExternalTool.run(tmp, java.time.Duration.ofSeconds(30),
                List.of(tmp.resolve("bitcount").toString(), out.resolve("ddr-bits0.bits").toString())).trim();
        assertEquals("bits " + bits + " ones " + ones + " flagged " + flagged + " header " + bits, counted);
    }

    static String oneRunExample() throws Exception {
        return fenced("skew-table.md", "## Estimate and correct in one run", "json");
    }

    @Test
    void theDocumentedOneRunChainEstimatesAndCorrectsBothSkews() throws Exception {
        double half = 20e-9;
        boolean[] bits = writeCapture(6e-9, 200e-12);
        Files.writeString(tmp.resolve("one-run.json"), oneRunExample());
        Path out = tmp.resolve("one-run-out");
        EndToEndTest.Cli r = EndToEndTest.cli("run", tmp.resolve("one-run.json").toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        // the estimators' tables are written with the outputs; the leg estimate finds the 200 ps to within 50 ps
        // (the bound; 400 ps samples of piecewise-linear 1 ns edges bias the parabolic peak fit by about 25 ps)
        String legs = Files.readString(out.resolve("legs-D0-skew.json"));
        double legPs = org.lanesift.json.JsonReader.parse("legs-D0-skew.json", legs).at("/channels/D0_N/offsetPs/value").asDouble();
        assertEquals(-200, legPs, 50, legs);
        List<String> rows = Files.readAllLines(out.resolve("ddr-bits0-bits.csv"));
        assertTrue(rows.size() > 390, "bits: " + (rows.size() - 1));
        int margins = 0;
        for (String row : rows.subList(1, rows.size())) {
            String[] c = row.split(",", -1);
            double t = Double.parseDouble(c[0]);
            int m = (int) Math.round(t / half);
            assertEquals(bits[m] ? "1" : "0", c[1], "bit at clock edge " + m + ": " + row);
            if (!c[5].isEmpty() && !c[6].isEmpty()) {
                // corrected, the data edges sit midway between clock edges: at least half a bit (10 ns) of setup and of
                // hold; uncorrected, the 6 ns late lane leaves about 3.5 ns of setup
                assertTrue(Math.min(Double.parseDouble(c[5]), Double.parseDouble(c[6])) > 9.5e-9, "setup and hold: " + row);
                margins++;
            }
        }
        assertTrue(margins > 100, "rows with a data edge on both sides: " + margins);
    }
}
