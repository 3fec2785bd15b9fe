package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** {@code lanesift run} end to end with the test plugins: every output file, checked value by value. */
class RunCommandTest {
    @TempDir
    Path tmp;

    static Path chain(String name) throws Exception {
        return Path.of(RunCommandTest.class.getResource("/chains/" + name).toURI());
    }

    /** Sample k of the fake source is at k ns (period 1000 ps). */
    static long t(long k) {
        return k * 1_000_000L;
    }

    Cli runAllKinds(Path out, String... extra) throws Exception {
        String[] base = {"run", chain("all-kinds.json").toString(), "--out", out.toString()};
        String[] args = new String[base.length + extra.length];
        System.arraycopy(base, 0, args, 0, base.length);
        System.arraycopy(extra, 0, args, base.length, extra.length);
        return Cli.run(args);
    }

    @Test
    void writesEveryKindOfOutput() throws Exception {
        Path out = tmp.resolve("out");
        Cli r = runAllKinds(out);
        assertEquals(0, r.code(), r::toString);
        assertEquals("", r.err());
        assertTrue(r.out().contains("findings: 1 error, 1 warning, 4 info"), r::toString);

        // VCD: scalar wires for logic and edges, a vector for words; x where unknown (IEEE 1364-2005 clause 18)
        VcdText vcd = VcdText.read(out.resolve("signals.vcd"));
        assertEquals("1 fs", vcd.timescale);
        VcdText.Var logic = vcd.byName.get("src.logic");
        VcdText.Var edges = vcd.byName.get("src.edges");
        VcdText.Var words = vcd.byName.get("src.words");
        VcdText.Var th = vcd.byName.get("th.out");
        assertNotNull(logic);
        assertNotNull(edges);
        assertNotNull(th);
        assertEquals(8, words.width);
        for (int k = 0; k < 200; k++) {
            String expect = k >= 100 && k < 110 ? "x" : ((k / 3) % 2 == 1 ? "1" : "0");
            assertEquals(expect, logic.at(t(k)), "src.logic at sample " + k);
            // th.out: volts (k % 10) / 10 above 0.55 V; invalid when k % 50 == 49
            String th0 = k % 50 == 49 ? "x" : (k % 10 >= 6 ? "1" : "0");
            assertEquals(th0, th.at(t(k)), "th.out at sample " + k);
            // edges toggle at every k % 5 == 0, k > 0, starting low
            int toggles = k / 5;
            assertEquals(toggles % 2 == 1 ? "1" : "0", edges.at(t(k)), "src.edges at sample " + k);
            if (k % 8 == 0) {
                assertEquals(Long.parseLong(words.at(t(k)), 2), (long) (k / 8), "word at sample " + k);
            }
        }

        // src.analog feeds th, so it is no output of the chain
        assertFalse(Files.exists(out.resolve("src-analog.csv")));

        // bits CSV
        List<String> bits = Files.readAllLines(out.resolve("src-bits-bits.csv"));
        assertEquals("time (s),bit,clock_edge,slot,edge,setup (s),hold (s),flagged", bits.get(0));
        assertEquals(1 + 50, bits.size());
        assertEquals("0.000000004,0,1,0,rise,0.0000000001,0.0000000002,0", bits.get(2));
        assertEquals("0,1,0,0,rise,0.0000000001,,0", bits.get(1));

        // frames are counted in the report but not drawn: a frame picture is its stage's artifact (one writer, once)
        try (var listing = Files.list(out)) {
            List<String> pictures = listing.map(x -> x.getFileName().toString()).filter(x -> x.contains("-frame-")).toList();
            assertEquals(List.of(), pictures);
        }
        assertTrue(Files.readString(out.resolve("report.md")).contains("| src.frame | FRAME | 2 | 2 "),
                Files.readString(out.resolve("report.md")));

        // artifact under its own name
        assertEquals("samples=200\n", Files.readString(out.resolve("src-summary.txt")));

        // annotations: one JSON object a line
        List<String> lines = Files.readAllLines(out.resolve("annotations.jsonl"), StandardCharsets.UTF_8);
        assertEquals(6, lines.size());
        org.lanesift.json.JsonValue warn = null;
        for (String l : lines) {
            org.lanesift.json.JsonValue n = org.lanesift.json.JsonReader.parse("annotations.jsonl", l);
            assertEquals("src", n.get("source").asString());
            assertTrue(Long.parseLong(n.get("end_fs").numberText()) >= Long.parseLong(n.get("start_fs").numberText()));
            if (n.get("severity").asString().equals("warning")) {
                warn = n;
            }
        }
        assertNotNull(warn);
        assertEquals("level-odd", warn.get("kind").asString());
        assertEquals(Long.toString(t(100)), warn.get("start_fs").numberText());
        assertEquals("number", warn.at("/fields/volts/type").asString());
        assertEquals(0.25, warn.at("/fields/volts/value").asDouble());
        assertEquals("V", warn.at("/fields/volts/unit").asString());
        assertEquals("390400", warn.at("/fields/raw/value").asString());

        // report
        String report = Files.readString(out.resolve("report.md"));
        assertTrue(report.contains("- status: completed"), report);
        assertTrue(report.contains("| src.logic | LOGIC | 4 | 200 samples |"), report);
        assertTrue(report.contains("| th.out | LOGIC | 4 | 200 samples |"), report);
        assertTrue(report.contains("| src.frame | FRAME | 2 | 2 frames |"), report);
        assertTrue(report.contains("### Error (1)"), report);
        assertTrue(report.contains("- end-of-data: 1"), report);
        assertTrue(report.contains("### Warning (1)"), report);
        assertTrue(report.indexOf("### Error") < report.indexOf("### Warning"), "errors first");
        assertTrue(report.contains("thresholdVolts=0.55 V"), report);
        // where each value comes from: options given in the chain file apart from the defaults assumed
        String thRow = report.lines().filter(l -> l.startsWith("| th |")).findFirst().orElseThrow();
        assertTrue(thRow.endsWith("| thresholdVolts=0.55 V |  |"), thRow);
        String src = report.lines().filter(l -> l.startsWith("| src |")).findFirst().orElseThrow();
        String[] cells = src.split(" \\| ");
        assertTrue(cells[3].contains("samples=200") && cells[3].contains("blockSamples=64"), src);
        assertFalse(cells[4].contains("samples=200") || cells[4].contains("blockSamples"), src);
        assertTrue(report.contains("## Where the values come from"), report);
        assertTrue(report.contains("- standard: no finding was checked against a published limit"), report);
        assertTrue(report.contains("`signals.vcd` ("), report);
        assertFalse(Files.exists(out.resolve(".lanesift-spool")), "spool removed");
    }

    @Test
    void analogOutputsBecomeCsvWithExactTimes() throws Exception {
        Path out = tmp.resolve("o");
        Path c = tmp.resolve("analog.json");
        Files.writeString(c, "{\"nodes\": [{\"id\": \"src\", \"plugin\": \"fake-wave\", \"options\": {\"samples\": 120, \"startPs\": -3}}]}");
        Cli r = Cli.run("run", c.toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        assertEquals("", r.out(), "--quiet prints no summary");
        List<String> csv = Files.readAllLines(out.resolve("src-analog.csv"));
        assertEquals("time (s),analog (V)", csv.get(0));
        assertEquals(121, csv.size());
        for (int k = 0; k < 120; k++) {
            String[] cell = csv.get(k + 1).split(",", -1);
            // reference: exact decimal arithmetic (java.math.BigDecimal): k ns - 3 ps, in seconds
            assertEquals(0, new BigDecimal(cell[0]).compareTo(BigDecimal.valueOf(t(k) - 3000L).movePointLeft(15)), csv.get(k + 1));
            if (k % 50 == 49) {
                assertEquals("", cell[1], "invalid sample has an empty cell");
            } else {
                assertEquals((k % 10) / 10f, Float.parseFloat(cell[1]), 0f);
            }
        }
        // negative times: VCD is shifted and says so
        VcdText vcd = VcdText.read(out.resolve("signals.vcd"));
        assertTrue(vcd.comment.contains("shifted by 3000 fs"), vcd.comment);
        assertEquals("x", vcd.byName.get("src.logic").at(t(100) - 3000));
        assertEquals("1", vcd.byName.get("src.logic").at(t(3) - 3000));
    }

    @ParameterizedTest
    @ValueSource(ints = {8, 13, 37, 200})
    void outputsDoNotDependOnBlockSize(int block) throws Exception {
        Path a = tmp.resolve("a");
        Path b = tmp.resolve("b" + block);
        assertEquals(0, runAllKinds(a, "-q").code());
        assertEquals(0, runAllKinds(b, "-q", "--set", "src.blockSamples=" + block).code());
        assertEquals(body(a.resolve("signals.vcd")), body(b.resolve("signals.vcd")));
        assertArrayEquals(Files.readAllBytes(a.resolve("src-bits-bits.csv")), Files.readAllBytes(b.resolve("src-bits-bits.csv")));
    }

    /** The VCD without its $date. */
    static String body(Path vcd) throws Exception {
        String s = Files.readString(vcd);
        return s.substring(s.indexOf("$version"));
    }

    @Test
    void relativeFileOptionsResolveAgainstTheChainFileAndInputOverrides() throws Exception {
        Path out = tmp.resolve("o");
        Cli r = Cli.run("run", chain("lines.json").toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        VcdText vcd = VcdText.read(out.resolve("signals.vcd"));
        VcdText.Var v = vcd.byName.get("in.out");
        // levels.txt: 0011 1xx0 0101 at 1 ns a sample
        String expect = "0011" + "1xx0" + "0101";
        for (int k = 0; k < expect.length(); k++) {
            assertEquals(String.valueOf(expect.charAt(k)), v.at(k * 1_000_000L), "sample " + k);
        }
        Path other = chain("other-levels.txt");
        Cli r2 = Cli.run("run", chain("lines.json").toString(), "--out", tmp.resolve("p").toString(), "-q",
                "--input", "in=" + other);
        assertEquals(0, r2.code(), r2::toString);
        VcdText.Var w = VcdText.read(tmp.resolve("p/signals.vcd")).byName.get("in.out");
        assertEquals("1", w.at(3_000_000L));
        assertEquals("0", w.at(4_000_000L));
        assertTrue(Files.readString(tmp.resolve("p/report.md")).contains("`in` reads `" + other + "`"));
    }

    @Test
    void commandLineOverridesAreNamedInErrors() throws Exception {
        Cli r = runAllKinds(tmp.resolve("o"), "--set", "th.thresholdVolts=99");
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        String line = r.errLines().get(0);
        assertTrue(line.startsWith("--set th.thresholdVolts=99 ("), line);
        assertTrue(line.contains("/nodes/1/options/thresholdVolts"), line);
        assertTrue(line.contains("-10 to 10"), line);

        Cli unknown = runAllKinds(tmp.resolve("o"), "--set", "rx.x=1");
        assertEquals(2, unknown.code());
        assertTrue(unknown.errLines().get(0).contains("has no instance 'rx'; instances: src, th"), unknown::toString);

        Cli malformed = runAllKinds(tmp.resolve("o"), "--set", "novalue");
        assertEquals(2, malformed.code());
        assertTrue(malformed.errLines().get(0).contains("expected NODE.OPTION=VALUE"), malformed::toString);

        Cli missing = Cli.run("run", chain("lines.json").toString(), "--out", tmp.resolve("q").toString(),
                "--input", "in=" + tmp.resolve("nope.txt"));
        assertEquals(2, missing.code());
        assertEquals(1, missing.errLines().size());
        assertTrue(missing.errLines().get(0).contains("no such file"), missing::toString);
    }

    @Test
    void aStageFailureKeepsWhatWasWrittenAndReportsIt() throws Exception {
        Path dir = tmp.resolve("c");
        Files.createDirectories(dir);
        Files.writeString(dir.resolve("l.txt"), "0101\n1111\n01?1\n0000\n");
        Files.writeString(dir.resolve("c.json"), "{\"nodes\": [{\"id\": \"in\", \"plugin\": \"fake-lines\", \"options\": {\"file\": \"l.txt\"}}]}");
        Path out = tmp.resolve("out");
        Cli r = Cli.run("run", dir.resolve("c.json").toString(), "--out", out.toString());
        assertEquals(2, r.code(), r::toString);
        assertEquals(List.of("instance 'in': l.txt line 3: expected 0, 1 or x, found '?' at column 3"), r.errLines());
        String report = Files.readString(out.resolve("report.md"));
        assertTrue(report.contains("- status: failed: l.txt line 3"), report);
        VcdText.Var v = VcdText.read(out.resolve("signals.vcd")).byName.get("in.out");
        assertEquals("1", v.at(7_000_000L), "the lines before the bad one are in the VCD");
    }

    @Test
    void aBugInAPluginIsAnInternalErrorWithExitOne() throws Exception {
        Cli r = runAllKinds(tmp.resolve("o"), "--set", "src.bug=true");
        assertEquals(1, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.errLines().get(0).startsWith("internal error in instance 'src', please report: java.lang.NullPointerException"), r::toString);
        assertTrue(r.errLines().get(0).endsWith("(rerun with --debug for the stack trace)"), r::toString);
    }

    @Test
    void aFileWhereTheOutputFolderShouldBeIsBadInputThroughTheOutputType() throws Exception {
        Path f = tmp.resolve("plain-file");
        Files.writeString(f, "x");
        Cli r = runAllKinds(f.resolve("sub"));
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.errLines().get(0).startsWith("--out " + f.resolve("sub") + ": cannot create the directory: "), r::toString);
    }

    @Test
    void anOutputFileThatCannotBeWrittenIsBadInputNamingIt() throws Exception {
        Path out = tmp.resolve("o2");
        Files.createDirectories(out.resolve("signals.vcd")); // a folder where the VCD file goes
        Cli r = runAllKinds(out);
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.errLines().get(0).startsWith("cannot "), r::toString);
        assertTrue(r.errLines().get(0).contains(out.toString()), r::toString);
        assertFalse(r.err().contains("internal error"), r::toString);
    }

    @Test
    void anOutputPathThatIsAFileIsBadInput() throws Exception {
        Path f = tmp.resolve("file");
        Files.writeString(f, "x");
        Cli r = runAllKinds(f);
        assertEquals(2, r.code(), r::toString);
        assertEquals(List.of("--out " + f + ": exists and is not a directory"), r.errLines());
    }
}
