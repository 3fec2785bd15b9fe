package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.testkit.StageHarness;

/** Drift adaptation of the learned threshold, and the numbers in the level report. */
class DriftAndReportTest {
    static final double P = 200_000;

    /** The first member {@code key} of the report, read with the JSON reader. */
    static double number(String json, String key) {
        return org.lanesift.testkit.JsonScan.number(org.lanesift.testkit.JsonScan.parse("level report", json), key);
    }

    @Test
    void theThresholdFollowsSlowDrift() {
        // NRZ of +/-0.3 V whose offset drifts from 0 to +0.24 V; edges are tanh steps centred on the bit boundaries, so
        // the true crossing of the mid-level stays on the boundary while a fixed 0 V threshold moves off it
        Random r = new Random(5);
        boolean[] bits = new boolean[2200];
        for (int i = 0; i < bits.length; i++) {
            bits[i] = r.nextBoolean();
        }
        int n = 200_000;
        float[] v = TestSignals.nrz(bits, 90.1, 12, 0.3, 0.4, n);
        for (int i = 0; i < n; i++) {
            v[i] += (float) (0.24 * i / n);
        }
        double[] exact = TestSignals.nrzEdges(bits, 90.1, 0.4, n);
        double[] err = new double[2];
        String[] json = new String[2];
        int idx = 0;
        for (String tau : new String[] {"20000samples", "0"}) {
            AnalogBlock d = TestSignals.block("d", P, v);
            StageHarness h = TestSignals.runPair(Map.of("adaptTimeConstant", tau, "windowSamples", 4096),
                    TestSignals.legP(d, 1.2), TestSignals.legN(d, 1.2));
            long[] t = TestSignals.times(h.outputs("edges", Edges.class));
            assertEquals(exact.length, t.length, tau);
            double sum = 0;
            for (int k = exact.length * 3 / 4; k < exact.length; k++) {
                sum += Math.abs(t[k] / P - exact[k]);
            }
            err[idx] = sum / (exact.length - exact.length * 3 / 4);
            json[idx++] = new String(h.outputs("report", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
        }
        // with adaptation the threshold ends near the drifted mid-level (0.24 V at the end, a lag of about one time
        // constant: 0.24 * 20000 / 200000 = 0.024 V)
        assertEquals(0.216, number(json[0], "finalThresholdVolts"), 0.02);
        assertEquals(number(json[1], "initialThresholdVolts"), number(json[1], "finalThresholdVolts"), 1e-6);
        // over the last quarter a tanh edge of tau 12 samples crosses 0.19 V above its centre about 12 * atanh(0.19/0.3)
        // = 9 samples late; adaptation keeps it within about one sample
        assertTrue(err[0] < 1.5, "adapted mean error " + err[0] + " samples");
        assertTrue(err[1] > 5, "fixed threshold mean error " + err[1] + " samples");
    }

    @Test
    void overshootAndUndershootInTheReport() {
        // a +/-0.3 V square wave, 100 samples per level, ringing: 60 mV above the high level for the 3 samples after each
        // rising edge and 40 mV below the low level after each falling edge
        int n = 20_000;
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            boolean high = (i / 100) % 2 == 1;
            int since = i % 100;
            double x = high ? 0.3 : -0.3;
            if (since < 3 && i >= 100) {
                x += high ? 0.06 : -0.04;
            }
            v[i] = (float) x;
        }
        AnalogBlock d = TestSignals.block("d", P, v);
        StageHarness h = TestSignals.runPair(Map.of("statsStride", 1, "levelProfile", "none"), TestSignals.legP(d, 1.25),
                TestSignals.legN(d, 1.25));
        String json = new String(h.outputs("report", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
        // settled means include the ringing samples: high = 0.3 + 0.06 * 3/100 (first high run has ringing too)
        assertEquals(0.3018, number(json, "highLevelVolts"), 2e-4);
        assertEquals(0.36 - 0.3018, number(json, "overshootVolts"), 2e-4);
        // 99 of the 100 low runs ring (not the first): low = -0.3 - 0.04 * 3 * 99 / 10000 = -0.301188
        assertEquals(0.34 - 0.301188, number(json, "undershootVolts"), 2e-4);
        assertEquals(1.25, number(json, "commonModeVolts"), 1e-6);
    }
}
