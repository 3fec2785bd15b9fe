package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.runner.ChainRun;
import org.lanesift.testkit.ExternalTool;

/**
 * The two sides of the script-comparison benchmark (bench/scripts/vs-script.sh, issue 19) do the
 * same job: on a small capture from ddr-capture.py (8 float32 legs, 2.5 GS/s, a 100 MHz
 * double-edge link with 3 data lanes), the numpy script (ddr-numpy.py; numpy from Debian's
 * python3-numpy, the outside reference) and {@code run} of ddr-chain.json give the same number of
 * bits and of ones. Speed is the script's business, not this test's.
 */
class VsScriptTest {
    static final Path SCRIPTS = Path.of("../bench/scripts");

    @Test
    void numpyAndTheChainCountTheSameBitsAndOnes(@TempDir Path dir) throws Exception {
        Path python = ExternalTool.requirePythonModule("numpy", "python3-numpy");
        // per channel: 3.2 MB, 40 us, 20,000 clock edges
        String numpy = captureAndNumpy(dir, python, "float32le");
        List<Path> csvs = runChain(dir, "ddr-chain.json", "out");
        long[] counts = bitsAndOnes(csvs);
        long bits = counts[0];
        long ones = counts[1];
        // Source: numpy (Debian python3-numpy) through ddr-numpy.py, the outside reference for the counts
        assertEquals(numpy, "bits " + bits + " ones " + ones);
        // both edges of a 100 MHz clock over 40 us, 3 lanes; random data about half ones
        assertEquals(3 * 2 * 4000, bits);
        assertTrue(ones > bits * 45 / 100 && ones < bits * 55 / 100, "ones " + ones + " of " + bits);

        // the same chain with the raw source taking each pair's difference (ddr-diff-chain.json):
        // every bit file is the same, byte for byte
        List<Path> diff = runChain(dir, "ddr-diff-chain.json", "diff-out");
        for (int i = 0; i < csvs.size(); i++) {
            assertEquals(csvs.get(i).getFileName(), diff.get(i).getFileName());
            assertEquals(-1L, Files.mismatch(csvs.get(i), diff.get(i)), csvs.get(i).getFileName() + " with leg differences");
        }
    }

    /**
     * The same capture written as a digitizer's codes (ddr-capture.py FORMAT: int16le at 0.1 mV a
     * code, uint8 at 2.5 mV a code, gain and offset in the sidecar): numpy scales the codes itself
     * and counts the same bits and ones as the chain, whose raw source converts them in bulk.
     */
    @ParameterizedTest
    @ValueSource(strings = {"int16le", "uint8"})
    void digitizerCodesGiveTheSameCountsAsNumpy(String format, @TempDir Path dir) throws Exception {
        Path python = ExternalTool.requirePythonModule("numpy", "python3-numpy");
        String numpy = captureAndNumpy(dir, python, format);
        assertTrue(Files.readString(dir.resolve("ddr.bin.json")).contains("\"format\": \"" + format + "\""));
        assertEquals(8L * SAMPLES * (format.equals("uint8") ? 1 : 2), Files.size(dir.resolve("ddr.bin")));
        long[] counts = bitsAndOnes(runChain(dir, "ddr-chain.json", "out"));
        // Source: numpy (Debian python3-numpy) through ddr-numpy.py, the outside reference for the counts
        assertEquals(numpy, "bits " + counts[0] + " ones " + counts[1], format);
        assertEquals(3 * 2 * 4000, counts[0], format);
    }

    /** Samples per channel of the test captures. */
    static final int SAMPLES = 100_000;

    /** Writes ddr.bin (and its sidecar) in {@code dir} in the given format and returns what the numpy script prints for it. */
    private static String captureAndNumpy(Path dir, Path python, String format) throws Exception {
        ExternalTool.run(dir, Duration.ofMinutes(2), List.of(python.toString(),
                SCRIPTS.resolve("ddr-capture.py").toAbsolutePath().toString(), "ddr.bin", Integer.toString(SAMPLES), format));
        return ExternalTool.run(dir, Duration.ofMinutes(2), List.of(python.toString(),
                SCRIPTS.resolve("ddr-numpy.py").toAbsolutePath().toString(), "ddr.bin")).trim();
    }

    /** Runs a chain file of bench/scripts (copied beside ddr.bin) into {@code dir/out}; returns its three bits CSVs, sorted. */
    private static List<Path> runChain(Path dir, String chain, String out) throws Exception {
        Path file = dir.resolve(chain);
        Files.copy(SCRIPTS.resolve(chain), file);
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        int code = ChainRun.of(file).out(dir.resolve(out)).quiet(true)
                .run(new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(o, true, StandardCharsets.UTF_8));
        assertEquals(0, code, o.toString(StandardCharsets.UTF_8));
        List<Path> csvs;
        try (Stream<Path> s = Files.list(dir.resolve(out))) {
            csvs = s.filter(f -> f.getFileName().toString().matches("rx-bits\\d-bits\\.csv")).sorted().toList();
        }
        assertEquals(3, csvs.size(), csvs::toString);
        return csvs;
    }

    /** Bits and ones in bits CSVs, {bits, ones}; every row's bit must be 0 or 1. */
    private static long[] bitsAndOnes(List<Path> csvs) throws Exception {
        long bits = 0;
        long ones = 0;
        for (Path csv : csvs) {
            try (BufferedReader r = Files.newBufferedReader(csv, StandardCharsets.UTF_8)) {
                assertEquals("time (s),bit,clock_edge,slot,edge,setup (s),hold (s),flagged", r.readLine());
                for (String line = r.readLine(); line != null; line = r.readLine()) {
                    String bit = line.split(",", 3)[1];
                    assertTrue(bit.equals("0") || bit.equals("1"), line);
                    bits++;
                    ones += bit.equals("1") ? 1 : 0;
                }
            }
        }
        return new long[] {bits, ones};
    }

    @Test
    void aBadDifferencesOptionIsBadInputNamingIt(@TempDir Path dir) throws Exception {
        Path python = ExternalTool.requirePythonModule("numpy", "python3-numpy");
        ExternalTool.run(dir, Duration.ofMinutes(2), List.of(python.toString(),
                SCRIPTS.resolve("ddr-capture.py").toAbsolutePath().toString(), "ddr.bin", "1000"));
        Files.writeString(dir.resolve("chain.json"), Files.readString(SCRIPTS.resolve("ddr-diff-chain.json"))
                .replace("d2=d2_p-d2_n", "d2=d2_p-d3_n"));
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        int code = ChainRun.of(dir.resolve("chain.json")).out(dir.resolve("out")).quiet(true)
                .run(new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(o, true, StandardCharsets.UTF_8));
        String text = o.toString(StandardCharsets.UTF_8);
        assertEquals(2, code, text);
        assertTrue(text.contains("option 'differences' of plugin 'raw': entry 'd2=d2_p-d3_n': expected P-N"), text);
        assertTrue(!text.contains("\tat "), "no stack trace: " + text);
    }
}
