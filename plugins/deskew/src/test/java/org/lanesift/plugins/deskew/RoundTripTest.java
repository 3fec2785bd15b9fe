package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The table {@code skew-estimate} writes, read back by {@code deskew} through {@code offsetsFile},
 * aligns the channels: estimating again on the corrected data finds (almost) no skew.
 */
class RoundTripTest {
    static final double CLOCK_FS = 10_000_000;
    static final double UI_FS = CLOCK_FS / 2;
    static final long T0 = 20_000_000;

    static Path save(StageHarness h, Path dir) throws Exception {
        Artifact a = h.outputs("table", Artifact.class).get(0);
        Path f = dir.resolve(a.fileName());
        Files.write(f, a.content());
        return f;
    }

    @Test
    void clockTableAppliedToEdgesAlignsTheLanes(@TempDir Path dir) throws Exception {
        int bits = 20_000;
        double[] skew = {650_000, -1_200_000};
        Edges clk = LinkSynth.clock("clk", bits / 2 + 2, CLOCK_FS, T0, 20_000, 1);
        Edges l0 = LinkSynth.lane("lane0", bits, UI_FS, T0, 0, skew[0], 100_000, 2);
        Edges l1 = LinkSynth.lane("lane1", bits, UI_FS, T0, 0, skew[1], 100_000, 3);
        Path file;
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock", "lanes", 2))) {
            h.push("clock", clk).push("lane0", l0).push("lane1", l1).finish();
            file = save(h, dir);
        }
        // one chain: deskew (from the file) feeding a second estimator
        PluginRegistry reg = new PluginRegistry().add(new DeskewPlugin()).add(new SkewEstimatePlugin());
        List<Block> tables = new ArrayList<>();
        Chain c = Chain.builder(reg)
                .input("clk", DataKind.EDGES).input("d0", DataKind.EDGES).input("d1", DataKind.EDGES)
                .add("fix", "deskew", Map.of("kind", "edges", "channels", 3, "offsetsFile", file.toString()))
                .add("check", "skew-estimate", Map.of("mode", "clock", "lanes", 2))
                .wire("clk", "fix.in0").wire("d0", "fix.in1").wire("d1", "fix.in2")
                .wire("fix.out0", "check.clock").wire("fix.out1", "check.lane0").wire("fix.out2", "check.lane1")
                .tap("check.table", tables::add)
                .build();
        List<Edges> cp = Synth.split(clk, 50_000_000_000L);
        List<Edges> p0 = Synth.split(l0, 50_000_000_000L);
        List<Edges> p1 = Synth.split(l1, 50_000_000_000L);
        for (int k = 0; k < cp.size(); k++) {
            c.push("clk", cp.get(k));
            c.push("d0", p0.get(k));
            c.push("d1", p1.get(k));
        }
        c.finish();
        c.close();
        Artifact a = (Artifact) tables.get(0);
        SkewTable after = SkewTable.parse("after", new String(a.content(), java.nio.charset.StandardCharsets.UTF_8));
        for (String lane : new String[] {"lane0", "lane1"}) {
            double residualUi = after.get(lane).offsetPs() * 1000 / UI_FS;
            assertTrue(Math.abs(residualUi) < 0.005, lane + " residual " + residualUi + " UI");
        }
    }

    @Test
    void legsTableAppliedToAnalogAlignsTheLegs(@TempDir Path dir) throws Exception {
        double skewPs = 173.0;
        AnalogBlock[] pn = LinkSynth.legs(8000, 1_000_000, 10e9, 250_000, skewPs * 1000, 20_000, 0.004, 7);
        Path file;
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs"))) {
            h.push("p", pn[0]).push("n", pn[1]).finish();
            file = save(h, dir);
        }
        SkewTable t = SkewTable.read(file);
        assertEquals(-skewPs, t.get("d0n").offsetPs(), 20.0);
        List<AnalogBlock> fixedP;
        List<AnalogBlock> fixedN;
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "analog", "channels", 2, "offsetsFile", file.toString()))) {
            List<AnalogBlock> ps = Synth.split(pn[0], 9000);
            List<AnalogBlock> ns = Synth.split(pn[1], 9000);
            for (int k = 0; k < ps.size(); k++) {
                h.push("in0", ps.get(k)).push("in1", ns.get(k));
            }
            h.finish();
            fixedP = h.outputs("out0", AnalogBlock.class);
            fixedN = h.outputs("out1", AnalogBlock.class);
        }
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs"))) {
            // the corrected legs arrive in differently cut blocks; re-block N on P's grid
            for (AnalogBlock b : fixedP) {
                h.push("p", b);
            }
            for (AnalogBlock b : fixedN) {
                h.push("n", b);
            }
            h.finish();
            Artifact a = h.outputs("table", Artifact.class).get(0);
            SkewTable after = SkewTable.parse("after", new String(a.content(), java.nio.charset.StandardCharsets.UTF_8));
            assertEquals(0.0, after.get("d0n").offsetPs(), 5.0, "residual skew after correction");
        }
    }
}
