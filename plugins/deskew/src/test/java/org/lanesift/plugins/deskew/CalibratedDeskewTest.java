package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.StageFailure;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.testkit.Synth;

/**
 * Estimate and correct in one run: {@code skew-estimate} tables wired into {@code deskew}'s
 * calibration inputs ({@code tables}) are filled by a calibration pass before the data, so one
 * chain run aligns the lanes; several per-lane tables merge.
 */
class CalibratedDeskewTest {
    static final double CLOCK_FS = 10_000_000;
    static final double UI_FS = CLOCK_FS / 2;
    static final long T0 = 20_000_000;
    static final int BITS = 20_000;

    /** A source replaying fixed edge lists, one block of each output per call, as a capture reader would. */
    static final class Replay implements PluginProvider {
        final List<List<Edges>> parts = new ArrayList<>();
        int opened;

        Replay(Edges... signals) {
            for (Edges e : signals) {
                parts.add(Synth.split(e, 50_000_000_000L, 90_000_000_000L));
            }
        }

        @Override
        public PluginDescriptor descriptor() {
            PluginDescriptor.Builder b = PluginDescriptor.builder("test.replay").option(OptionSpec.text("file", "", "unused"));
            for (int i = 0; i < parts.size(); i++) {
                b.output(PortSpec.of("s" + i, DataKind.EDGES, "signal " + i));
            }
            return b.build();
        }

        @Override
        public Stage open(StageContext ctx) {
            opened++;
            return new Stage() {
                int k;

                @Override
                public boolean produce() {
                    for (int i = 0; i < parts.size(); i++) {
                        ctx.emit(i, parts.get(i).get(k));
                    }
                    k++;
                    return k < parts.get(0).size();
                }
            };
        }
    }

    private static double[] residualsUi(List<Block> tables) {
        Artifact a = (Artifact) tables.get(0);
        SkewTable after = SkewTable.parse("after", new String(a.content(), StandardCharsets.UTF_8));
        return new double[] {after.get("lane0").offsetPs() * 1000 / UI_FS, after.get("lane1").offsetPs() * 1000 / UI_FS};
    }

    private static Replay link() {
        Edges clk = LinkSynth.clock("clk", BITS / 2 + 2, CLOCK_FS, T0, 20_000, 1);
        Edges l0 = LinkSynth.lane("lane0", BITS, UI_FS, T0, 0, 650_000, 100_000, 2);
        Edges l1 = LinkSynth.lane("lane1", BITS, UI_FS, T0, 0, -1_200_000, 100_000, 3);
        return new Replay(clk, l0, l1);
    }

    @Test
    void oneTableEstimatedAndAppliedInOneRunAlignsTheLanes() {
        Replay src = link();
        List<Block> tables = new ArrayList<>();
        List<String> findings = new ArrayList<>();
        ChainBuilder b = Chain.builder(new PluginRegistry().add(src).add(new DeskewPlugin()).add(new SkewEstimatePlugin()))
                .add("cap", "test.replay")
                .add("est", "skew-estimate", Map.of("mode", "clock", "lanes", 2))
                .add("fix", "deskew", Map.of("kind", "edges", "channels", 3, "tables", 1))
                .add("check", "skew-estimate", Map.of("mode", "clock", "lanes", 2))
                .wire("cap.s0", "est.clock").wire("cap.s1", "est.lane0").wire("cap.s2", "est.lane1")
                .wire("cap.s0", "fix.in0").wire("cap.s1", "fix.in1").wire("cap.s2", "fix.in2").wire("est", "fix.table0")
                .wire("fix.out0", "check.clock").wire("fix.out1", "check.lane0").wire("fix.out2", "check.lane1")
                .tap("check.table", tables::add)
                .annotations((id, a) -> findings.add(id + " " + a.kind() + " " + a.label()));
        try (Chain c = b.build()) {
            c.run();
        }
        assertEquals(2, src.opened, "the capture is read twice: calibration pass, then decode from the start");
        for (double r : residualsUi(tables)) {
            // before correction the lanes sit 0.13 and 0.24 UI off; after, the residual is the estimator's noise
            assertTrue(Math.abs(r) < 0.005, "residual " + r + " UI, findings " + findings);
        }
        assertEquals(3, findings.stream().filter(f -> f.startsWith("fix skew-applied ")).count(),
                "each channel's correction applied once: " + findings);
        assertEquals(2, findings.stream().filter(f -> f.startsWith("est skew-estimate ")).count(),
                "the estimator's findings once, from its calibration pass: " + findings);
    }

    @Test
    void twoPerLaneTablesMergeTheirSharedReferenceRow() {
        Replay src = link();
        List<Block> tables = new ArrayList<>();
        ChainBuilder b = Chain.builder(new PluginRegistry().add(src).add(new DeskewPlugin()).add(new SkewEstimatePlugin()))
                .add("cap", "test.replay")
                .add("est0", "skew-estimate", Map.of("mode", "clock", "lanes", 1))
                .add("est1", "skew-estimate", Map.of("mode", "clock", "lanes", 1))
                .add("fix", "deskew", Map.of("kind", "edges", "channels", 3, "tables", 2))
                .add("check", "skew-estimate", Map.of("mode", "clock", "lanes", 2))
                .wire("cap.s0", "est0.clock").wire("cap.s1", "est0.lane0")
                .wire("cap.s0", "est1.clock").wire("cap.s2", "est1.lane0")
                .wire("cap.s0", "fix.in0").wire("cap.s1", "fix.in1").wire("cap.s2", "fix.in2")
                .wire("est0", "fix.table0").wire("est1", "fix.table1")
                .wire("fix.out0", "check.clock").wire("fix.out1", "check.lane0").wire("fix.out2", "check.lane1")
                .tap("check.table", tables::add);
        try (Chain c = b.build()) {
            c.run();
        }
        for (double r : residualsUi(tables)) {
            assertTrue(Math.abs(r) < 0.005, "residual " + r + " UI");
        }
    }

    @Test
    void aChannelWithTwoDifferentEstimatesIsRefusedNamingBothTables() {
        Replay src = link();
        // both estimators measure lane0, one against the clock and one against lane1's edges: different offsets
        ChainBuilder b = Chain.builder(new PluginRegistry().add(src).add(new DeskewPlugin()).add(new SkewEstimatePlugin()))
                .add("cap", "test.replay")
                .add("a", "skew-estimate", Map.of("mode", "clock", "lanes", 1))
                .add("b", "skew-estimate", Map.of("mode", "clock", "lanes", 1, "alignment", "centre"))
                .add("fix", "deskew", Map.of("kind", "edges", "channels", 2, "tables", 2))
                .wire("cap.s0", "a.clock").wire("cap.s1", "a.lane0").wire("cap.s0", "b.clock").wire("cap.s1", "b.lane0")
                .wire("cap.s0", "fix.in0").wire("cap.s1", "fix.in1").wire("a", "fix.table0").wire("b", "fix.table1");
        try (Chain c = b.build()) {
            StageFailure f = assertThrows(StageFailure.class, c::run);
            assertTrue(f.getCause() instanceof InputException, String.valueOf(f.getCause()));
            assertTrue(f.getMessage().contains("channel 'lane0' has") && f.getMessage().contains("a-skew.json")
                    && f.getMessage().contains("b-skew.json"), f.getMessage());
        }
    }

    @Test
    void tablesExcludeOffsetsAndFile() {
        ChainBuilder b = Chain.builder(new PluginRegistry().add(link()).add(new DeskewPlugin()).add(new SkewEstimatePlugin()))
                .add("cap", "test.replay")
                .add("est", "skew-estimate", Map.of("mode", "clock", "lanes", 1))
                .add("fix", "deskew", Map.of("kind", "edges", "channels", 2, "tables", 1, "offsets", List.of(0, 5)))
                .wire("cap.s0", "est.clock").wire("cap.s1", "est.lane0")
                .wire("cap.s0", "fix.in0").wire("cap.s1", "fix.in1").wire("est", "fix.table0");
        Exception e = assertThrows(Exception.class, () -> b.build().close());
        assertTrue(e.getMessage().contains("give no offsets and no offsetsFile"), e.getMessage());
    }

    @Test
    void rowsBelowMinConfidenceAreNotAppliedAndSaySo() {
        // lane1 carries no phase relation to the clock: random transition times give a weak estimate
        Edges clk = LinkSynth.clock("clk", BITS / 2 + 2, CLOCK_FS, T0, 20_000, 1);
        Edges l0 = LinkSynth.lane("lane0", BITS, UI_FS, T0, 0, 650_000, 100_000, 2);
        Edges l1 = LinkSynth.lane("lane1", BITS, UI_FS * 1.37, T0, 0, 0, 100_000, 3);
        Replay src = new Replay(clk, l0, l1);
        List<Annotation> found = new ArrayList<>();
        List<Block> applied = new ArrayList<>();
        ChainBuilder b = Chain.builder(new PluginRegistry().add(src).add(new DeskewPlugin()).add(new SkewEstimatePlugin()))
                .add("cap", "test.replay")
                .add("est", "skew-estimate", Map.of("mode", "clock", "lanes", 2))
                .add("fix", "deskew", Map.of("kind", "edges", "channels", 3, "tables", 1, "minConfidence", 0.5))
                .wire("cap.s0", "est.clock").wire("cap.s1", "est.lane0").wire("cap.s2", "est.lane1")
                .wire("cap.s0", "fix.in0").wire("cap.s1", "fix.in1").wire("cap.s2", "fix.in2").wire("est", "fix.table0")
                .tap("fix.table", applied::add)
                .annotations((id, a) -> found.add(a));
        try (Chain c = b.build()) {
            c.run();
        }
        assertTrue(found.stream().anyMatch(a -> a.kind().equals("skew-not-applied") && a.track().equals("lane1")),
                "lane1's weak estimate is reported as not applied");
        assertTrue(found.stream().noneMatch(a -> a.kind().equals("skew-not-applied") && a.track().equals("lane0")));
        SkewTable t = SkewTable.parse("applied", new String(((Artifact) applied.get(0)).content(), StandardCharsets.UTF_8));
        assertEquals(0.0, t.get("lane1").offsetPs(), 0.0);
        assertTrue(Math.abs(t.get("lane0").offsetPs() + 650) < 20, "lane0 corrected by about -650 ps: " + t.get("lane0"));
    }
}
