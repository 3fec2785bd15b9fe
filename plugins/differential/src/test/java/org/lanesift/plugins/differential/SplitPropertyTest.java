package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.Size;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/** The same capture cut into blocks of any sizes gives exactly the same output as one block. */
class SplitPropertyTest {
    static final int N = 12_000;

    /** A noisy NRZ pair with slow drift, a masked run, a NaN and a slow edge, deterministic in the seed. */
    static AnalogBlock[] capture(long seed) {
        Random r = new Random(seed);
        boolean[] bits = new boolean[N / 9 + 2];
        for (int i = 0; i < bits.length; i++) {
            bits[i] = r.nextBoolean();
        }
        float[] d = TestSignals.nrz(bits, 9.1, 1.2 + r.nextDouble(), 0.17, r.nextDouble() * 5, N);
        for (int i = 0; i < N; i++) {
            d[i] += (float) (0.02 * i / N + 0.01 * r.nextGaussian());
        }
        // a slow edge (longer than the look-back) near the middle
        for (int i = 6000; i < 7500; i++) {
            d[i] = (float) (-0.17 + 0.34 * (i - 6000) / 1500.0);
        }
        long[] inv = new long[BitSets.words(N)];
        int g = 2000 + r.nextInt(3000);
        BitSets.setRange(inv, g, g + 1 + r.nextInt(40));
        AnalogBlock diff = new AnalogBlock("d", 0, 0, 200_000, d, N, inv);
        AnalogBlock p = TestSignals.legP(diff, 1.2 + 0.05 * r.nextDouble());
        AnalogBlock n = TestSignals.legN(diff, 1.2);
        p.volts()[8000 + r.nextInt(2000)] = Float.NaN;
        return new AnalogBlock[] {p, n};
    }

    record Out(long[] times, List<long[]> spans, boolean[][] logic, boolean initial, List<String> annotations) {
    }

    static Out run(Map<String, ?> options, List<AnalogBlock> ps, List<AnalogBlock> ns) {
        StageHarness h = StageHarness.of(new DifferentialPlugin(), options);
        // interleave the legs the way a chain delivers them: each in time order, the two in any mix
        int i = 0;
        int j = 0;
        while (i < ps.size() || j < ns.size()) {
            boolean takeP = j >= ns.size() || (i < ps.size() && ps.get(i).startFs() <= ns.get(j).startFs());
            if (takeP) {
                h.push("p", ps.get(i++));
            } else {
                h.push("n", ns.get(j++));
            }
        }
        h.finish();
        List<Edges> e = h.outputs("edges", Edges.class);
        List<String> notes = new ArrayList<>();
        for (Annotation a : h.annotations()) {
            notes.add(a.kind() + "@" + a.startFs() + ".." + a.endFs() + " " + a.label());
        }
        return new Out(TestSignals.times(e), TestSignals.spans(e), TestSignals.logic(h.outputs("logic", LogicBlock.class)),
                e.get(0).initialLevel(), notes);
    }

    static final Map<String, Object> OPTIONS = Map.of("interpolation", "cubic", "windowSamples", 512,
            "adaptTimeConstant", "3000samples", "warmupSamples", 1000, "statsStride", 3);
    static final Map<String, Object> LINEAR = Map.of("interpolation", "linear", "windowSamples", 700,
            "adaptTimeConstant", "2000samples", "warmupSamples", 1500);

    @Property(tries = 80)
    void anySplitGivesTheSameOutput(@ForAll @Size(min = 1, max = 6) List<@IntRange(min = 1, max = 3000) Integer> pSizes,
                                    @ForAll @Size(min = 1, max = 6) List<@IntRange(min = 1, max = 3000) Integer> nSizes,
                                    @ForAll @IntRange(min = 0, max = 1000) int seed) {
        AnalogBlock[] c = capture(seed);
        Map<String, Object> options = seed % 2 == 0 ? OPTIONS : LINEAR;
        Out whole = run(options, List.of(c[0]), List.of(c[1]));
        Out cut = run(options, Synth.split(c[0], pSizes.stream().mapToInt(x -> x).toArray()),
                Synth.split(c[1], nSizes.stream().mapToInt(x -> x).toArray()));
        assertTrue(whole.times().length > 500, "expected many edges, got " + whole.times().length);
        assertArrayEquals(whole.times(), cut.times());
        assertEquals(whole.initial(), cut.initial());
        assertEquals(whole.spans().size(), cut.spans().size());
        for (int i = 0; i < whole.spans().size(); i++) {
            assertArrayEquals(whole.spans().get(i), cut.spans().get(i));
        }
        assertArrayEquals(whole.logic()[0], cut.logic()[0]);
        assertArrayEquals(whole.logic()[1], cut.logic()[1]);
        assertEquals(whole.annotations(), cut.annotations());
    }

    @Property(tries = 40)
    void logicPairSplitsToo(@ForAll @Size(min = 1, max = 5) List<@IntRange(min = 1, max = 700) Integer> sizes,
                            @ForAll @IntRange(min = 0, max = 1000) int seed) {
        Random r = new Random(seed);
        int n = 3000;
        boolean[] pb = new boolean[n];
        boolean[] nb = new boolean[n];
        boolean level = r.nextBoolean();
        for (int i = 0; i < n; i++) {
            if (r.nextInt(10) == 0) {
                level = !level;
            }
            pb[i] = level;
            nb[i] = r.nextInt(50) == 0 ? level : !level; // occasional agreement
        }
        LogicBlock p = Synth.logic("p", 1e9, pb);
        LogicBlock nn = Synth.logic("n", 1e9, nb);
        int[] cuts = sizes.stream().mapToInt(x -> x).toArray();
        List<Object> whole = runLogic(List.of(p), List.of(nn));
        List<Object> cut = runLogic(Synth.split(p, cuts), Synth.split(nn, 7, 300, 1));
        assertArrayEquals((long[]) whole.get(0), (long[]) cut.get(0));
        assertArrayEquals(((boolean[][]) whole.get(1))[0], ((boolean[][]) cut.get(1))[0]);
        assertArrayEquals(((boolean[][]) whole.get(1))[1], ((boolean[][]) cut.get(1))[1]);
        assertEquals(whole.get(2), cut.get(2));
        assertEquals(whole.get(3), cut.get(3));
    }

    static List<Object> runLogic(List<LogicBlock> ps, List<LogicBlock> ns) {
        StageHarness h = StageHarness.of(new DifferentialPlugin(), Map.of("mode", "logic-pair"));
        int i = 0;
        int j = 0;
        while (i < ps.size() || j < ns.size()) {
            boolean takeP = j >= ns.size() || (i < ps.size() && ps.get(i).startFs() <= ns.get(j).startFs());
            if (takeP) {
                h.push("p", ps.get(i++));
            } else {
                h.push("n", ns.get(j++));
            }
        }
        h.finish();
        List<Edges> e = h.outputs("edges", Edges.class);
        List<String> spans = TestSignals.spans(e).stream().map(x -> x[0] + ".." + x[1]).toList();
        List<String> notes = h.annotations().stream().map(a -> a.kind() + "@" + a.startFs() + ".." + a.endFs()).toList();
        return List.of(TestSignals.times(e), TestSignals.logic(h.outputs("logic", LogicBlock.class)), spans, notes);
    }
}
