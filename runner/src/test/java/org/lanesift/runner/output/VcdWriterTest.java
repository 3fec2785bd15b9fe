package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.Set;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.WordStream;
import org.lanesift.testkit.Synth;

/** The VCD text, exactly, for small inputs; and independence from how the input is cut into blocks. */
class VcdWriterTest {
    @TempDir
    Path tmp;

    static String bodyAfterDefinitions(Path f) throws Exception {
        String s = Files.readString(f);
        return s.substring(s.indexOf("$enddefinitions $end\n") + "$enddefinitions $end\n".length());
    }

    @Test
    void edgesWithAnUnknownSpanAndAVector() throws Exception {
        Path f = tmp.resolve("a.vcd");
        VcdWriter w = new VcdWriter(f, tmp.resolve("spool"), "test");
        // low, rises at 10, x from 20 to 30 (level after the span: still high), falls at 40
        w.edges("rx", "d", new Edges("d", 0, 50, false, new long[] {10, 40}, 2, new long[] {20, 30}, 1));
        WordStream ws = new WordStream("w", 0, 50, 2, 4, new long[] {5, 0xA}, new long[] {0, 10}, new long[] {10, 15},
                new int[2], new byte[2]);
        w.words("rx", "word", ws);
        w.close();
        String head = Files.readString(f);
        // IEEE 1364-2005 18.2: declarations; $timescale 1 fs; identifier codes from '!' on
        assertTrue(head.contains("$timescale 1 fs $end\n$scope module rx $end\n$var wire 1 ! d $end\n"
                + "$var wire 4 \" word [3:0] $end\n$upscope $end\n$enddefinitions $end\n"), head);
        assertEquals("#0\n$dumpvars\nx!\nbx \"\n$end\n0!\nb101 \"\n"
                + "#10\n1!\nb1010 \"\n"
                + "#15\nbx \"\n"
                + "#20\nx!\n"
                + "#30\n1!\n"
                + "#40\n0!\n", bodyAfterDefinitions(f));
        assertFalse(Files.exists(tmp.resolve("spool")));
    }

    /**
     * Two lanes carry bytes side by side: bytes k and k+1 start at the same instant. Each lane gets
     * its own vector and its own flags vector, so no byte is lost (IEEE 1364-2005 18.2: one value
     * per variable per time).
     */
    @Test
    void wordsOnSeveralLanesKeepEveryWordAndItsFlags() throws Exception {
        Path f = tmp.resolve("lanes.vcd");
        VcdWriter w = new VcdWriter(f, tmp.resolve("spool"), "test");
        WordStream ws = new WordStream("p", 0, 20, 4, 8, new long[] {0x11, 0x22, 0x33, 0x44}, new long[] {0, 0, 10, 10},
                new long[] {10, 10, 20, 20}, new int[] {0, 1, 0, 1}, new byte[] {6, 0, 0, 32});
        w.words("dsi", "packets", ws);
        w.close();
        String head = Files.readString(f);
        assertTrue(head.contains("$scope module dsi $end\n$var wire 8 ! packets_lane0 [7:0] $end\n"
                + "$var wire 8 \" packets_lane0_flags [7:0] $end\n$var wire 8 # packets_lane1 [7:0] $end\n"
                + "$var wire 8 $ packets_lane1_flags [7:0] $end\n$upscope $end\n"), head);
        assertEquals("#0\n$dumpvars\nbx !\nbx \"\nbx #\nbx $\n$end\n"
                + "b10001 !\nb110 \"\nb100010 #\nb0 $\n"
                + "#10\nb110011 !\nb0 \"\nb1000100 #\nb100000 $\n"
                + "#20\nbx !\nbx \"\nbx #\nbx $\n", bodyAfterDefinitions(f));
    }

    @Test
    void logicKeepsTheLevelAfterAnUnknownRun() throws Exception {
        Path f = tmp.resolve("l.vcd");
        VcdWriter w = new VcdWriter(f, tmp.resolve("spool"), "test");
        // samples 1 1 x x 0 0 at 10 fs from 100 fs: changes at the midpoints 115 and 135
        w.logic("a", "s", new LogicBlock("s", 0, 100, 10, new long[] {0b001111L}, 6, new long[] {0b001100L}));
        w.close();
        assertEquals("#100\n$dumpvars\nx!\n$end\n1!\n#115\nx!\n#135\n0!\n", bodyAfterDefinitions(f));
    }

    @Test
    void identifierCodesAreUniquePrintableAscii() {
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < 20_000; i++) {
            String c = VcdWriter.code(i);
            assertTrue(seen.add(c), c);
            for (char ch : c.toCharArray()) {
                assertTrue(ch >= 33 && ch <= 126);
            }
        }
        assertEquals("!", VcdWriter.code(0));
        assertEquals("~", VcdWriter.code(93));
        assertEquals("!!", VcdWriter.code(94));
    }

    @Test
    void nothingWrittenWithoutSignals() throws Exception {
        Path f = tmp.resolve("none.vcd");
        VcdWriter w = new VcdWriter(f, tmp.resolve("spool"), "test");
        w.close();
        assertFalse(Files.exists(f));
    }

    /** Cutting the same logic and edges into blocks anywhere gives the same file (testkit Synth.split). */
    @Property(tries = 40)
    void blockBoundariesDoNotShow(@ForAll @IntRange(min = 1, max = 400) int cut1, @ForAll @IntRange(min = 1, max = 400) int cut2)
            throws Exception {
        LogicBlock whole = Synth.randomLogic("d", 1e9, 900, 7);
        long[] inv = new long[whole.bits().length];
        inv[3] = 0xF0L; // an unknown run
        LogicBlock withX = new LogicBlock("d", 0, 0, whole.periodFs(), whole.bits(), 900, inv);
        Edges clk = Synth.clock("c", 2e6, 0.5, 1_000_000L, 200);
        Path dir = Files.createTempDirectory("vcdprop");
        try {
            Path one = dir.resolve("one.vcd");
            VcdWriter a = new VcdWriter(one, dir.resolve("s1"), "t");
            a.logic("x", "d", withX);
            a.edges("x", "c", clk);
            a.close();
            int c1 = Math.min(cut1, cut2);
            int c2 = Math.max(cut1, cut2);
            Path many = dir.resolve("many.vcd");
            VcdWriter b = new VcdWriter(many, dir.resolve("s2"), "t");
            int[] sizes = c1 == c2 ? new int[] {c1, 900 - c1} : new int[] {c1, c2 - c1, 900 - c2};
            for (LogicBlock part : Synth.split(withX, sizes)) {
                b.logic("x", "d", part);
            }
            for (Edges part : Synth.split(clk, c1 * 1_000_000L, c2 * 1_000_000L + 1)) {
                b.edges("x", "c", part);
            }
            b.close();
            assertEquals(bodyAfterDefinitions(one), bodyAfterDefinitions(many));
        } finally {
            try (var walk = Files.walk(dir)) { // a property has no @TempDir: remove the folder of each try
                walk.sorted(java.util.Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    /** Open file descriptors of this process (Linux), or -1 elsewhere. */
    private static long openFiles() throws Exception {
        Path fd = Path.of("/proc/self/fd");
        if (!Files.isDirectory(fd)) {
            return -1;
        }
        try (var l = Files.list(fd)) {
            return l.count();
        }
    }

    private static void manySignals(LegacyVcdWriter w, int signals) {
        for (int k = 0; k < signals; k++) {
            w.edges("cap", "s" + k, new Edges("s" + k, 0, 10_000, false, new long[] {10 + k, 5000 + 3L * k}, 2, new long[0], 0));
        }
    }

    private static void manySignals(VcdWriter w, int signals) {
        for (int k = 0; k < signals; k++) {
            // signal k: low, rises at 10 + k, falls at 5000 + 3 k
            w.edges("cap", "s" + k, new Edges("s" + k, 0, 10_000, false, new long[] {10 + k, 5000 + 3L * k}, 2, new long[0], 0));
        }
    }

    /**
     * Issue 18: 1,500 signals never keep 1,500 files open ("Too many open files"): a signal's spool
     * is open only while changes are appended or a chunk is read back. Whether the file is laid out
     * early (declared signals, written while they arrive) or at close, and whether the changes stay
     * in memory or go through the spools (a budget of 7 changes), the VCD is the one the writer
     * before issue 19 wrote ({@link LegacyVcdWriter}, merge of everything at close).
     */
    @Test
    void fileHandlesStayBoundedWhateverTheNumberOfSignals() throws Exception {
        Path h = tmp.resolve("legacy.vcd");
        LegacyVcdWriter legacy = new LegacyVcdWriter(h, tmp.resolve("spool0"), "test", 100_000);
        manySignals(legacy, 1500);
        legacy.close();
        String body = bodyAfterDefinitions(h);
        assertTrue(body.contains("#5000\n"), "the first fall");
        int n = 0;
        for (boolean declared : new boolean[] {false, true}) {
            for (int budget : new int[] {7, VcdWriter.QUEUE_BUDGET}) {
                long before = openFiles();
                Path f = tmp.resolve("many" + n + ".vcd");
                Path spool = tmp.resolve("spool" + ++n);
                VcdWriter w = new VcdWriter(f, spool, "test", budget);
                if (declared) {
                    for (int k = 0; k < 1500; k++) {
                        w.declare("cap", "s" + k);
                    }
                }
                manySignals(w, 1500);
                long during = openFiles();
                if (before >= 0) {
                    assertTrue(during - before < 20, "files open while writing 1500 signals: " + (during - before));
                }
                assertEquals(declared, w.streaming(), "laid out early when declared");
                w.close();
                assertEquals(body, bodyAfterDefinitions(f), "declared " + declared + ", budget " + budget);
                assertFalse(Files.exists(spool), "no spool left behind");
            }
        }
    }

    /**
     * Issue 18 item 6: a gap between blocks (a live source's lost frame, a disconnect) is unknown in
     * the VCD, for logic and for edges; the last level is never held across it.
     */
    @Test
    void gapsBetweenBlocksAreUnknown() throws Exception {
        Path f = tmp.resolve("gap.vcd");
        VcdWriter w = new VcdWriter(f, tmp.resolve("spool"), "test");
        // logic at 10 fs a sample: samples 0..3 (1 1 1 1) from 0, then samples 10..13 (1 1 0 0) from 100
        w.logic("a", "s", new LogicBlock("s", 0, 0, 10, new long[] {0b1111L}, 4, null));
        w.logic("a", "s", new LogicBlock("s", 10, 100, 10, new long[] {0b0011L}, 4, null));
        // edges: high from 0 to 40, then a block from 100 to 140 starting high, falling at 120
        w.edges("a", "e", new Edges("e", 0, 40, true, new long[0], 0, new long[0], 0));
        w.edges("a", "e", new Edges("e", 100, 140, true, new long[] {120}, 1, new long[0], 0));
        w.close();
        assertEquals("#0\n$dumpvars\nx!\nx\"\n$end\n1!\n1\"\n"
                + "#35\nx!\n"
                + "#40\nx\"\n"
                + "#100\n1!\n1\"\n"
                + "#115\n0!\n"
                + "#120\n0\"\n", bodyAfterDefinitions(f));
    }
}
