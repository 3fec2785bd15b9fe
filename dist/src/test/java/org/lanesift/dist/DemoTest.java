package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.runner.Main;
import org.lanesift.testkit.ReportSources;

/** The demo end to end, as {@code ./lanesift demo} runs it: every pixel and every command must match the ground truth. */
class DemoTest {
    @Test
    void demoMatchesItsGroundTruth(@TempDir Path dir) throws Exception {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = Main.run(new String[] {"demo", "--out", dir.toString()}, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        String o = out.toString(StandardCharsets.UTF_8);
        assertEquals(0, code, o + err.toString(StandardCharsets.UTF_8));
        assertTrue(o.contains("5120 of 5120 pixels match"), o);
        assertTrue(o.contains("61 of 61 commands match"), o);
        assertTrue(o.contains("1536 of 1536 pixels match"), o);
        assertTrue(Files.exists(dir.resolve("report.md")));
        assertTrue(Files.exists(dir.resolve("chains/pixel-3-decode.json")));
        assertTrue(Files.exists(dir.resolve("packet/dsi-init.h")));
        assertTrue(Files.exists(dir.resolve("pixel/d0-eye.png")));
        // no advice to run the decode pass (with this capture's skew tables) on another capture (issue 16)
        String report = Files.readString(dir.resolve("report.md"));
        assertTrue(!report.contains("--input") && report.contains("never pass 3 alone"), report);

        // every measurement and limit in the demo's JSON reports says where it comes from (issue 17 item 8; the rule: testkit ReportSources)
        assertEquals(List.of(), ReportSources.unsourcedIn(dir), "values in the demo's JSON reports without a source");
        // report.md shows the source of each finding's numbers, and every docs/reference-facts.md anchor cited exists
        String decode = Files.readString(dir.resolve("pixel/report.md"));
        assertTrue(decode.contains("level-check: vid-high 353.4 mV, limit at least 100 mV [measured; limit standard: ANSI/TIA/EIA-644-A,"
                + " values from memory (docs/reference-facts.md#lvds-electrical-levels)]"), decode);
        assertTrue(decode.contains("skew-applied: offset +37.019 ps [given: the offsetsFile skew table, method legs-xcorr]"), decode);
        Set<String> known = ReferenceFactsTest.anchors(Files.readString(ReferenceFactsTest.repositoryRoot().resolve("docs/reference-facts.md")));
        Set<String> cited = ReportSources.citedAnchors(dir);
        assertTrue(cited.contains("lvds-electrical-levels") && cited.contains("jitter-under-the-dual-dirac-model"), cited::toString);
        assertEquals(Set.of(), new java.util.TreeSet<>(cited.stream().filter(a -> !known.contains(a)).toList()),
                "anchors the demo's outputs cite that docs/reference-facts.md does not have");

        // the chain files name their files relative to themselves: moved whole, the decode pass gives the same result
        Path moved = dir.resolveSibling(dir.getFileName() + "-moved");
        Files.move(dir, moved);
        try {
            Path again = moved.resolve("again");
            int rerun = Main.run(new String[] {"run", moved.resolve("chains/packet-3-decode.json").toString(), "--out", again.toString(),
                    "--quiet"}, new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
            assertEquals(0, rerun, err.toString(StandardCharsets.UTF_8));
            assertEquals(-1L, Files.mismatch(again.resolve("dsi-commands.json"), moved.resolve("packet/dsi-commands.json")));
            assertEquals(-1L, Files.mismatch(again.resolve("lanes-applied-skew.json"), moved.resolve("packet/lanes-applied-skew.json")));
        } finally {
            Files.move(moved, dir); // @TempDir cleans its own folder
        }

        // find-format on the packet link's legs finds the low-power/high-speed state pattern before every burst the
        // packet-link decoder saw entered (its hs-entry findings: LP-11, LP-01, LP-00, then HS on each lane)
        Path found = dir.resolve("found-format");
        int ff = Main.run(new String[] {"find-format", "--capture", dir.resolve("captures/packet-link.csv").toString(), "--map",
                "HSCLK=HSCLK_P,HSCLK_N L0=L0_P,L0_N L1=L1_P,L1_N", "--out", found.toString(), "--quiet"},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, ff, err.toString(StandardCharsets.UTF_8));
        long entries = 0;
        for (String line : Files.readAllLines(dir.resolve("packet/annotations.jsonl"))) {
            if (org.lanesift.testkit.JsonScan.parse("annotation", line).get("kind").asString().equals("hs-entry")) {
                entries++;
            }
        }
        org.lanesift.json.JsonValue states = org.lanesift.testkit.JsonScan.parse("hypotheses",
                Files.readString(found.resolve("discovery-hypotheses.json"))).at("/bursts/lineStates");
        assertTrue(entries > 50, "hs-entry findings: " + entries);
        assertEquals("LP-11, LP-01, LP-00, HS", states.get("pattern").asString());
        assertEquals(entries, (long) states.get("enteredThroughPattern").asDouble());
        assertEquals(entries, (long) states.get("highSpeedIntervals").asDouble());
    }

    @Test
    void badArgumentsExitTwoWithOneLine() {
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = Main.run(new String[] {"demo", "--frobnicate"}, new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(2, code);
        assertEquals(1, err.toString(StandardCharsets.UTF_8).trim().lines().count());
    }

    @Test
    void benchRunsTheWholeChainOnOneFrame() {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int code = Main.run(new String[] {"bench", "--samples", "528000", "--rounds", "3"}, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8));
        String o = out.toString(StandardCharsets.UTF_8);
        assertEquals(0, code, o);
        // one line per round, each with the read, the whole chain and the ratio within the round
        for (int r = 1; r <= 3; r++) {
            assertTrue(java.util.regex.Pattern.compile("(?m)^  round " + r + ": read [0-9.]+ s, whole chain [0-9.]+ s, ratio [0-9.]+")
                    .matcher(o).find(), o);
        }
        assertTrue(!o.contains("round 4:"), o);
        // the headline ratio is the median of the rounds' ratios, with their least and largest; the CPU-time figures
        // follow the wall-clock ones, with a ratio of their own
        for (String head : new String[] {"whole chain:", "whole chain \\(process CPU time, all threads\\):"}) {
            java.util.regex.Matcher m = java.util.regex.Pattern.compile(head + " [0-9.]+ M samples/s per channel, ratio to the sequential"
                    + " read ([0-9.]+)(?: \\(target 0.5\\))?, the median of ([0-9]+) rounds \\(min ([0-9.]+), max ([0-9.]+)\\)").matcher(o);
            assertTrue(m.find(), head + "\n" + o);
            double median = Double.parseDouble(m.group(1));
            double min = Double.parseDouble(m.group(3));
            double max = Double.parseDouble(m.group(4));
            assertTrue(median > 0 && Double.isFinite(median) && min <= median && median <= max, o);
            assertTrue(Integer.parseInt(m.group(2)) >= 1, o);
        }
    }
}
