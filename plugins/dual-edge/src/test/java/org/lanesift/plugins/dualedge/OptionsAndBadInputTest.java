package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.chain.ChainException;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.StageHarness;

/** Options are checked with messages naming the option and what is allowed; bad input fails clearly. */
class OptionsAndBadInputTest {

    static String openError(Map<String, ?> options) {
        RuntimeException e = assertThrows(RuntimeException.class, () -> StageHarness.of(new DualEdgePlugin(), options).close());
        assertTrue(e instanceof OptionException || e instanceof ChainException, e.toString());
        return e.getMessage();
    }

    @Test
    void optionErrorsNameTheOption() {
        assertTrue(openError(Map.of("lanes", 0)).contains("'lanes'"));
        assertTrue(openError(Map.of("lanes", 17)).contains("1 to 16"));
        assertTrue(openError(Map.of("mode", "quad")).contains("ddr, rising, falling, multiplied"));
        assertTrue(openError(Map.of("phase", "1.5UI")).contains("'phase'"));
        assertTrue(openError(Map.of("phase", "3samples")).contains("samplePeriod"));
        assertTrue(openError(Map.of("phase", "3 parsecs")).contains("unknown time unit"));
        assertTrue(openError(Map.of("mode", "multiplied", "clockPattern", "1010100")).contains("exactly one run of 1s"));
        assertTrue(openError(Map.of("mode", "multiplied", "clockPattern", "110001")).contains("expected 7 characters"));
        assertTrue(openError(Map.of("mode", "multiplied", "slots", 5)).contains("'clockPattern' of plugin 'dual-edge' is required"));
        assertTrue(openError(Map.of("autoPhase", true, "phase", "20ps")).contains("either option 'phase'"));
        assertTrue(openError(Map.of("mode", "multiplied", "alignment", "edge")).contains("'alignment'"));
        assertTrue(openError(Map.of("marginThreshold", 0.7)).contains("0 to 0.5"));
        assertTrue(openError(Map.of("colour", "red")).contains("has no option 'colour'"));
    }

    @Test
    void portsFollowTheLaneCount() {
        PluginRegistry reg = new PluginRegistry().add(new DualEdgePlugin());
        var d = reg.find("dual-edge").descriptor();
        var ov = org.lanesift.plugin.OptionValues.validate(d, Map.of("lanes", 3));
        assertEquals("[clock, lane0, lane1, lane2]", d.inputs(ov).stream().map(p -> p.name()).toList().toString());
        assertEquals("[bits0, bits1, bits2, report]", d.outputs(ov).stream().map(p -> p.name()).toList().toString());
    }

    /** A phase in samples works once the sample period is given: 3 samples of 100 ps = 300 ps. */
    @Test
    void phaseInSamples() {
        LinkSim sim = LinkSim.ddr(2_000_000, 200, 1).build();
        Run r = Run.whole(Map.of("phase", "3samples", "samplePeriod", "100ps"), sim.clock(), sim.lane(0));
        for (int k = 0; k < 200; k++) {
            assertEquals(sim.clockT[k] + 300_000, r.lanes.get(0).times.get(k));
        }
    }

    /** An absolute phase larger than one UI of the recovered clock is refused with the option named. */
    @Test
    void absolutePhaseBeyondOneUi() {
        LinkSim sim = LinkSim.ddr(1_000_000, 200, 1).build();
        try (StageHarness h = StageHarness.of(new DualEdgePlugin(), Map.of("phase", "1.2ns"))) {
            RuntimeException e = assertThrows(RuntimeException.class, () -> h.push("clock", sim.clock()).push("lane0", sim.lane(0)).finish());
            assertTrue(e.getMessage().contains("option 'phase'") && e.getMessage().contains("more than one unit interval"),
                    e.getMessage());
        }
    }

    /** Blocks that overlap on one input are refused, naming the input and both times. */
    @Test
    void overlappingBlocks() {
        try (StageHarness h = StageHarness.of(new DualEdgePlugin(), Map.of())) {
            h.push("lane0", Edges.of("D0", 0, 1000, false, 10, 20));
            RuntimeException e = assertThrows(RuntimeException.class, () -> h.push("lane0", Edges.of("D0", 500, 2000, false, 600)));
            assertTrue(e.getMessage().contains("input 'lane0'") && e.getMessage().contains("before the end 1000 fs"), e.getMessage());
        }
    }

    /** A lane that never delivers data gives flagged, unknown bits rather than invented values. */
    @Test
    void silentLaneIsUnknown() {
        LinkSim sim = LinkSim.ddr(1_000_000, 300, 2).build();
        try (StageHarness h = StageHarness.of(new DualEdgePlugin(), Map.of("lanes", 2))) {
            h.push("clock", sim.clock()).push("lane0", sim.lane(0)).finish();
            var bits1 = h.outputs("bits1", org.lanesift.data.BitStream.class);
            int n = bits1.stream().mapToInt(b -> b.count()).sum();
            assertEquals(300, n);
            for (var b : bits1) {
                for (int i = 0; i < b.count(); i++) {
                    assertTrue(b.isFlagged(i));
                }
            }
        }
    }

    /** A level jump between two blocks of a lane (an upstream inconsistency) is marked unknown, not hidden. */
    @Test
    void levelJumpBetweenBlocks() {
        LinkSim sim = LinkSim.ddr(1_000_000, 400, 1).build();
        Edges d = sim.lane(0);
        long cut = sim.clockT[200] + 400_000; // between two sample points, off any transition
        var parts = Run.cut(d, new long[] {cut});
        Edges second = parts.get(1);
        Edges flipped = new Edges(second.channel(), second.startFs(), second.endFs(), !second.initialLevel(), second.timesFs(),
                second.count(), null, 0);
        try (StageHarness h = StageHarness.of(new DualEdgePlugin(), Map.of())) {
            h.push("clock", sim.clock()).push("lane0", parts.get(0)).push("lane0", flipped).finish();
            var bs = h.outputs("bits0", org.lanesift.data.BitStream.class);
            int k = 0;
            for (var b : bs) {
                for (int i = 0; i < b.count(); i++, k++) {
                    if (k == 200) {
                        assertEquals(400_000, b.holdFs()[i], "the jump counts as a transition at the block start");
                    }
                    if (k > 200) {
                        // the second block says the level is the opposite: the sampler follows what it was given
                        assertEquals(!sim.data[0][k], b.bit(i), "bit " + k);
                    }
                }
            }
            assertEquals(400, k);
        }
    }
}
