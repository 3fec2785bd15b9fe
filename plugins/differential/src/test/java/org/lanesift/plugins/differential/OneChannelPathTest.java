package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.Size;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The one-channel path of the comparator (mode {@code differential}) against the two-leg path
 * (mode {@code pair}) on the float difference of the same legs: both see the same samples, so
 * every edge time, unknown span and logic sample must be the same, whatever the interpolation and
 * however the input is cut. The captures of {@link SplitPropertyTest} have noise, drift, a NaN, a
 * masked run and an edge slower than the look-back.
 */
class OneChannelPathTest {
    @Property(tries = 60)
    void theDifferenceOfTheLegsDecodesAsThePair(@ForAll @Size(min = 1, max = 6) List<@IntRange(min = 1, max = 3000) Integer> sizes,
                                                @ForAll @IntRange(min = 0, max = 1000) int seed) {
        AnalogBlock[] legs = SplitPropertyTest.capture(seed);
        AnalogBlock p = legs[0];
        AnalogBlock n = legs[1];
        int len = p.length();
        float[] d = new float[len];
        long[] inv = new long[BitSets.words(len)];
        for (int i = 0; i < len; i++) {
            d[i] = p.volts()[i] - n.volts()[i];
            if (!p.isValid(i) || !n.isValid(i)) {
                BitSets.set(inv, i, true);
            }
        }
        AnalogBlock diff = new AnalogBlock("d", p.firstIndex(), p.startFs(), p.periodFs(), d, len, inv);
        Map<String, Object> options = seed % 2 == 0 ? SplitPropertyTest.OPTIONS : SplitPropertyTest.LINEAR;
        SplitPropertyTest.Out pair = SplitPropertyTest.run(options, List.of(p), List.of(n));

        StageHarness h = StageHarness.of(new DifferentialPlugin(), with(options, "mode", "differential"));
        for (AnalogBlock b : Synth.split(diff, sizes.stream().mapToInt(x -> x).toArray())) {
            h.push("in", b);
        }
        h.finish();
        List<Edges> e = h.outputs("edges", Edges.class);
        long[] times = TestSignals.times(e);
        assertTrue(pair.times().length > 500, "expected many edges, got " + pair.times().length);
        assertArrayEquals(pair.times(), times);
        assertEquals(pair.initial(), e.get(0).initialLevel());
        List<long[]> spans = TestSignals.spans(e);
        assertEquals(pair.spans().size(), spans.size());
        for (int i = 0; i < spans.size(); i++) {
            assertArrayEquals(pair.spans().get(i), spans.get(i));
        }
        boolean[][] logic = TestSignals.logic(h.outputs("logic", LogicBlock.class));
        assertArrayEquals(pair.logic()[0], logic[0]);
        assertArrayEquals(pair.logic()[1], logic[1]);
    }

    private static Map<String, Object> with(Map<String, Object> options, String key, Object value) {
        java.util.HashMap<String, Object> m = new java.util.HashMap<>(options);
        m.put(key, value);
        return m;
    }
}
