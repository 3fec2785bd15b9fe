package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.BitSets;
import org.lanesift.runner.output.BinaryOutputs;

/**
 * Which outputs a run writes: by-products left out by default, the chain file's {@code outputs}
 * field, {@code --outputs} over it, {@code none}, the binary forms, and unknown names refused.
 */
class OutputSelectionTest {
    @TempDir
    Path tmp;

    /** all-kinds.json without its outputs field: src feeds th through src.analog, so src's other streams are by-products. */
    Path chain(String outputsField) throws Exception {
        String text = Files.readString(RunCommandTest.chain("all-kinds.json"))
                .replace("  \"outputs\": [\"standard\", \"by-products\"],\n", outputsField == null ? "" : "  \"outputs\": " + outputsField + ",\n");
        Path f = tmp.resolve("chain.json");
        Files.writeString(f, text);
        return f;
    }

    static List<String> files(Path dir) throws Exception {
        try (Stream<Path> l = Files.list(dir)) {
            return l.map(p -> p.getFileName().toString()).filter(n -> !n.startsWith(".")).sorted().toList();
        }
    }

    @Test
    void byProductsAreLeftOutByDefault() throws Exception {
        Path out = tmp.resolve("out");
        Cli r = Cli.run("run", chain(null).toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        // th.out is the chain's end: in the VCD; src.logic/edges/words/bits are by-products; the artifact stays
        assertEquals(List.of("annotations.jsonl", "report.md", "signals.vcd", "src-summary.txt"), files(out));
        VcdText vcd = VcdText.read(out.resolve("signals.vcd"));
        assertEquals(List.of("th.out"), List.copyOf(vcd.byName.keySet()));
        String report = Files.readString(out.resolve("report.md"));
        assertTrue(report.contains("Left out, not written: src.logic, src.edges, src.words, src.bits, src.frame."), report);
        assertTrue(report.contains("| th.out | LOGIC | 4 | 200 samples |"), report);
        assertFalse(report.contains("| src.logic |"), report);
    }

    @Test
    void noneWritesOnlyTheReportWithEveryCount() throws Exception {
        Path out = tmp.resolve("out");
        Cli r = Cli.run("run", chain("[\"standard\", \"by-products\"]").toString(), "--out", out.toString(), "-q", "--outputs", "none");
        assertEquals(0, r.code(), r::toString);
        assertEquals(List.of("report.md"), files(out));
        String report = Files.readString(out.resolve("report.md"));
        assertTrue(report.contains("Written: none (no output files; this report only)"), report);
        assertTrue(report.contains("| th.out | LOGIC | 4 | 200 samples |"), report);
        assertTrue(report.contains("### Error (1)"), "findings still counted: " + report);
    }

    @Test
    void theChainFileFieldChoosesAndTheOptionOverridesIt() throws Exception {
        Path a = tmp.resolve("a");
        Cli r = Cli.run("run", chain("[\"src.bits\", \"src.report\"]").toString(), "--out", a.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        assertEquals(List.of("annotations.jsonl", "report.md", "src-bits-bits.csv", "src-summary.txt"), files(a));
        Path b = tmp.resolve("b");
        r = Cli.run("run", chain("[\"src.bits\"]").toString(), "--out", b.toString(), "-q", "--outputs", "vcd");
        assertEquals(0, r.code(), r::toString);
        assertEquals(List.of("report.md", "signals.vcd"), files(b));
    }

    @Test
    void binaryBitsHoldWhatTheCsvHolds() throws Exception {
        Path out = tmp.resolve("out");
        Cli r = Cli.run("run", chain(null).toString(), "--out", out.toString(), "-q", "--outputs", "csv,binary,by-products");
        assertEquals(0, r.code(), r::toString);
        assertTrue(files(out).containsAll(List.of("src-bits.bits", "src-bits-bits.csv", "src-words.words")), files(out)::toString);
        assertFalse(files(out).contains("src-analog.csv"), "src.analog feeds th: no result");
        List<String> rows = Files.readAllLines(out.resolve("src-bits-bits.csv"));
        BinaryOutputs.Bits bits = BinaryOutputs.bits(out.resolve("src-bits.bits"));
        assertEquals(rows.size() - 1, bits.count());
        assertEquals(rows.size() - 1, bits.headerCount());
        for (int i = 0; i < bits.count(); i++) {
            String[] c = rows.get(i + 1).split(",", -1);
            assertEquals(c[1].equals("1"), BitSets.get(bits.values(), i), rows.get(i + 1));
            assertEquals(c[7].equals("1"), BitSets.get(bits.flagged(), i), rows.get(i + 1));
            assertEquals(c[4].equals("fall"), BitSets.get(bits.falling(), i), rows.get(i + 1));
        }
        assertEquals(Long.parseLong(rows.get(1).split(",")[2]), bits.chunks().get(0).firstClockEdge());
        // the counter words: word k is k (fake-wave), one every 8 samples of 200
        List<BinaryOutputs.Word> words = BinaryOutputs.words(out.resolve("src-words.words"));
        assertEquals(25, words.size());
        for (int k = 0; k < words.size(); k++) {
            assertEquals(k, words.get(k).value(), "word " + k);
            assertEquals(8, words.get(k).widthBits());
        }
    }

    @Test
    void unknownNamesAreRefusedNamingTheFieldAndTheValidNames() throws Exception {
        Cli r = Cli.run("run", chain("[\"standard\", \"bitz\"]").toString(), "--out", tmp.resolve("a").toString());
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertEquals(tmp.resolve("chain.json") + " /outputs/1: unknown output name 'bitz'; expected one of: none, standard, by-products,"
                + " vcd, csv, binary, artifacts, annotations, src.bits, src.edges, src.frame, src.logic, src.report, src.words,"
                + " th.out", r.errLines().get(0));
        r = Cli.run("run", chain(null).toString(), "--out", tmp.resolve("b").toString(), "--outputs", "binary,th.in");
        assertEquals(2, r.code(), r::toString);
        assertTrue(r.errLines().get(0).startsWith("--outputs binary,th.in: unknown output name 'th.in'; expected one of: none,"), r::toString);
        r = Cli.run("run", chain(null).toString(), "--out", tmp.resolve("c").toString(), "--outputs", "none,vcd");
        assertEquals(2, r.code(), r::toString);
        assertTrue(r.errLines().get(0).contains("'none' writes no output file"), r::toString);
        r = Cli.run("run", chain("[]").toString(), "--out", tmp.resolve("d").toString());
        assertEquals(2, r.code(), r::toString);
        assertTrue(r.errLines().get(0).contains("/outputs: is empty"), r::toString);
        assertFalse(Files.exists(tmp.resolve("a")) || Files.exists(tmp.resolve("b")), "nothing written before the names are checked");
    }
}
