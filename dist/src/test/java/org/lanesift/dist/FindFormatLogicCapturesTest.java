package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonValue;

/**
 * {@code find-format} on the logic captures the runner reads gives the hypotheses of the VCD path,
 * and the chain it generates cuts the same words: the bundled strip capture
 * (examples/strip/strip.vcd: CLK, D0, D1) is sampled here as a logic analyser would, at 16 GS/s
 * (62.5 ps, 1/128 of the 8 ns clock period, within one bin of the clocking histogram) and at an
 * ordinary logic analyser's 2.5 GS/s (the grid five bins wide, ClockFinder.grid), and written as a packed logic8 export with its sidecar (other bits of the
 * byte random), as a capture set of two logic8 acquisitions sharing D0 (docs/capture-set.md), and
 * as a logic CSV of 0/1 columns (read as volts; each signal through a receiver against its
 * mid-level). Invented test data: the strip link is the demo scenario's.
 */
class FindFormatLogicCapturesTest {
    static final double RATE_HZ = 16e9;
    static final long STEP_FS = 62_500;

    @TempDir
    static Path tmp;
    static JsonValue vcd;
    static List<String> vcdWords;
    /** Levels of CLK, D0, D1 at each sample. */
    static boolean[][] levels;

    @BeforeAll
    static void samplesAndVcdRun() throws IOException {
        levels = sample(STEP_FS);
        vcd = FindFormatCapturesTest.run("--capture", FindFormatCapturesTest.STRIP.toString(), "--clock", "CLK", "--lanes", "D0,D1",
                "--out", tmp.resolve("vcd").toString());
        vcdWords = words("vcd");
        assertTrue(vcdWords.size() > 3000, "words: " + vcdWords.size());
    }

    /** Levels of CLK, D0, D1 at every sample of a grid of {@code stepFs}, from the VCD. */
    static boolean[][] sample(long stepFs) throws IOException {
        long[][] t = new long[FindFormatCapturesTest.SIGNALS.length][];
        long endFs = FindFormatCapturesTest.readVcd(t);
        int n = (int) (endFs / stepFs) + 1;
        boolean[][] out = new boolean[t.length][n];
        for (int k = 0; k < t.length; k++) {
            int next = 0;
            boolean level = false; // every signal starts low and toggles at each listed time
            for (int i = 0; i < n; i++) {
                while (next < t[k].length && t[k][next] <= i * stepFs) {
                    level = !level;
                    next++;
                }
                out[k][i] = level;
            }
        }
        return out;
    }

    @Test
    void packedLogicGivesTheHypothesesAndWordsOfTheVcd() throws IOException {
        Path bin = tmp.resolve("strip.bin");
        writeLogic8(bin, levels, RATE_HZ, new int[] {0, 1, 2}, new int[] {2, 5, 0}, 11);
        assertSameAsVcd("packed", bin);
    }

    @Test
    void packedLogicAtAnOrdinaryRateGivesTheHypothesesAndWordsOfTheVcd() throws IOException {
        // 2.5 GS/s: 20 samples per 8 ns clock period, 10 per 4 ns unit interval; each slot
        // boundary's phases fall on grid values 5 histogram bins apart (ClockFinder.grid)
        Path bin = tmp.resolve("strip-2g5.bin");
        writeLogic8(bin, sample(400_000), 2.5e9, new int[] {0, 1, 2}, new int[] {0, 1, 2}, 14);
        assertSameAsVcd("packed-2g5", bin);
    }

    @Test
    void captureSetOfTwoAcquisitionsGivesTheHypothesesAndWordsOfTheVcd() throws IOException {
        writeLogic8(tmp.resolve("a1.bin"), levels, RATE_HZ, new int[] {0, 1}, new int[] {0, 1}, 12);
        writeLogic8(tmp.resolve("a2.bin"), levels, RATE_HZ, new int[] {1, 2}, new int[] {0, 1}, 13);
        Path set = tmp.resolve("strip.set.json");
        Files.writeString(set, "{\"format\": \"lanesift-capture-set/1\", \"shared\": \"D0\", \"acquisitions\": ["
                + "{\"name\": \"a1\", \"file\": \"a1.bin\"}, {\"name\": \"a2\", \"file\": \"a2.bin\"}]}");
        assertSameAsVcd("set", set);
    }

    @Test
    void logicCsvGivesTheHypothesesAndWordsOfTheVcd() throws IOException {
        Path csv = tmp.resolve("logic.csv");
        try (BufferedWriter w = Files.newBufferedWriter(csv)) {
            w.write("Time (ps),CLK,D0,D1\n");
            StringBuilder row = new StringBuilder();
            for (int i = 0; i < levels[0].length; i++) {
                long tenthsPs = i * STEP_FS / 100; // 62.5 ps a sample: exact in tenths of a picosecond
                row.setLength(0);
                row.append(tenthsPs / 10).append('.').append(tenthsPs % 10);
                for (boolean[] level : levels) {
                    row.append(level[i] ? ",1" : ",0");
                }
                w.append(row).append('\n');
            }
        }
        assertSameAsVcd("csv", csv);
    }

    private static void assertSameAsVcd(String name, Path capture) throws IOException {
        JsonValue h = FindFormatCapturesTest.run("--capture", capture.toString(), "--clock", "CLK", "--lanes", "D0,D1", "--out",
                tmp.resolve(name).toString());
        for (String p : FindFormatCapturesTest.COMPARED) {
            assertTrue(vcd.at(p) != null, p);
            assertEquals(vcd.at(p), h.at(p), name + " " + p);
        }
        assertEquals(vcd.at("/bursts/bitsPerLane"), h.at("/bursts/bitsPerLane"), name);
        // the strip's own format, not merely the same wrong guess
        assertEquals("CRC-16/MCRF4XX", h.at("/checksum/model").asString());
        assertEquals(48, h.at("/pictures/0/lineLength").asDouble());
        assertEquals(vcdWords, words(name), name + ": the generated chain's words");
    }

    private static List<String> words(String name) throws IOException {
        return FindFormatCapturesTest.words(tmp, name);
    }

    /** Signals {@code signals} (0 CLK, 1 D0, 2 D1) of {@code levels} as bits {@code bits} of a logic8 export; the other bits random. */
    private static void writeLogic8(Path bin, boolean[][] levels, double rateHz, int[] signals, int[] bits, long seed) throws IOException {
        int n = levels[0].length;
        byte[] b = new byte[n];
        new Random(seed).nextBytes(b);
        StringBuilder sidecar = new StringBuilder("{\"rateHz\": " + rateHz + ", \"format\": \"logic8\", \"channels\": [");
        for (int s = 0; s < signals.length; s++) {
            int m = 1 << bits[s];
            boolean[] v = levels[signals[s]];
            for (int i = 0; i < n; i++) {
                b[i] = (byte) (v[i] ? b[i] | m : b[i] & ~m);
            }
            sidecar.append(s == 0 ? "" : ", ").append("{\"name\": \"").append(FindFormatCapturesTest.SIGNALS[signals[s]])
                    .append("\", \"bit\": ").append(bits[s]).append('}');
        }
        Files.write(bin, b);
        Files.writeString(Path.of(bin + ".json"), sidecar.append("]}").toString());
    }
}
