package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Edges;
import org.lanesift.testkit.Synth;

/** A slow noisy edge: hysteresis wider than the noise gives exactly one transition (common practice of comparators). */
class HysteresisTest {
    static final double P = 1e6; // 1 GS/s

    static AnalogBlock slowNoisyEdge(double noiseAmp, long seed) {
        // ramp from -0.3 V to +0.3 V over 20 000 samples, uniform noise in [-noiseAmp, +noiseAmp]
        int n = 30_000;
        Random r = new Random(seed);
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            double ramp = i < 5000 ? -0.3 : i >= 25_000 ? 0.3 : -0.3 + 0.6 * (i - 5000) / 20_000.0;
            v[i] = (float) (ramp + noiseAmp * (2 * r.nextDouble() - 1));
        }
        return TestSignals.block("d", P, v);
    }

    @Test
    void noiseBelowTheHysteresisGivesOneTransition() {
        for (long seed = 1; seed <= 5; seed++) {
            // noise peak-to-peak 2 x 20 mV = 40 mV, below a 50 mV band
            AnalogBlock d = slowNoisyEdge(0.020, seed);
            long[] t = TestSignals.times(TestSignals.runPair(Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.050),
                    TestSignals.legP(d, 1.2), TestSignals.legN(d, 1.2)).outputs("edges", Edges.class));
            assertEquals(1, t.length, "seed " + seed);
            // the ramp crosses 0 V at sample 15 000; noise of 20 mV on a slope of 0.03 mV per sample moves the last
            // crossing of the threshold by at most 20 / 0.03 = 667 samples
            assertEquals(15_000 * P, t[0], 700 * P);
        }
    }

    @Test
    void withoutHysteresisTheSameEdgeChatters() {
        AnalogBlock d = slowNoisyEdge(0.020, 3);
        long[] t = TestSignals.times(TestSignals.runPair(Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.0),
                TestSignals.legP(d, 1.2), TestSignals.legN(d, 1.2)).outputs("edges", Edges.class));
        assertTrue(t.length > 10, "expected chatter without hysteresis, got " + t.length + " transitions");
        assertEquals(1, t.length % 2, "an odd number of transitions from low to high");
    }

    @Test
    void learnedHysteresisIsAFractionOfTheSwing() {
        // a clean square wave of +/-0.35 V: levels -0.35 and +0.35, swing 0.7 V, default fraction 0.1 -> 70 mV
        AnalogBlock d = Synth.analog("d", 1e9, 20_000, t -> Math.sin(2 * Math.PI * 5e6 * t) >= 0 ? 0.35 : -0.35);
        var h = TestSignals.runPair(Map.of(), TestSignals.legP(d, 1.2), TestSignals.legN(d, 1.2));
        var learned = h.annotations("threshold-learned");
        assertEquals(1, learned.size());
        assertEquals(0.0, learned.get(0).fields().get("thresholdVolts").asDouble(), 1e-6);
        assertEquals(0.070, learned.get(0).fields().get("hysteresisVolts").asDouble(), 1e-6);
    }
}
