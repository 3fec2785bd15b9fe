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
import org.lanesift.runner.output.OutputFolder;

/**
 * A run never touches its inputs and never looks complete when it was not (issue 18 item 1):
 * an output that would replace an input is refused, also through a link; a link planted inside
 * {@code --out} is replaced, not written through; files of an earlier run are listed as stale and
 * kept; a run that never finished leaves the earlier report and files as they were.
 */
class OutputFolderTest {
    @TempDir
    Path tmp;

    private Path chainOver(Path levels) throws Exception {
        Path c = tmp.resolve("c.json");
        Files.writeString(c, "{\"nodes\": [{\"id\": \"in\", \"plugin\": \"fake-lines\", \"options\": {\"file\": \""
                + levels.toString().replace("\\", "\\\\") + "\"}}]}");
        return c;
    }

    private Path levels(Path where) throws Exception {
        Files.createDirectories(where.getParent());
        Files.writeString(where, "0011\n1xx0\n0101\n");
        return where;
    }

    @Test
    void anInputNamedLikeAnOutputInsideOutIsRefusedAndKept() throws Exception {
        Path out = tmp.resolve("out");
        Path input = levels(out.resolve("report.md"));
        byte[] before = Files.readAllBytes(input);
        Cli r = Cli.run("run", chainOver(input).toString(), "--out", out.toString(), "-q");
        assertEquals(2, r.code(), r::toString);
        assertEquals(1, r.errLines().size(), r::toString);
        assertTrue(r.errLines().get(0).contains("output report.md would replace the input " + input), r::toString);
        assertEquals(new String(before), Files.readString(input));
        try (Stream<Path> s = Files.list(out)) {
            assertEquals(List.of(input), s.toList(), "no work folder left behind");
        }
    }

    @Test
    void anInputReachedThroughALinkInsideOutIsRefused() throws Exception {
        Path input = levels(tmp.resolve("caps/levels.txt"));
        Path out = tmp.resolve("out");
        Files.createDirectories(out);
        Files.createSymbolicLink(out.resolve("signals.vcd"), input);
        byte[] before = Files.readAllBytes(input);
        Cli r = Cli.run("run", chainOver(input).toString(), "--out", out.toString(), "-q");
        assertEquals(2, r.code(), r::toString);
        assertTrue(r.errLines().get(0).contains("output signals.vcd would replace the input " + input + " (through a link)"), r::toString);
        assertEquals(new String(before), Files.readString(input));
    }

    @Test
    void aLinkPlantedInsideOutIsReplacedNotFollowed() throws Exception {
        Path input = levels(tmp.resolve("caps/levels.txt"));
        Path victim = tmp.resolve("elsewhere/victim.txt");
        Files.createDirectories(victim.getParent());
        Files.writeString(victim, "keep me");
        Path out = tmp.resolve("out");
        Files.createDirectories(out);
        Files.createSymbolicLink(out.resolve("signals.vcd"), victim);
        Files.createSymbolicLink(out.resolve("report.md"), victim);
        Cli r = Cli.run("run", chainOver(input).toString(), "--out", out.toString(), "-q");
        assertEquals(0, r.code(), r::toString);
        assertEquals("keep me", Files.readString(victim));
        assertFalse(Files.isSymbolicLink(out.resolve("signals.vcd")));
        assertFalse(Files.isSymbolicLink(out.resolve("report.md")));
        assertTrue(Files.readString(out.resolve("report.md")).contains("- status: completed"));
    }

    @Test
    void outputsOfAnEarlierRunAreListedAsStaleAndKept() throws Exception {
        Path out = tmp.resolve("out");
        Cli first = Cli.run("run", RunCommandTest.chain("all-kinds.json").toString(), "--out", out.toString(), "-q");
        assertEquals(0, first.code(), first::toString);
        assertTrue(Files.exists(out.resolve("src-bits-bits.csv")));
        Path input = levels(tmp.resolve("caps/levels.txt"));
        Cli second = Cli.run("run", chainOver(input).toString(), "--out", out.toString(), "-q");
        assertEquals(0, second.code(), second::toString);
        String report = Files.readString(out.resolve("report.md"));
        assertTrue(report.contains("## Stale files"), report);
        assertTrue(report.contains("- `src-bits-bits.csv`"), report);
        assertFalse(report.contains("- `signals.vcd`\n"), "rewritten files are not stale: " + report);
        assertTrue(Files.exists(out.resolve("src-bits-bits.csv")), "stale files are kept");
        assertEquals(List.of(), OutputFolder.open(out, List.of()).stale(List.of("signals.vcd", "report.md", "annotations.jsonl"))
                .stream().filter(n -> !n.startsWith(OutputFolder.WORK_PREFIX)).filter(n -> !n.equals("src-bits-bits.csv")).toList());
    }

    @Test
    void aRunThatNeverFinishedLeavesTheEarlierRunAsItWasAndIsListed() throws Exception {
        Path input = levels(tmp.resolve("caps/levels.txt"));
        Path out = tmp.resolve("out");
        assertEquals(0, Cli.run("run", chainOver(input).toString(), "--out", out.toString(), "-q").code());
        byte[] vcd = Files.readAllBytes(out.resolve("signals.vcd"));
        String report = Files.readString(out.resolve("report.md"));
        // a run killed half way: its work folder holds a report that says so, the published files are untouched
        OutputFolder killed = OutputFolder.open(out, List.of(input));
        Files.writeString(killed.work().resolve("signals.vcd"), "half");
        assertTrue(Files.readString(killed.work().resolve("report.md")).contains("status: interrupted"));
        assertEquals(report, Files.readString(out.resolve("report.md")));
        assertEquals(new String(vcd), new String(Files.readAllBytes(out.resolve("signals.vcd"))));
        // the next run lists the unfinished run's folder as stale
        assertEquals(0, Cli.run("run", chainOver(input).toString(), "--out", out.toString(), "-q").code());
        String next = Files.readString(out.resolve("report.md"));
        assertTrue(next.contains("- `" + killed.work().getFileName() + "/`"), next);
    }
}
