package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import java.io.BufferedWriter;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.runner.Main;

/**
 * The command line with every plugin on the class path, as in {@code lanesift.jar}: discovery,
 * a capture through real plugins into a VCD, the VCD read back by the project's own reader, and
 * bad input from a real reader.
 */
class EndToEndTest {
    @TempDir
    Path tmp;

    record Cli(int code, String out, String err) {
        List<String> errLines() {
            return err.lines().filter(s -> !s.isEmpty()).toList();
        }
    }

    static Cli cli(String... args) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = Main.run(args, new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
        return new Cli(code, o.toString(StandardCharsets.UTF_8), e.toString(StandardCharsets.UTF_8));
    }

    /** 25 MHz clock pair, LVDS-like: 1.2 V common mode, +/-175 mV per leg, 2.5 GS/s, 8 us. */
    static final double PERIOD_S = 40e-9;
    Path capture;

    @BeforeEach
    void writeCapture() throws Exception {
        capture = tmp.resolve("pair.csv");
        try (BufferedWriter w = Files.newBufferedWriter(capture)) {
            w.write("time (s),CLK_P (V),CLK_N (V)\n");
            for (int k = 0; k < 20_000; k++) {
                double t = k / 2.5e9;
                double s = Math.tanh(12 * Math.sin(2 * Math.PI * t / PERIOD_S));
                w.write(String.format(Locale.ROOT, "%.12g,%.6f,%.6f%n", t, 1.2 + 0.175 * s, 1.2 - 0.175 * s));
            }
        }
        Files.writeString(tmp.resolve("pair.json"), """
                {"nodes": [{"id": "cap", "plugin": "csv", "options": {"file": "pair.csv"}},
                           {"id": "clk", "plugin": "differential"}],
                 "wires": [{"from": "cap.CLK_P", "to": "clk.p"}, {"from": "cap.CLK_N", "to": "clk.n"}]}
                """);
    }

    @Test
    void pluginsListsEveryDiscoveredPluginWithItsPorts() throws Exception {
        Cli r = cli("plugins", "--json");
        assertEquals(0, r.code(), r::toString);
        JsonValue root = JsonReader.parse("plugins --json", r.out());
        Set<String> listed = new TreeSet<>();
        root.get("plugins").elements().forEach(p -> listed.add(p.get("id").asString()));
        Set<String> discovered = new TreeSet<>();
        for (PluginProvider p : PluginRegistry.discover(null).all()) {
            discovered.add(p.descriptor().id());
        }
        assertEquals(discovered, listed);
        assertTrue(listed.containsAll(List.of("csv", "vcd", "raw", "differential", "dual-edge", "deskew")), listed::toString);
        Cli text = cli("plugins");
        assertEquals(0, text.code());
        assertTrue(text.out().contains("inputs:  p (ANALOG), n (ANALOG)"), text::out);
    }

    @Test
    void aCsvPairBecomesEdgesAtTheCrossingsAndSurvivesAVcdRoundTrip() throws Exception {
        Path out = tmp.resolve("out");
        Cli r = cli("run", tmp.resolve("pair.json").toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        assertEquals("", r.err());
        Map<String, List<long[]>> vcd = changes(out.resolve("signals.vcd"));
        List<long[]> edges = vcd.get("clk.edges");
        assertTrue(edges.size() > 300, "transitions: " + edges.size());
        // Source: mathematics - tanh(12 sin(2 pi t / T)) crosses zero exactly at t = m T / 2, so the
        // difference p - n crosses 0 V there; linear interpolation between 400 ps samples stays within 1 ps.
        long halfFs = Math.round(PERIOD_S / 2 * 1e15);
        for (int i = 1; i < edges.size(); i++) { // change 0 is the initial level at time 0
            long t = edges.get(i)[0];
            long nearest = Math.round((double) t / halfFs) * halfFs;
            assertTrue(Math.abs(t - nearest) <= 1000, "edge at " + t + " fs, crossing at " + nearest + " fs");
            assertEquals(edges.get(i - 1)[1] ^ 1, edges.get(i)[1], "levels alternate");
        }
        assertTrue(Files.readString(out.resolve("report.md")).contains("| clk.edges | EDGES |"));

        // read our VCD back with the vcd reader plugin and write it again: same transitions
        Files.writeString(tmp.resolve("back.json"),
                "{\"nodes\": [{\"id\": \"clk\", \"plugin\": \"vcd\", \"options\": {\"file\": \"out/signals.vcd\"}}]}");
        Path back = tmp.resolve("back");
        Cli r2 = cli("run", tmp.resolve("back.json").toString(), "--out", back.toString(), "-q");
        assertEquals(0, r2.code(), r2::toString);
        Map<String, List<long[]>> again = changes(back.resolve("signals.vcd"));
        List<long[]> edges2 = again.get("clk.edges");
        assertEquals(edges.size(), edges2.size());
        for (int i = 0; i < edges.size(); i++) {
            assertEquals(edges.get(i)[0], edges2.get(i)[0], "time of change " + i);
            assertEquals(edges.get(i)[1], edges2.get(i)[1], "value of change " + i);
        }

        // inspect agrees: a 25 MHz pair
        Cli insp = cli("inspect", capture.toString());
        assertEquals(0, insp.code(), insp::toString);
        assertTrue(insp.out().contains("25.00 MHz"), insp::out);
        assertTrue(insp.out().contains("CLK_P & CLK_N"), insp::out);
    }

    /**
     * Issue 16: an offsetsFile relative to the chain file is found wherever the run starts; a
     * suspect row in it makes the report say SUSPECT with the channel and the reason; a missing
     * table is one line naming the folder it was looked for in, exit 2.
     */
    @Test
    void aSuspectSkewRowMakesTheRunReportSuspectAndTablesResolveAgainstTheChain() throws Exception {
        Path sub = Files.createDirectories(tmp.resolve("chains/skew"));
        Files.writeString(sub.resolve("legs.json"), """
                {"format": "lanesift-skew-table", "version": 1, "channels": {
                  "CLK_P": {"offsetPs": 0, "confidence": 1, "method": "reference"},
                  "CLK_N": {"offsetPs": -12.5, "confidence": 0.93, "method": "legs-xcorr",
                            "suspect": "ambiguous: a second correlation peak reaches 91 % of the main one"}}}
                """);
        String chain = """
                {"nodes": [{"id": "cap", "plugin": "csv", "options": {"file": "../pair.csv"}},
                           {"id": "fix", "plugin": "deskew", "options": {"kind": "analog", "channels": 2, "offsetsFile": "skew/TABLE"}},
                           {"id": "clk", "plugin": "differential"}],
                 "wires": [{"from": "cap.CLK_P", "to": "fix.in0"}, {"from": "cap.CLK_N", "to": "fix.in1"},
                           {"from": "fix.out0", "to": "clk.p"}, {"from": "fix.out1", "to": "clk.n"}]}
                """;
        Files.writeString(tmp.resolve("chains/ok.json"), chain.replace("TABLE", "legs.json"));
        Files.writeString(tmp.resolve("chains/missing.json"), chain.replace("TABLE", "none.json"));
        Cli r = cli("run", tmp.resolve("chains/ok.json").toString(), "--out", tmp.resolve("o").toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        String report = Files.readString(tmp.resolve("o/report.md"));
        assertTrue(report.contains("- trust: SUSPECT: the skew of CLK_N (ambiguous: a second correlation peak"), report);
        Cli m = cli("run", tmp.resolve("chains/missing.json").toString(), "--out", tmp.resolve("m").toString(), "-q");
        assertEquals(2, m.code(), m::toString);
        assertEquals(1, m.errLines().size(), m::toString);
        assertTrue(m.errLines().get(0).contains("looked in folder " + sub.toAbsolutePath().normalize()), m::toString);
    }

    @Test
    void aMalformedCaptureIsOneLineWithItsLine() throws Exception {
        List<String> lines = new ArrayList<>(Files.readAllLines(capture));
        lines.set(5, "0.000000002,1.2");
        Files.write(capture, lines);
        Cli r = cli("run", tmp.resolve("pair.json").toString(), "--out", tmp.resolve("o").toString(), "-q");
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.errLines().get(0).contains("pair.csv line 6"), r::toString);
    }

    /** Scalar value changes per "scope.name" as (time, 0/1, or 2 for x), from a VCD the runner wrote. */
    static Map<String, List<long[]>> changes(Path vcd) throws Exception {
        Map<String, String> names = new HashMap<>();
        Map<String, List<long[]>> out = new HashMap<>();
        String scope = "";
        long time = 0;
        boolean body = false;
        for (String line : Files.readAllLines(vcd)) {
            String l = line.trim();
            if (!body) {
                if (l.startsWith("$scope module ")) {
                    scope = l.split("\\s+")[2];
                } else if (l.startsWith("$var wire 1 ")) {
                    String[] f = l.split("\\s+");
                    names.put(f[3], scope + "." + f[4]);
                    out.put(scope + "." + f[4], new ArrayList<>());
                } else if (l.startsWith("$enddefinitions")) {
                    body = true;
                }
                continue;
            }
            if (l.startsWith("#")) {
                time = Long.parseLong(l.substring(1));
            } else if (!l.isEmpty() && "01x".indexOf(l.charAt(0)) >= 0 && names.containsKey(l.substring(1))) {
                List<long[]> list = out.get(names.get(l.substring(1)));
                long v = l.charAt(0) == 'x' ? 2 : l.charAt(0) - '0';
                if (v == 2 && list.isEmpty()) {
                    continue; // the $dumpvars x before the first value
                }
                if (!list.isEmpty() && list.get(list.size() - 1)[0] == time) {
                    list.set(list.size() - 1, new long[] {time, v});
                } else {
                    list.add(new long[] {time, v});
                }
            }
        }
        return out;
    }
}
