package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.LongRange;
import org.junit.jupiter.api.Test;
import org.lanesift.chain.ChainException;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

class DeskewEdgesLogicTest {

    @Property(tries = 50)
    void edgesMoveExactlyByTheOffset(@ForAll @LongRange(min = -5_000_000, max = 5_000_000) long offsetFs) {
        Edges e = Synth.nrz("lane0", Synth.randomBits(400, offsetFs), 1_000_000, 2_500_123.0, false);
        double ps = offsetFs / 1000.0;
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "edges", "channels", 2,
                "offsets", List.of(ps, 0.0)))) {
            List<Edges> parts = Synth.split(e, 200_000_000L, 500_000_000L);
            for (Edges p : parts) {
                h.push("in0", p);
                h.push("in1", p);
            }
            h.finish();
            List<Edges> out = h.outputs("out0", Edges.class);
            assertEquals(parts.size(), out.size());
            for (int k = 0; k < parts.size(); k++) {
                Edges a = parts.get(k);
                Edges b = out.get(k);
                assertEquals("lane0", b.channel());
                assertEquals(a.startFs() + offsetFs, b.startFs());
                assertEquals(a.endFs() + offsetFs, b.endFs());
                assertEquals(a.initialLevel(), b.initialLevel());
                assertEquals(a.count(), b.count());
                for (int i = 0; i < a.count(); i++) {
                    assertEquals(a.timesFs()[i] + offsetFs, b.timesFs()[i]);
                }
            }
            List<Edges> same = h.outputs("out1", Edges.class);
            assertArrayEquals(parts.get(1).timesFs(), same.get(1).timesFs(), "zero offset leaves the times alone");
        }
    }

    @Test
    void unknownSpansMoveToo() {
        Edges e = new Edges("x", 0, 1_000_000, true, new long[] {100_000, 200_000}, 2, new long[] {300_000, 400_000}, 1);
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "edges", "offsets", "-0.05", "offsetUnit", "ns"))) {
            h.push("in0", e).finish();
            Edges o = h.outputs("out0", Edges.class).get(0);
            assertArrayEquals(new long[] {50_000, 150_000}, java.util.Arrays.copyOf(o.timesFs(), o.count()));
            assertEquals(250_000, o.invalidSpans()[0]);
            assertEquals(350_000, o.invalidSpans()[1]);
            assertEquals(-50_000, o.startFs());
            assertEquals(950_000, o.endFs());
        }
    }

    @Test
    void logicShiftsStartWithoutResampling() {
        LogicBlock l = Synth.randomLogic("clk", 1e9, 1000, 5);
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "logic", "offsets", List.of(2.5),
                "offsetUnit", "samples"))) {
            for (LogicBlock p : Synth.split(l, 300, 129)) {
                h.push("in0", p);
            }
            h.finish();
            List<LogicBlock> out = h.outputs("out0", LogicBlock.class);
            long pos = 0;
            for (LogicBlock b : out) {
                assertEquals(Math.round(pos * 1e6) + 2_500_000L, b.startFs(), "start moves by 2.5 samples of 1 ns");
                assertEquals(1e6, b.periodFs());
                for (int i = 0; i < b.length(); i++) {
                    assertEquals(l.get((int) pos + i), b.get(i), "bits untouched");
                }
                pos += b.length();
            }
            assertEquals(1000, pos);
            // the transitions, seen as edges, moved by exactly 2.5 ns
            long[] before = LogicEdges.edgesOf(l).timesFs();
            LogicEdges conv = new LogicEdges();
            long[] after = out.stream().map(conv::toEdges).flatMapToLong(x -> java.util.Arrays.stream(x.timesFs(), 0, x.count())).toArray();
            assertEquals(before.length, after.length);
            for (int i = 0; i < before.length; i++) {
                assertEquals(before[i] + 2_500_000L, after[i]);
            }
        }
    }

    @Test
    void appliedOffsetsAreReportedAsATable() {
        Edges e = Edges.of("lane1", 0, 1000, false, 10, 20);
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "edges", "channels", 2, "offsets", "12.5, -7"))) {
            h.push("in0", Edges.of("lane0", 0, 1000, false, 5)).push("in1", e).finish();
            Artifact a = h.outputs("table", Artifact.class).get(0);
            assertEquals("dut-applied-skew.json", a.fileName());
            SkewTable t = SkewTable.parse(a.fileName(), new String(a.content(), StandardCharsets.UTF_8));
            assertEquals(12.5, t.get("lane0").offsetPs());
            assertEquals(-7.0, t.get("lane1").offsetPs());
            assertEquals(2, h.annotations("skew-applied").size());
        }
    }

    @Test
    void badOptionsNameTheOption() {
        ChainException a = assertThrows(ChainException.class, () -> StageHarness.of(new DeskewPlugin(),
                Map.of("channels", 2, "offsets", List.of(1.0))));
        assertTrue(a.getMessage().contains("'offsets'") && a.getMessage().contains("needs 2 numbers"), a.getMessage());
        ChainException b = assertThrows(ChainException.class, () -> StageHarness.of(new DeskewPlugin(), Map.of()));
        assertTrue(b.getMessage().contains("offsetsFile"), b.getMessage());
        ChainException c = assertThrows(ChainException.class, () -> StageHarness.of(new DeskewPlugin(),
                Map.of("kind", "edges", "offsets", List.of(1.0), "offsetUnit", "samples")));
        assertTrue(c.getMessage().contains("offsetUnit"), c.getMessage());
        ChainException d = assertThrows(ChainException.class, () -> StageHarness.of(new DeskewPlugin(),
                Map.of("offsets", List.of(1.0), "offsetsFile", "x.json")));
        assertTrue(d.getMessage().contains("not both"), d.getMessage());
        ChainException e = assertThrows(ChainException.class, () -> StageHarness.of(new DeskewPlugin(),
                Map.of("offsetsFile", "/nonexistent/dir/skew.json")));
        assertTrue(e.getMessage().contains("/nonexistent/dir/skew.json") && e.getMessage().contains("no such"), e.getMessage());
        ChainException f = assertThrows(ChainException.class, () -> StageHarness.of(new DeskewPlugin(),
                Map.of("offsets", List.of(2e9))));
        assertTrue(f.getMessage().contains("offsets[0]"), f.getMessage());
    }
}
