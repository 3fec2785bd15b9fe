package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.lanesift.plugins.si.EyeDiagramPluginTest.num;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.function.DoubleUnaryOperator;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

class EdgeMetricsPluginTest {

    /** A square wave of half period {@code halfS}, each half a step response {@code step(t)} from the other level. */
    static DoubleUnaryOperator square(double halfS, DoubleUnaryOperator step) {
        return t -> {
            long k = (long) Math.floor(t / halfS);
            double u = t - k * halfS;
            double s = step.applyAsDouble(u);
            return (k & 1) == 0 ? s : 1 - s;
        };
    }

    static String json(StageHarness h) {
        for (Artifact a : h.outputs("files", Artifact.class)) {
            if (a.fileName().endsWith("-edges.json")) {
                return new String(a.content(), StandardCharsets.UTF_8);
            }
        }
        throw new AssertionError("no edges json");
    }

    /** Value of {@code key} inside the object named {@code section}. */
    static double in(String json, String section, String key) {
        org.lanesift.json.JsonValue root = org.lanesift.testkit.JsonScan.parse("edge report", json);
        return org.lanesift.testkit.JsonScan.number(org.lanesift.testkit.JsonScan.after(root, section, null, key));
    }

    @Test
    void singlePoleRcRiseTimeTimesBandwidthIsLn9Over2Pi() {
        // Textbook result for a first-order low-pass (single-pole RC): v(t) = 1 - exp(-t/tau), so
        // t10-90 = tau ln 9 and with BW = 1/(2 pi tau): t10-90 * BW = ln(9)/(2 pi) = 0.3497;
        // t20-80 = tau ln 4 -> 0.2206; settling into 5 % from the 50 % point: tau (ln 20 - ln 2) = tau ln 10.
        double tau = 100e-12;
        double bw = 1 / (2 * Math.PI * tau);
        AnalogBlock sig = Synth.analog("rc", 200 / tau, 16 * 2 * 20 * 200, square(20 * tau, t -> 1 - Math.exp(-t / tau)));
        StageHarness h = StageHarness.of(new EdgeMetricsPlugin(), Map.of("levelsVolts", List.of(0.0, 1.0)));
        h.push("signal", sig).finish();
        String j = json(h);
        double rise = in(j, "rise1090", "mean") * 1e-12;
        double fall = in(j, "fall1090", "mean") * 1e-12;
        assertEquals(Math.log(9) / (2 * Math.PI), rise * bw, 5e-4, j);
        assertEquals(0.3497, fall * bw, 5e-4);
        assertEquals(Math.log(4) / (2 * Math.PI), in(j, "rise2080", "mean") * 1e-12 * bw, 5e-4);
        assertEquals(tau * Math.log(10), in(j, "settlingAfterRise", "mean") * 1e-12, 0.01 * tau);
        assertEquals(0, in(j, "overshoot", "max"), 1e-3);
        assertTrue(in(j, "rise1090", "count") >= 15, j);
        for (Artifact a : h.outputs("files", Artifact.class)) {
            SynthSignals.save(a);
        }
    }

    @Test
    void levelsAreFoundWhenNotGiven() {
        double tau = 100e-12;
        AnalogBlock sig = Synth.analog("rc", 200 / tau, 8 * 2 * 60 * 200,
                t -> 0.3 + 0.5 * square(60 * tau, u -> 1 - Math.exp(-u / tau)).applyAsDouble(t));
        StageHarness h = StageHarness.of(new EdgeMetricsPlugin(), Map.of());
        h.push("signal", sig).finish();
        String j = json(h);
        assertEquals(0.3, num(j, "lowLevelVolts"), 0.002, j);
        assertEquals(0.8, num(j, "highLevelVolts"), 0.002, j);
        assertEquals(0.3497, in(j, "rise1090", "mean") * 1e-12 / (2 * Math.PI * tau), 0.005);
    }

    @Test
    void overshootOfAnUnderdampedSecondOrderStep() {
        // Textbook second-order step response: overshoot = exp(-pi zeta / sqrt(1 - zeta^2)); zeta = 0.3 -> 37.23 %
        double zeta = 0.3;
        double w0 = 2 * Math.PI * 500e6;
        double wd = w0 * Math.sqrt(1 - zeta * zeta);
        DoubleUnaryOperator step = t -> 1 - Math.exp(-zeta * w0 * t) * (Math.cos(wd * t) + zeta / Math.sqrt(1 - zeta * zeta) * Math.sin(wd * t));
        double half = 40e-9;
        AnalogBlock sig = Synth.analog("so", 50e9, (int) (10 * 2 * half * 50e9), square(half, step));
        StageHarness h = StageHarness.of(new EdgeMetricsPlugin(), Map.of("levelsVolts", List.of(0.0, 1.0)));
        h.push("signal", sig).finish();
        String j = json(h);
        double expected = 100 * Math.exp(-Math.PI * zeta / Math.sqrt(1 - zeta * zeta));
        assertEquals(expected, in(j, "overshoot", "mean"), 0.3, j);
        assertEquals(expected, in(j, "undershoot", "mean"), 0.3, j);
        assertEquals(0, in(j, "overshoot", "std"), 0.05);
    }

    @Test
    void blockBoundariesDoNotChangeTheResult() {
        double tau = 100e-12;
        AnalogBlock sig = Synth.withNoise(Synth.analog("rc", 100 / tau, 8 * 2 * 20 * 100,
                square(20 * tau, t -> 1 - Math.exp(-t / tau))), 0.01, 9);
        StageHarness one = StageHarness.of(new EdgeMetricsPlugin(), Map.of("levelSamples", 5000));
        one.push("signal", sig).finish();
        StageHarness many = StageHarness.of(new EdgeMetricsPlugin(), Map.of("levelSamples", 5000));
        for (AnalogBlock b : Synth.split(sig, 1, 77, 3000, 4999, 2)) {
            many.push("signal", b);
        }
        many.finish();
        assertEquals(json(one), json(many));
        assertTrue(num(json(one), "risingEdges") >= 7);
    }

    @Test
    void invalidAndNonFiniteSamplesBreakNothing() {
        double tau = 100e-12;
        AnalogBlock clean = Synth.analog("rc", 200 / tau, 8 * 2 * 20 * 200, square(20 * tau, t -> 1 - Math.exp(-t / tau)));
        float[] v = clean.volts().clone();
        long[] inv = new long[(v.length + 63) / 64];
        // mark a stretch in the middle of the third half period invalid and put a NaN in the sixth
        for (int i = 2 * 4000 + 1000; i < 2 * 4000 + 1500; i++) {
            inv[i >>> 6] |= 1L << i;
            v[i] = 55f;
        }
        v[5 * 4000 + 2000] = Float.NaN;
        AnalogBlock b = new AnalogBlock("rc", 0, 0, clean.periodFs(), v, v.length, inv);
        StageHarness h = StageHarness.of(new EdgeMetricsPlugin(), Map.of("levelsVolts", List.of(0.0, 1.0)));
        h.push("signal", b).finish();
        String j = json(h);
        assertEquals(0.3497, in(j, "rise1090", "mean") * 1e-12 * (1 / (2 * Math.PI * tau)), 5e-4, j);
        assertEquals(0, in(j, "overshoot", "max"), 1e-3, j);
    }
}
