package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/** The four input modes, polarity inversion and swapped-leg detection. */
class ModesTest {
    static final double P = 200_000;

    static float[] sine(int n, double spc, double amp, double offset) {
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            v[i] = (float) (offset + amp * Math.sin(2 * Math.PI * (i + 0.3) / spc));
        }
        return v;
    }

    static long[] edges(Map<String, ?> options, String port, AnalogBlock... in) {
        StageHarness h = StageHarness.of(new DifferentialPlugin(), options);
        if (in.length == 2) {
            h.push("p", in[0]).push("n", in[1]);
        } else {
            h.push(port, in[0]);
        }
        h.finish();
        return TestSignals.times(h.outputs("edges", Edges.class));
    }

    @Test
    void differentialProbeChannelGivesTheSameEdgesAsThePair() {
        float[] d = sine(6000, 31.7, 0.3, 0);
        AnalogBlock diff = TestSignals.block("d", P, d);
        long[] pair = edges(Map.of("interpolation", "cubic"), null, TestSignals.legP(diff, 1.2), TestSignals.legN(diff, 1.2));
        long[] probe = edges(Map.of("mode", "differential", "interpolation", "cubic"), "in", diff);
        assertEquals(pair.length, probe.length);
        for (int i = 0; i < pair.length; i++) {
            // the pair sees (float) p - (float) n, the probe the float difference: they differ by float rounding only
            assertEquals(pair[i], probe[i], 0.001 * P);
        }
    }

    @Test
    void oneLegAgainstEachKindOfReference() {
        // mathematics: a 1.2 V +/- 0.175 V sine crosses its mid-level 1.2 V at (k/2) cycles - 0.3 samples
        float[] leg = sine(6000, 31.7, 0.175, 1.2);
        AnalogBlock in = TestSignals.block("in", P, leg);
        for (Map<String, Object> o : List.<Map<String, Object>>of(Map.of("mode", "single"),
                Map.of("mode", "single", "reference", "median"),
                Map.of("mode", "single", "reference", "fixed", "referenceVolts", 1.2))) {
            long[] t = edges(o, "in", in);
            assertTrue(t.length > 300, o + ": " + t.length);
            for (int k = 0; k < t.length; k++) {
                double exact = ((k + 1) * 31.7 / 2 - 0.3) * P;
                assertEquals(exact, t[k], 0.02 * P, o + " edge " + k);
            }
        }
        // a fixed reference off the middle moves the crossings: 1.2 + 0.175 sin(x) = 1.3 at x = asin(0.1 / 0.175)
        long[] t = edges(Map.of("mode", "single", "reference", "fixed", "referenceVolts", 1.3), "in", in);
        double x = Math.asin(0.1 / 0.175) / (2 * Math.PI) * 31.7 - 0.3;
        assertEquals(x * P, t[0], 0.05 * P);
    }

    @Test
    void fixedReferenceWithGivenHysteresisNeedsNoWarmup() {
        // nothing to learn (reference and hysteresis given): the threshold is referenceVolts. Before the
        // fix the comparator took thresholdVolts (absent, NaN) and tripped on every sample without end.
        float[] leg = sine(6000, 31.7, 0.175, 1.2);
        AnalogBlock in = TestSignals.block("in", P, leg);
        long[] t = edges(Map.of("mode", "single", "reference", "fixed", "referenceVolts", 1.2, "hysteresisVolts", 0.02),
                "in", in);
        assertTrue(t.length > 300 && t.length < 400, "edges: " + t.length);
        for (int k = 0; k < t.length; k++) {
            // mathematics: crossings of the band edges 1.2 +/- 0.01 V, within asin(0.01 / 0.175) of the mid-level crossing
            double exact = ((k + 1) * 31.7 / 2 - 0.3) * P;
            assertEquals(exact, t[k], 0.4 * P, "edge " + k);
        }
    }

    @Test
    void invertFlipsLevelsButNotTimes() {
        float[] d = sine(3000, 29.1, 0.3, 0);
        AnalogBlock diff = TestSignals.block("d", P, d);
        StageHarness a = TestSignals.runPair(Map.of(), TestSignals.legP(diff, 1.2), TestSignals.legN(diff, 1.2));
        StageHarness b = TestSignals.runPair(Map.of("invert", true), TestSignals.legP(diff, 1.2), TestSignals.legN(diff, 1.2));
        assertArrayEquals(TestSignals.times(a.outputs("edges", Edges.class)), TestSignals.times(b.outputs("edges", Edges.class)));
        assertEquals(!a.outputs("edges", Edges.class).get(0).initialLevel(), b.outputs("edges", Edges.class).get(0).initialLevel());
        LogicBlock la = a.outputs("logic", LogicBlock.class).get(0);
        LogicBlock lb = b.outputs("logic", LogicBlock.class).get(0);
        for (int i = 0; i < la.length(); i++) {
            assertEquals(!la.get(i), lb.get(i));
        }
    }

    /** A 7:1 pixel-link clock (high for slots 0-1 and 5-6, docs/reference-facts.md#pixel-link-clock-and-slot-mappings), 7 samples per slot. */
    static float[] clock7(int n, boolean swapped) {
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            int slot = (i / 7) % 7;
            boolean high = slot <= 1 || slot >= 5;
            v[i] = (high ^ swapped) ? 0.175f : -0.175f;
        }
        return v;
    }

    @Test
    void swappedLegsAreDetectedFromTheClockPattern() {
        AnalogBlock ok = TestSignals.block("d", P, clock7(20_000, false));
        AnalogBlock sw = TestSignals.block("d", P, clock7(20_000, true));
        Map<String, Object> o = Map.of("detectSwap", true);
        StageHarness h1 = TestSignals.runPair(o, TestSignals.legP(ok, 1.2), TestSignals.legN(ok, 1.2));
        StageHarness h2 = TestSignals.runPair(o, TestSignals.legP(sw, 1.2), TestSignals.legN(sw, 1.2));
        assertEquals(1, h1.annotations("polarity-checked").size());
        assertEquals(0, h1.annotations("legs-swapped").size());
        assertEquals(1, h2.annotations("legs-swapped").size());
        // corrected: the swapped capture gives the same logic as the right one
        LogicBlock a = h1.outputs("logic", LogicBlock.class).get(0);
        LogicBlock b = h2.outputs("logic", LogicBlock.class).get(0);
        assertArrayEquals(a.bits(), b.bits());
        // without detection the swapped capture is inverted
        StageHarness h3 = TestSignals.runPair(Map.of(), TestSignals.legP(sw, 1.2), TestSignals.legN(sw, 1.2));
        assertEquals(!a.get(0), h3.outputs("logic", LogicBlock.class).get(0).get(0));
    }

    @Test
    void idlePatternSwapDetection() {
        // idles high for 3000 samples, then a burst of toggles; swapped legs idle low
        float[] v = new float[9000];
        for (int i = 0; i < v.length; i++) {
            v[i] = i < 3000 || (i / 10) % 2 == 0 ? -0.2f : 0.2f;
        }
        AnalogBlock d = TestSignals.block("d", P, v);
        StageHarness h = TestSignals.runPair(Map.of("detectSwap", true, "swapPattern", "idle-high"),
                TestSignals.legP(d, 1.2), TestSignals.legN(d, 1.2));
        assertEquals(1, h.annotations("legs-swapped").size());
        assertTrue(h.outputs("logic", LogicBlock.class).get(0).get(0), "idle corrected to high");
    }

    @Test
    void logicPairFollowsPAndFlagsAgreement() {
        // p: 0 0 1 1 1 0 0 1 ; n: 1 1 0 1 0 1 1 0 -> legs agree at sample 3 (both high)
        boolean[] p = {false, false, true, true, true, false, false, true};
        boolean[] n = {true, true, false, true, false, true, true, false};
        StageHarness h = StageHarness.of(new DifferentialPlugin(), Map.of("mode", "logic-pair"));
        h.push("p", Synth.logic("p", 1e9, p)).push("n", Synth.logic("n", 1e9, n)).finish();
        LogicBlock out = h.outputs("logic", LogicBlock.class).get(0);
        assertTrue(BitSets.get(out.invalid(), 3));
        assertEquals(1, BitSets.count(out.invalid(), 8));
        List<Annotation> agree = h.annotations("legs-agree");
        assertEquals(1, agree.size());
        assertEquals(2_500_000, agree.get(0).startFs());
        assertEquals(3_500_000, agree.get(0).endFs());
        List<Edges> e = h.outputs("edges", Edges.class);
        // transitions half a sample before samples 2, 5 and 7; the held sample 3 changes nothing
        assertArrayEquals(new long[] {1_500_000, 4_500_000, 6_500_000}, TestSignals.times(e));
        assertFalse(e.get(0).initialLevel());
        assertEquals(1, TestSignals.spans(e).size());
        // inverted: the same times, levels flipped in both outputs
        StageHarness inv = StageHarness.of(new DifferentialPlugin(), Map.of("mode", "logic-pair", "invert", true));
        inv.push("p", Synth.logic("p", 1e9, p)).push("n", Synth.logic("n", 1e9, n)).finish();
        List<Edges> ie = inv.outputs("edges", Edges.class);
        assertArrayEquals(TestSignals.times(e), TestSignals.times(ie));
        assertTrue(ie.get(0).initialLevel());
        LogicBlock il = inv.outputs("logic", LogicBlock.class).get(0);
        for (int i = 0; i < 8; i++) {
            assertEquals(!out.get(i), il.get(i), "sample " + i);
        }
    }
}
