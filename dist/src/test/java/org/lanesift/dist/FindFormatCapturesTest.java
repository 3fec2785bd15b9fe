package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.JsonScan;

/**
 * {@code find-format} on every kind of capture the runner reads gives the hypotheses of the VCD
 * path: the bundled strip capture (examples/strip/strip.vcd, three 1-bit signals) is turned here
 * into the analog legs of the same link (1.2 V common mode, +/-175 mV per leg, LVDS-like levels,
 * common practice; 1 ns linear edges, 2 GS/s) written once as a CSV and once as raw int16 with a
 * JSON sidecar, and the three runs must agree on clocking, sync, word length, bit order, lane
 * distribution, checksum, length field and the best picture.
 */
class FindFormatCapturesTest {
    static final Path STRIP = Path.of("..", "examples", "strip", "strip.vcd");
    static final String[] SIGNALS = {"CLK", "D0", "D1"};
    static final long STEP_FS = 500_000;
    static final long RAMP_FS = 1_000_000;
    static final double SWING_VOLTS = 0.175;
    static final double COMMON_VOLTS = 1.2;
    static final double GAIN_VOLTS = 1e-4;
    static final String MAP = "CLK=CLK_P,CLK_N D0=D0_P,D0_N D1=D1_P,D1_N";
    /** The hypotheses compared, as JSON pointers into discovery-hypotheses.json. */
    static final List<String> COMPARED = List.of("/clocking/best", "/clocking/bitsPerClockPeriod", "/bursts/boundaries", "/bursts/count", "/sync/wire",
            "/framings/0/wordBits", "/framings/0/bitOrder", "/framings/0/lanes", "/checksum/model", "/fields/lengthFieldWord",
            "/fields/dataOpcode", "/pictures/0/format", "/pictures/0/lineLength");

    @TempDir
    static Path tmp;
    static JsonValue vcd;

    @BeforeAll
    static void legsAndVcdRun() throws IOException {
        long[][] t = new long[SIGNALS.length][];
        long endFs = readVcd(t);
        writeLegs(t, endFs, tmp.resolve("legs.csv"), tmp.resolve("legs.bin"));
        vcd = run("--capture", STRIP.toString(), "--clock", "CLK", "--lanes", "D0,D1", "--out", tmp.resolve("vcd").toString());
    }

    @Test
    void csvOfAnalogLegsGivesTheHypothesesOfTheVcd() throws IOException {
        JsonValue csv = run("--capture", tmp.resolve("legs.csv").toString(), "--map", MAP, "--out", tmp.resolve("csv").toString());
        assertSame(csv);
        // LVDS-like legs (1.2 V common mode) never fall below the 880 mV low-power high threshold
        // (docs/reference-facts.md#d-phy-levels-and-states): no low-power/high-speed state pattern is claimed
        assertEquals("none", csv.at("/bursts/lineStates/pattern").asString());
        assertEquals(0, csv.at("/bursts/lineStates/highSpeedIntervals").asDouble());
        assertEquals(2, csv.at("/bursts/lineStates/lanesExamined").asDouble());
        assertEquals(null, vcd.at("/bursts/lineStates"), "a VCD's 1-bit signals have no levels");
        // the generated chain reads the CSV through the same front end and cuts the words the VCD's chain cuts
        List<String> fromVcd = words("vcd");
        List<String> fromCsv = words("csv");
        assertTrue(fromVcd.size() > 3000, "words: " + fromVcd.size());
        // the last DDR bit sits on the capture's last instant: the analog legs show no edge there, so a burst's last word may be cut
        assertTrue(fromCsv.size() >= fromVcd.size() - 4, fromCsv.size() + " of " + fromVcd.size());
        assertEquals(fromVcd.subList(0, fromCsv.size()), fromCsv);
    }

    /** The words of the generated chain of run {@code name}, without their times (index, lane, group, word, value, flags). */
    private static List<String> words(String name) throws IOException {
        return words(tmp, name);
    }

    /** The same for the run {@code name} under {@code dir}; the chain decodes into {@code dir/decoded-name}. */
    static List<String> words(Path dir, String name) throws IOException {
        Path decoded = dir.resolve("decoded-" + name);
        EndToEndTest.Cli r = EndToEndTest.cli("run", dir.resolve(name).resolve("discovery-chain.json").toString(), "--out",
                decoded.toString());
        assertEquals(0, r.code(), r::toString);
        return Files.readAllLines(decoded.resolve("words-words.csv")).stream().map(l -> l.replaceFirst(",[^,]*", "")).toList();
    }

    @Test
    void rawCaptureWithSidecarGivesTheHypothesesOfTheVcd() throws IOException {
        JsonValue raw = run("--capture", tmp.resolve("legs.bin").toString(), "--map", MAP, "--out", tmp.resolve("raw").toString());
        assertSame(raw);
    }

    @Test
    void aBadMapIsOneLineAndExitTwo() {
        EndToEndTest.Cli r = EndToEndTest.cli("find-format", "--capture", tmp.resolve("legs.bin").toString(), "--map",
                "CLK=CLK_P,CLK_X D0=D0_P,D0_N", "--out", tmp.resolve("bad").toString());
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.err().contains("CLK_X") && r.err().contains("no channel"), r::toString);
        assertFalse(Files.exists(tmp.resolve("bad")));
    }

    @Test
    void aLogicLaneMapOnAnalogLegsIsExitTwo() {
        EndToEndTest.Cli r = EndToEndTest.cli("find-format", "--capture", tmp.resolve("legs.csv").toString(), "--map",
                "CLK=CLK_P D0=D0_P", "--out", tmp.resolve("bad2").toString());
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.err().contains("expected CLK=P,N"), r::toString);
    }

    private static void assertSame(JsonValue other) {
        for (String p : COMPARED) {
            assertTrue(vcd.at(p) != null, p);
            assertEquals(vcd.at(p), other.at(p), p);
        }
        // the picture found is the strip's screen, not merely the same wrong guess
        assertEquals("CRC-16/MCRF4XX", other.at("/checksum/model").asString());
        assertEquals(48, other.at("/pictures/0/lineLength").asDouble());
    }

    static JsonValue run(String... args) throws IOException {
        String[] full = new String[args.length + 1];
        full[0] = "find-format";
        System.arraycopy(args, 0, full, 1, args.length);
        EndToEndTest.Cli r = EndToEndTest.cli(full);
        assertEquals(0, r.code(), r::toString);
        Path out = Path.of(args[Arrays.asList(args).indexOf("--out") + 1]);
        return JsonScan.parse("hypotheses", Files.readString(out.resolve("discovery-hypotheses.json")));
    }

    /** Transition times of CLK, D0 and D1 (each starts low at 0 fs); returns the last time stamp. */
    static long readVcd(long[][] t) throws IOException {
        long[][] buf = new long[SIGNALS.length][1024];
        int[] n = new int[SIGNALS.length];
        boolean[] level = new boolean[SIGNALS.length];
        long now = 0;
        boolean body = false;
        for (String line : Files.readAllLines(STRIP, StandardCharsets.US_ASCII)) {
            String s = line.strip();
            body |= s.equals("$enddefinitions $end");
            if (!body || s.isEmpty()) {
                continue;
            }
            if (s.charAt(0) == '#') {
                now = Long.parseLong(s.substring(1));
            } else if (s.length() == 2 && (s.charAt(0) == '0' || s.charAt(0) == '1')) {
                int k = "!\"#".indexOf(s.charAt(1));
                boolean v = s.charAt(0) == '1';
                if (k >= 0 && v != level[k]) {
                    level[k] = v;
                    if (n[k] == buf[k].length) {
                        buf[k] = Arrays.copyOf(buf[k], n[k] * 2);
                    }
                    buf[k][n[k]++] = now;
                }
            }
        }
        for (int k = 0; k < SIGNALS.length; k++) {
            t[k] = Arrays.copyOf(buf[k], n[k]);
        }
        return now;
    }

    /** Differential level in [-1, 1] at {@code tFs}: a linear ramp of {@link #RAMP_FS} centred on every transition. */
    private static double level(long[] t, long tFs) {
        int i = Arrays.binarySearch(t, tFs + RAMP_FS / 2);
        int last = i >= 0 ? i : -i - 2; // the last transition whose ramp has started
        if (last < 0) {
            return -1;
        }
        double after = last % 2 == 0 ? 1 : -1; // every signal starts low and toggles
        double f = Math.min(1, Math.max(0, (tFs - (t[last] - RAMP_FS / 2.0)) / RAMP_FS));
        return -after + 2 * after * f;
    }

    private static void writeLegs(long[][] t, long endFs, Path csv, Path bin) throws IOException {
        StringBuilder sidecar = new StringBuilder("{\"rateHz\": 2e9, \"format\": \"int16le\", \"channels\": [");
        StringBuilder header = new StringBuilder("Time (s)");
        for (String s : SIGNALS) {
            for (String leg : new String[] {"_P", "_N"}) {
                header.append(',').append(s).append(leg);
                sidecar.append(sidecar.charAt(sidecar.length() - 1) == '[' ? "" : ", ").append("{\"name\": \"").append(s).append(leg)
                        .append("\", \"gain\": ").append(GAIN_VOLTS).append(", \"offset\": ").append(COMMON_VOLTS).append('}');
            }
        }
        Files.writeString(Path.of(bin + ".json"), sidecar.append("]}").toString());
        ByteBuffer frame = ByteBuffer.allocate(2 * 2 * SIGNALS.length).order(ByteOrder.LITTLE_ENDIAN);
        try (BufferedWriter w = Files.newBufferedWriter(csv); OutputStream b = new java.io.BufferedOutputStream(Files.newOutputStream(bin))) {
            w.write(header.append('\n').toString());
            for (long s = 0; s * STEP_FS <= endFs; s++) {
                long tFs = s * STEP_FS;
                StringBuilder row = new StringBuilder(String.format(Locale.ROOT, "%.10e", tFs * 1e-15));
                frame.clear();
                for (long[] sig : t) {
                    double x = level(sig, tFs) * SWING_VOLTS;
                    for (double v : new double[] {x, -x}) {
                        row.append(String.format(Locale.ROOT, ",%.5f", COMMON_VOLTS + v));
                        frame.putShort((short) Math.round(v / GAIN_VOLTS));
                    }
                }
                w.write(row.append('\n').toString());
                b.write(frame.array());
            }
        }
    }
}
