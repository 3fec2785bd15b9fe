package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;

/** Clipped or missing samples never produce edges, and a warning says where. */
class InvalidInputTest {
    static final double P = 1e6;

    /** Square wave, 40 samples per level, starting low. */
    static float[] square(int n) {
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            v[i] = (i / 40) % 2 == 0 ? -0.3f : 0.3f;
        }
        return v;
    }

    @Test
    void aMaskedRunOverAnEdgeGivesNoEdgeInsideAndRestoresTheLevelAtItsEnd() {
        int n = 400;
        float[] d = square(n);
        long[] inv = new long[BitSets.words(n)];
        BitSets.setRange(inv, 115, 130); // covers the rising edge at sample 120
        AnalogBlock diff = new AnalogBlock("d", 0, 0, P, d, n, inv);
        StageHarness h = TestSignals.runPair(Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.1),
                TestSignals.legP(diff, 1.2), TestSignals.legN(diff, 1.2));
        List<Edges> e = h.outputs("edges", Edges.class);
        long[] t = TestSignals.times(e);
        List<long[]> spans = TestSignals.spans(e);
        assertEquals(1, spans.size());
        long a = spans.get(0)[0];
        long z = spans.get(0)[1];
        assertEquals(114.5 * P, a, 1);
        assertEquals(129.5 * P, z, 1);
        for (long x : t) {
            assertFalse(x >= a && x < z, "no transition inside the unknown span, found " + x);
        }
        // edges at 40, 80 (crossing between 39/40 and 79/80: linear midpoint at 39.5, 79.5), the restored level at the
        // span end, then 159.5, 199.5, ...
        assertEquals(39.5 * P, t[0], 1);
        assertEquals(79.5 * P, t[1], 1);
        assertEquals(z, t[2], "level change across the gap is put exactly at the end of the unknown span");
        assertEquals(159.5 * P, t[3], 1);
        List<Annotation> w = h.annotations("input-invalid");
        assertEquals(1, w.size());
        assertEquals(Severity.WARNING, w.get(0).severity());
        assertEquals(a, w.get(0).startFs());
        assertEquals(z, w.get(0).endFs());
        assertEquals("yes", w.get(0).fields().get("levelChanged").value());
        // logic: invalid samples flagged, holding the level before the gap (low)
        LogicBlock lb = h.outputs("logic", LogicBlock.class).get(0);
        assertTrue(BitSets.get(lb.invalid(), 120));
        assertFalse(lb.get(125));
        assertTrue(lb.get(130));
    }

    @Test
    void nanSamplesAreInvalidToo() {
        int n = 400;
        float[] d = square(n);
        AnalogBlock diff = new AnalogBlock("d", 0, 0, P, d, n, null);
        AnalogBlock p = TestSignals.legP(diff, 1.2);
        AnalogBlock nn = TestSignals.legN(diff, 1.2);
        p.volts()[200] = Float.NaN; // sample 200 is the first high-to-low sample after 160..199 high
        StageHarness h = TestSignals.runPair(Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.1), p, nn);
        List<Edges> e = h.outputs("edges", Edges.class);
        List<long[]> spans = TestSignals.spans(e);
        assertEquals(1, spans.size());
        assertEquals(199.5 * P, spans.get(0)[0], 1);
        assertEquals(200.5 * P, spans.get(0)[1], 1);
        long[] t = TestSignals.times(e);
        boolean found = false;
        for (long x : t) {
            found |= x == spans.get(0)[1];
            assertFalse(x >= spans.get(0)[0] && x < spans.get(0)[1]);
        }
        assertTrue(found, "the fall hidden by the NaN shows as a level change at the span end");
        assertEquals(1, h.annotations("input-invalid").size());
        assertTrue(BitSets.get(h.outputs("logic", LogicBlock.class).get(0).invalid(), 200));
    }

    @Test
    void aCaptureStartingInvalidStartsLow() {
        int n = 200;
        float[] d = new float[n];
        java.util.Arrays.fill(d, 0.3f);
        long[] inv = new long[BitSets.words(n)];
        BitSets.setRange(inv, 0, 10);
        AnalogBlock diff = new AnalogBlock("d", 0, 0, P, d, n, inv);
        StageHarness h = TestSignals.runPair(Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.1),
                TestSignals.legP(diff, 1.2), TestSignals.legN(diff, 1.2));
        List<Edges> e = h.outputs("edges", Edges.class);
        assertFalse(e.get(0).initialLevel());
        long[] t = TestSignals.times(e);
        assertEquals(1, t.length);
        assertEquals(9.5 * P, t[0], 1);
        assertEquals(0, TestSignals.spans(e).get(0)[0]);
    }
}
