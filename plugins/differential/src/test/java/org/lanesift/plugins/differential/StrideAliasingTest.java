package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.testkit.StageHarness;

/**
 * A symmetric clock lane of |VOD| 350 mV of a 7:1 pixel link (high for slots 0-1 and 5-6, docs/reference-facts.md#pixel-link-clock-and-slot-mappings)
 * at 80 samples per clock period, with a damped ring after every edge. A fixed statistics stride of
 * 16 sees the high state only 7 and 16 samples after its edges and the low state 9 and 25 samples
 * after them, so the ring made a false delta-VOD; the chosen samples now fall at every phase.
 */
class StrideAliasingTest {
    static final int PERIOD_SAMPLES = 80;
    static final int N = 400_000;

    /** The clock lane, volts: |VOD| 350 mV with each edge ringing at 20 % of the step, decaying in 6 samples. */
    static float[] clockLane() {
        float[] v = new float[N];
        double slot = PERIOD_SAMPLES / 7.0;
        for (int i = 0; i < N; i++) {
            double phase = i % PERIOD_SAMPLES;
            int s = (int) (phase / slot);
            boolean high = s <= 1 || s >= 5;
            // time since the last edge (edges at slots 0, 2 and 5)
            double edgeAt = s >= 5 ? 5 * slot : s >= 2 ? 2 * slot : 0;
            double since = phase - edgeAt;
            double level = high ? 0.35 : -0.35;
            double ring = 0.7 * 0.2 * Math.exp(-since / 6) * Math.cos(2 * Math.PI * since / 9);
            v[i] = (float) (level + (high ? ring : -ring));
        }
        return v;
    }

    private static double quantity(StageHarness h, String q) {
        for (Annotation a : h.annotations("level-check")) {
            if (a.fields().get("quantity").value().equals(q)) {
                return ((Number) a.fields().get("valueVolts").value()).doubleValue();
            }
        }
        throw new AssertionError("no level-check of " + q);
    }

    @Test
    void noFalseDeltaVodAtTheDefaultStride() {
        AnalogBlock d = TestSignals.block("d", 1e6, clockLane());
        StageHarness strided = TestSignals.runPair(Map.of(), TestSignals.legP(d, 1.25), TestSignals.legN(d, 1.25));
        StageHarness every = TestSignals.runPair(Map.of("statsStride", 1), TestSignals.legP(d, 1.25), TestSignals.legN(d, 1.25));
        double deltaStrided = quantity(strided, "delta-vod");
        double deltaEvery = quantity(every, "delta-vod");
        // the signal is symmetric: with every sample the two states' |VOD| agree
        assertTrue(deltaEvery < 0.001, "delta-VOD with every sample " + deltaEvery);
        // one sample in 16 at jittered positions agrees with every sample to within a few millivolts
        assertTrue(deltaStrided < 0.003, "delta-VOD at stride 16 " + deltaStrided);
        assertEquals(quantity(every, "vod-high"), quantity(strided, "vod-high"), 0.003);
        assertTrue(strided.annotations("level-out-of-range").isEmpty(), strided.annotations("level-out-of-range").toString());
    }
}
