package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The analog stage runs the comparator ahead of the window statistics in pieces of
 * {@link AnalogStage#PIECE_SAMPLES} (so the statistics read samples still in cache). This checks on
 * a seeded corpus that the pieces change nothing: edges, unknown spans, logic bits, every
 * annotation (level checks, summary, drift-driven thresholds) and the levels report are exactly
 * those of the earlier path, one comparator run and one statistics pass per window segment
 * (pieces of unbounded length), and of pieces of odd sizes.
 */
class PieceFusionTest {
    static final int N = 150_000;

    /** The differential plugin with the comparator run ahead of the statistics by a given piece length. */
    private record Pieces(int pieceSamples) implements PluginProvider {
        @Override
        public PluginDescriptor descriptor() {
            return new DifferentialPlugin().descriptor();
        }

        @Override
        public Stage open(StageContext context) {
            return new AnalogStage(context, new Settings(context.options(), context.instanceId()), pieceSamples);
        }
    }

    /**
     * A double-edge-link-like pair: about 12.5 samples per bit (a clock-like run, then random data),
     * 10 mV noise, a level drift that moves the learned hysteresis, a masked run and a NaN.
     */
    static AnalogBlock[] capture(long seed) {
        Random r = new Random(seed);
        boolean[] bits = new boolean[(int) (N / 12.5) + 2];
        for (int i = 0; i < bits.length; i++) {
            bits[i] = i < bits.length / 4 ? (i & 1) == 1 : r.nextBoolean();
        }
        float[] d = TestSignals.nrz(bits, 12.5, 1.0 + r.nextDouble(), 0.175, r.nextDouble() * 5, N);
        for (int i = 0; i < N; i++) {
            d[i] = (float) (d[i] * (1 - 0.3 * i / N) + 0.01 * r.nextGaussian());
        }
        long[] inv = new long[BitSets.words(N)];
        int g = 20_000 + r.nextInt(60_000);
        BitSets.setRange(inv, g, g + 1 + r.nextInt(300));
        AnalogBlock diff = new AnalogBlock("d", 0, 0, 400_000, d, N, inv);
        AnalogBlock p = TestSignals.legP(diff, 1.2);
        AnalogBlock n = TestSignals.legN(diff, 1.2);
        p.volts()[90_000 + r.nextInt(50_000)] = Float.NaN;
        return new AnalogBlock[] {p, n};
    }

    record Out(long[] times, List<long[]> spans, boolean[][] logic, List<String> notes, List<String> reports) {
    }

    static Out run(int pieceSamples, Map<String, Object> options, AnalogBlock[] c, int[] cuts) {
        StageHarness h = StageHarness.of(new Pieces(pieceSamples), options);
        List<AnalogBlock> ps = Synth.split(c[0], cuts);
        List<AnalogBlock> ns = Synth.split(c[1], cuts);
        for (int i = 0; i < ps.size(); i++) {
            h.push("p", ps.get(i)).push("n", ns.get(i));
        }
        h.finish();
        List<Edges> e = h.outputs("edges", Edges.class);
        List<String> notes = new ArrayList<>();
        for (Annotation a : h.annotations()) {
            notes.add(a.toString());
        }
        List<String> reports = new ArrayList<>();
        if (Boolean.TRUE.equals(options.get("levelReport"))) {
            for (Artifact a : h.outputs("report", Artifact.class)) {
                reports.add(new String(a.content(), java.nio.charset.StandardCharsets.UTF_8));
            }
        }
        return new Out(TestSignals.times(e), TestSignals.spans(e), TestSignals.logic(h.outputs("logic", LogicBlock.class)), notes,
                reports);
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, 4, 5, 6, 7, 8})
    void piecesGiveExactlyWhatWholeWindowsGave(int seed) {
        AnalogBlock[] c = capture(seed);
        Random r = new Random(seed * 31L);
        Map<String, Object> o = new HashMap<>();
        o.put("levelReport", seed % 4 != 3);
        if (seed % 2 == 0) {
            o.put("thresholdVolts", 0.0); // the DDR chain: threshold given, hysteresis learned and followed
        }
        o.put("interpolation", seed % 3 == 0 ? "cubic" : "linear");
        o.put("statsStride", new int[] {16, 1, 3, 16}[seed % 4]);
        o.put("windowSamples", seed <= 4 ? 65536 : 5000 + r.nextInt(20_000));
        o.put("adaptTimeConstant", "30000samples");
        int[] cuts = {10_000 + r.nextInt(70_000), 65_536, 1 + r.nextInt(9000)};
        Out whole = run(Integer.MAX_VALUE, o, c, cuts);
        assertTrue(whole.times().length > 5000, "expected many edges, got " + whole.times().length);
        assertTrue(whole.notes().stream().anyMatch(n -> n.contains("level")), "level annotations were made: " + whole.notes());
        assertEquals(o.get("levelReport"), !whole.reports().isEmpty(), "a levels report exactly when asked for");
        for (int piece : new int[] {AnalogStage.PIECE_SAMPLES, 1 + r.nextInt(700)}) {
            Out cut = run(piece, o, c, cuts);
            assertArrayEquals(whole.times(), cut.times(), "edge times, pieces of " + piece);
            assertEquals(whole.spans().size(), cut.spans().size());
            for (int i = 0; i < whole.spans().size(); i++) {
                assertArrayEquals(whole.spans().get(i), cut.spans().get(i));
            }
            assertArrayEquals(whole.logic()[0], cut.logic()[0], "logic bits");
            assertArrayEquals(whole.logic()[1], cut.logic()[1], "logic validity");
            assertEquals(whole.notes(), cut.notes(), "annotations");
            assertEquals(whole.reports(), cut.reports(), "levels report");
        }
    }
}
