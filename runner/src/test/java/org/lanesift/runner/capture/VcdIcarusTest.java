package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ExternalTool;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.WordStream;

/**
 * External check of the VCD reader: the testbench in src/test/verilog is simulated by Icarus
 * Verilog (Debian package iverilog; iverilog compiles, vvp runs) and the imported edges, words and
 * samples are compared with what the testbench does by construction. Semantics of $dumpoff
 * (every variable x until $dumpon) and of x values: IEEE 1364-2005 clause 18.
 * Skipped when iverilog is not installed, except under CI=true, where it fails.
 */
class VcdIcarusTest {
    private static final long NS = 1_000_000L;

    static Path simulate(Path dir) throws IOException, InterruptedException {
        Path iverilog = ExternalTool.require("iverilog");
        Path vvp = ExternalTool.require("vvp");
        Path src = Path.of("src/test/verilog/counter_tb.v").toAbsolutePath();
        assertTrue(Files.exists(src), "testbench missing: " + src);
        exec(dir, iverilog.toString(), "-o", "tb.vvp", src.toString());
        exec(dir, vvp.toString(), "-n", "tb.vvp");
        Path vcd = dir.resolve("counter_tb.vcd");
        assertTrue(Files.size(vcd) > 0, "vvp wrote no VCD");
        return vcd;
    }

    private static void exec(Path dir, String... cmd) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(cmd).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve("log.txt").toFile()).start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail(String.join(" ", cmd) + " did not finish in 120 s");
        }
        assertEquals(0, p.exitValue(), String.join(" ", cmd) + " failed: " + Files.readString(dir.resolve("log.txt")));
    }

    @Test
    void importsWhatIcarusWrote(@TempDir Path dir) throws Exception {
        Path vcd = simulate(dir);
        for (int block : new int[] {1, 3, 7, 65536}) {
            Collected c = Collected.run(new VcdSource(), Map.of("file", vcd.toString(), "blockSamples", block, "realRateHz", 1e9));
            checkClock(c);
            checkReset(c);
            checkCounter(c);
            checkLevel(c);
        }
        // inspect sees the clock at 100 MHz: the interval across the dump-off gap is not counted
        InspectReport rep = Inspector.inspect(vcd, java.util.Map.of());
        InspectReport.Channel clk = rep.channels().stream().filter(ch -> ch.name().equals("clk")).findFirst().orElseThrow();
        assertEquals(c0Edges(), clk.edges());
        assertEquals(43e-9, clk.unknownS(), 1e-15, "x for 3 ns, dump off for 40 ns");
        assertEquals(java.util.List.of("clk"), rep.clocks().stream().map(InspectReport.Clock::channel).toList());
        assertEquals(100e6, rep.clocks().get(0).frequencyHz(), 1e-3);
    }

    private static long c0Edges() {
        long n = 0;
        for (long t = 8; t < 412; t += 5) {
            n += t >= 172 && t < 212 ? 0 : 1;
        }
        return n;
    }

    private static void checkClock(Collected c) {
        // x until 3 ns; rises at 8 + 10k ns, falls at 13 + 10k ns; dumping off from 172 to 212 ns
        List<Long> expected = new ArrayList<>();
        for (long t = 8; t <= 412; t += 5) {
            boolean off = t >= 172 && t < 212;
            if (!off && t != 412) {
                expected.add(t * NS);
            }
        }
        assertArrayEquals(expected.stream().mapToLong(Long::longValue).toArray(), c.edgeTimes("clk"), "clk transitions");
        assertArrayEquals(new long[] {0, 3 * NS, 172 * NS, 212 * NS}, c.unknownSpans("clk"), "clk unknown spans");
        assertFalse(c.firstEdges("clk").initialLevel());
        // the capture ends one time unit (1 ps) after the last timestamp, #412000
        assertEquals(412 * NS + 1000, c.lastEdges("clk").endFs());
    }

    private static void checkReset(Collected c) {
        assertArrayEquals(new long[] {0, 22 * NS}, c.edgeTimes("rst"), "rst rises at 0 from the initial low, falls at 22 ns");
        assertArrayEquals(new long[] {172 * NS, 212 * NS}, c.unknownSpans("rst"));
    }

    private static void checkCounter(Collected c) {
        List<long[]> w = c.words("count");
        List<long[]> exp = new ArrayList<>();
        exp.add(new long[] {0, 0, 8 * NS, WordStream.FLAG_SUSPECT});      // x until the first clock edge
        exp.add(new long[] {0, 8 * NS, 28 * NS, 0});                      // reset value, held through the edge at 18 ns
        for (int k = 2; k <= 15; k++) {
            exp.add(new long[] {k - 1, (8 + 10L * k) * NS, (18 + 10L * k) * NS, 0});
        }
        exp.add(new long[] {15, 168 * NS, 172 * NS, 0});
        exp.add(new long[] {0, 172 * NS, 212 * NS, WordStream.FLAG_SUSPECT}); // dump off
        exp.add(new long[] {19, 212 * NS, 218 * NS, WordStream.FLAG_GAP_BEFORE});
        for (int k = 21; k <= 39; k++) {
            exp.add(new long[] {k - 1, (8 + 10L * k) * NS, (18 + 10L * k) * NS, 0});
        }
        exp.add(new long[] {39, 408 * NS, 412 * NS + 1000, 0});
        assertEquals(exp.size(), w.size(), "count words");
        for (int i = 0; i < exp.size(); i++) {
            assertArrayEquals(exp.get(i), w.get(i), "count word " + i);
        }
    }

    private static void checkLevel(Collected c) {
        double[] v = c.analog("level");
        assertEquals(413, v.length, "one sample per ns from 0 to 412 ns");
        for (int i = 0; i < v.length; i++) {
            if (i >= 172 && i < 212) {
                assertTrue(Double.isNaN(v[i]), "sample " + i + " is invalid while dumping is off");
            } else {
                assertEquals(i < 72 ? 0.0 : 1.25, v[i], 0.0, "sample " + i);
            }
        }
    }
}
