package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.json.JsonValue;
import org.lanesift.report.Sourced;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.testkit.StageHarness;

/**
 * Level checks at and just past every limit. Source of the limits: ANSI/TIA/EIA-644-A as listed in
 * docs/reference-facts.md#lvds-electrical-levels (|VOD| 247-454 mV, VOS 1.125-1.375 V, receiver threshold +/-100 mV;
 * values from memory), and MIPI D-PHY from docs/reference-facts.md#d-phy-levels-and-states (HS swing 140-270 mV,
 * common mode about 200 mV; LP thresholds 880 / 550 mV; from memory).
 */
class LevelLimitTest {
    static final int N = 40_000;

    /** A square-wave pair: p = vos + vod/2 when high, vos - vod/2 when low; n the complement. */
    static AnalogBlock[] pair(double vod, double vos) {
        float[] p = new float[N];
        float[] n = new float[N];
        for (int i = 0; i < N; i++) {
            boolean high = (i / 50) % 2 == 0;
            double half = (high ? vod : -vod) / 2;
            p[i] = (float) (vos + half);
            n[i] = (float) (vos - half);
        }
        return new AnalogBlock[] {new AnalogBlock("p", 0, 0, 1e6, p, N, null), new AnalogBlock("n", 0, 0, 1e6, n, N, null)};
    }

    static Map<String, Severity> verdicts(Map<String, ?> options, AnalogBlock[] legs) {
        StageHarness h = TestSignals.runPair(options, legs[0], legs[1]);
        Map<String, Severity> out = new HashMap<>();
        for (Annotation a : h.annotations("level-check")) {
            out.put((String) a.fields().get("quantity").value(), verdict(a));
        }
        return out;
    }

    /**
     * The capture-wide verdict of a level check; its severity is that verdict unless a run of
     * windows already named the quantity at that severity (then it is information: one finding).
     */
    static Severity verdict(Annotation a) {
        if (!a.fields().containsKey("verdict")) {
            assertFalse(a.label().endsWith("(named above for its windows)"), a.toString());
            return a.severity();
        }
        assertEquals(Severity.INFO, a.severity(), a.toString());
        assertTrue(a.label().endsWith("(named above for its windows)"), a.toString());
        return Severity.valueOf(((String) a.fields().get("verdict").value()).toUpperCase(java.util.Locale.ROOT));
    }

    /**
     * A driver with too little current: |VOD| 150 mV, below the 247 mV of ANSI/TIA/EIA-644-A
     * (docs/reference-facts.md#lvds-electrical-levels). The swing is one fault, off in both states:
     * one error (the run of windows) naming both states' values; the capture-wide checks of each
     * state are information with the verdict kept in a field.
     */
    @Test
    void aLowSwingIsOneErrorNamingBothStates() {
        StageHarness h = TestSignals.runPair(Map.of(), pair(0.150, 1.25)[0], pair(0.150, 1.25)[1]);
        List<Annotation> errors = new ArrayList<>();
        for (Annotation a : h.annotations()) {
            if (a.severity() != Severity.INFO) {
                assertEquals("level-out-of-range", a.kind(), a.toString());
                errors.add(a);
            }
        }
        assertEquals(1, errors.size(), errors.toString());
        Annotation e = errors.get(0);
        assertEquals("vod-high+vod-low", e.fields().get("quantity").value());
        assertEquals(0.150, e.fields().get("highVolts").asDouble(), 0.002);
        assertEquals(0.150, e.fields().get("lowVolts").asDouble(), 0.002);
        assertTrue(e.label().matches("vod-high 1[45]\\d\\.\\d mV and vod-low 1[45]\\d\\.\\d mV outside 247 to 454 mV"), e.label());
        Map<String, Severity> v = verdicts(Map.of(), pair(0.150, 1.25));
        assertEquals(Severity.ERROR, v.get("vod-high"));
        assertEquals(Severity.ERROR, v.get("vod-low"));
    }

    @Test
    void vodAtAndJustPastEachLimit() {
        // TIA/EIA-644-A |VOD| 247 to 454 mV
        assertEquals(Severity.WARNING, verdicts(Map.of(), pair(0.247, 1.25)).get("vod-high"));
        assertEquals(Severity.ERROR, verdicts(Map.of(), pair(0.246, 1.25)).get("vod-high"));
        assertEquals(Severity.ERROR, verdicts(Map.of(), pair(0.246, 1.25)).get("vod-low"));
        assertEquals(Severity.WARNING, verdicts(Map.of(), pair(0.454, 1.25)).get("vod-high"));
        assertEquals(Severity.ERROR, verdicts(Map.of(), pair(0.455, 1.25)).get("vod-low"));
        assertEquals(Severity.INFO, verdicts(Map.of(), pair(0.350, 1.25)).get("vod-high"));
    }

    @Test
    void vosAtAndJustPastEachLimit() {
        // TIA/EIA-644-A VOS 1.125 to 1.375 V
        assertEquals(Severity.WARNING, verdicts(Map.of(), pair(0.35, 1.125)).get("vos"));
        assertEquals(Severity.ERROR, verdicts(Map.of(), pair(0.35, 1.124)).get("vos"));
        assertEquals(Severity.WARNING, verdicts(Map.of(), pair(0.35, 1.375)).get("vos"));
        assertEquals(Severity.ERROR, verdicts(Map.of(), pair(0.35, 1.376)).get("vos"));
        assertEquals(Severity.INFO, verdicts(Map.of(), pair(0.35, 1.25)).get("vos"));
    }

    @Test
    void receiverThresholdAtAndJustPast() {
        // TIA/EIA-644-A receiver threshold +/-100 mV: each state must reach 100 mV of differential input
        Map<String, Severity> at = verdicts(Map.of(), pair(0.100, 1.25));
        assertEquals(Severity.WARNING, at.get("vid-high"));
        assertEquals(Severity.WARNING, at.get("vid-low"));
        assertEquals(Severity.ERROR, at.get("vod-high"), "100 mV is far below the driver minimum");
        Map<String, Severity> past = verdicts(Map.of(), pair(0.099, 1.25));
        assertEquals(Severity.ERROR, past.get("vid-high"));
        assertEquals(Severity.ERROR, past.get("vid-low"));
    }

    @Test
    void deltaVosFromAnUnbalancedDriver() {
        // ANSI/TIA/EIA-644-A |delta VOS| at most 50 mV (from memory): common mode 60 mV apart between the states
        float[] p = new float[N];
        float[] n = new float[N];
        for (int i = 0; i < N; i++) {
            boolean high = (i / 50) % 2 == 0;
            double vos = high ? 1.23 : 1.29;
            p[i] = (float) (vos + (high ? 0.175 : -0.175));
            n[i] = (float) (vos - (high ? 0.175 : -0.175));
        }
        Map<String, Severity> v = verdicts(Map.of(), new AnalogBlock[] {new AnalogBlock("p", 0, 0, 1e6, p, N, null),
                new AnalogBlock("n", 0, 0, 1e6, n, N, null)});
        assertEquals(Severity.ERROR, v.get("delta-vos"));
        assertEquals(Severity.INFO, v.get("vos"));
    }

    @Test
    void windowFindingsCoverTheBadWindowsOnly() {
        // the first half at 350 mV, the second at 200 mV: one level-out-of-range run over the second half
        AnalogBlock[] good = pair(0.35, 1.25);
        AnalogBlock[] bad = pair(0.20, 1.25);
        float[] p = good[0].volts().clone();
        float[] n = good[1].volts().clone();
        System.arraycopy(bad[0].volts(), N / 2, p, N / 2, N / 2);
        System.arraycopy(bad[1].volts(), N / 2, n, N / 2, N / 2);
        StageHarness h = TestSignals.runPair(Map.of("windowSamples", 4000), new AnalogBlock("p", 0, 0, 1e6, p, N, null),
                new AnalogBlock("n", 0, 0, 1e6, n, N, null));
        var runs = h.annotations("level-out-of-range").stream()
                .filter(a -> a.fields().get("quantity").value().equals("vod-high+vod-low")).toList();
        assertEquals(1, runs.size(), runs.toString());
        assertEquals(20_000 * 1e6, runs.get(0).startFs(), 1);
        assertEquals(40_000 * 1e6, runs.get(0).endFs(), 1);
        assertEquals(5L, runs.get(0).fields().get("windows").value());
        String json = new String(h.outputs("report", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
        JsonValue report = org.lanesift.testkit.JsonScan.parse("level report", json);
        assertEquals("dut", report.get("instance").asString(), json);
        assertEquals(11, org.lanesift.testkit.JsonScan.count(report, "settledHigh"), "ten windows plus the capture");
        // over the whole capture |VOD| is the mean of every settled high sample taken, between 200 and 350 mV and
        // inside the limits: the windows' levels weighted by their settled counts; the windows tell the story
        double weighted = 0;
        long count = 0;
        for (JsonValue w : report.get("windows").elements()) {
            long k = (long) w.get("settledHigh").asDouble();
            weighted += k * Sourced.plain(w.get("highLevelVolts")).asDouble();
            count += k;
        }
        JsonValue vodHigh = report.get("checks").elements().get(0);
        assertEquals("vod-high", vodHigh.get("quantity").asString());
        assertEquals(weighted / count, Sourced.plain(vodHigh.get("valueVolts")).asDouble(), 1e-6);
        assertEquals(0.275, Sourced.plain(vodHigh.get("valueVolts")).asDouble(), 0.01);
        // the limits say where they come from, the measured value that it is measured
        assertEquals("standard: ANSI/TIA/EIA-644-A, values from memory (docs/reference-facts.md#lvds-electrical-levels)",
                vodHigh.get("minVolts").get("source").asString());
        assertEquals(0.247, Sourced.plain(vodHigh.get("minVolts")).asDouble(), 1e-9);
        assertTrue(vodHigh.get("valueVolts").get("source").asString().startsWith("measured"));
        assertEquals("info", vodHigh.get("verdict").asString());
        assertEquals(0.2, Sourced.plain(report.get("windows").elements().get(9).get("quantities").get("vod-high")).asDouble(), 1e-6);
    }

    /** A long capture's report keeps a page of windows: neighbours merged, every sample still counted once. */
    @Test
    void aLongCaptureReportsAtMost32WindowsCoveringItAll() {
        AnalogBlock[] legs = pair(0.350, 1.2);
        StageHarness h = TestSignals.runPair(Map.of("windowSamples", 256), legs[0], legs[1]);
        String json = new String(h.outputs("report", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
        JsonValue report = org.lanesift.testkit.JsonScan.parse("level report", json);
        List<JsonValue> windows = report.get("windows").elements();
        // 40 000 samples are 157 windows of 256: merged in pairs at 32, three times, into 20 of 2048 (the last one short)
        assertEquals(20, windows.size(), json);
        assertEquals(256 * 8, (long) report.get("windowSamples").asDouble());
        long samples = 0;
        double weighted = 0;
        long settled = 0;
        for (int i = 0; i < windows.size(); i++) {
            JsonValue w = windows.get(i);
            samples += (long) w.get("samples").asDouble();
            if (i > 0) {
                assertEquals(windows.get(i - 1).get("endFs").asDouble(), w.get("startFs").asDouble(), 0, "windows are contiguous");
            }
            long k = (long) w.get("settledHigh").asDouble();
            weighted += k * Sourced.plain(w.get("highLevelVolts")).asDouble();
            settled += k;
        }
        assertEquals(N, samples, "every sample in exactly one window");
        assertEquals(N, (long) report.get("capture").get("samples").asDouble());
        assertEquals(report.get("capture").get("startFs").asDouble(), windows.get(0).get("startFs").asDouble(), 0);
        assertEquals(report.get("capture").get("endFs").asDouble(), windows.get(windows.size() - 1).get("endFs").asDouble(), 0);
        assertEquals(settled, (long) report.get("capture").get("settledHigh").asDouble());
        assertEquals(Sourced.plain(report.get("capture").get("highLevelVolts")).asDouble(), weighted / settled, 1e-6);
        assertTrue(json.length() < 80_000, () -> "report of " + json.length() + " characters");
    }

    @Test
    void dphyProfiles() {
        // MIPI D-PHY HS (docs/reference-facts.md#d-phy-levels-and-states, from memory): 200 mV swing around 200 mV common mode passes
        assertEquals(Severity.INFO, verdicts(Map.of("levelProfile", "dphy-hs"), pair(0.200, 0.200)).get("vod-high"));
        assertEquals(Severity.INFO, verdicts(Map.of("levelProfile", "dphy-hs"), pair(0.200, 0.200)).get("vos"));
        assertEquals(Severity.ERROR, verdicts(Map.of("levelProfile", "dphy-hs"), pair(0.300, 0.200)).get("vod-high"));
        assertEquals(Severity.ERROR, verdicts(Map.of("levelProfile", "dphy-hs"), pair(0.200, 1.2)).get("vos"));
        assertFalse(verdicts(Map.of("levelProfile", "none"), pair(0.05, 3)).containsKey("vod-high"));
        // LP, one leg: 1.2 V high and 0 V low pass the 880 / 550 mV thresholds; a 0.85 V high does not
        float[] v = new float[N];
        for (int i = 0; i < N; i++) {
            v[i] = (i / 300) % 2 == 0 ? 1.2f : 0.0f;
        }
        Map<String, Object> lp = Map.of("mode", "single", "levelProfile", "dphy-lp");
        StageHarness h = StageHarness.of(new DifferentialPlugin(), lp);
        h.push("in", new AnalogBlock("in", 0, 0, 1e6, v, N, null)).finish();
        assertEquals(Severity.INFO, h.annotations("level-check").stream()
                .filter(a -> a.fields().get("quantity").value().equals("lp-high")).map(LevelLimitTest::verdict).findFirst().orElseThrow());
        float[] w = v.clone();
        for (int i = 0; i < N; i++) {
            if (w[i] > 1) {
                w[i] = 0.85f;
            }
        }
        StageHarness h2 = StageHarness.of(new DifferentialPlugin(), lp);
        h2.push("in", new AnalogBlock("in", 0, 0, 1e6, w, N, null)).finish();
        assertEquals(Severity.ERROR, h2.annotations("level-check").stream()
                .filter(a -> a.fields().get("quantity").value().equals("lp-high")).map(LevelLimitTest::verdict).findFirst().orElseThrow());
    }

    /**
     * A D-PHY data lane between bursts: each burst of 200 mV high-speed swing around 200 mV
     * (legs 100/300 mV) starts with LP-11 (both legs 1.2 V), LP-01 (p 0 V, n 1.2 V: -1.2 V
     * differential) and LP-00 (MIPI D-PHY entry sequence, docs/reference-facts.md#d-phy-levels-and-states,
     * from memory). The low-power states are no high-speed levels: |VOD| low must read 200 mV, not
     * the mean with the LP-01 samples (which would be about 0.2 + 0.25 * 1.0 V here), and delta-VOD
     * stays near 0.
     */
    @Test
    void lowPowerStatesAreNoHighSpeedLevels() {
        float[] p = new float[N];
        float[] n = new float[N];
        for (int i = 0; i < N; i++) {
            int phase = i % 400;
            if (phase < 50) { // LP-11
                p[i] = 1.2f;
                n[i] = 1.2f;
            } else if (phase < 100) { // LP-01
                p[i] = 0f;
                n[i] = 1.2f;
            } else if (phase < 150) { // LP-00
                p[i] = 0f;
                n[i] = 0f;
            } else { // HS: 200 mV swing around 200 mV, 10 samples a bit
                boolean high = ((phase - 150) / 10) % 2 == 1;
                p[i] = high ? 0.3f : 0.1f;
                n[i] = high ? 0.1f : 0.3f;
            }
        }
        StageHarness h = TestSignals.runPair(Map.of("levelProfile", "dphy-hs", "thresholdVolts", 0.0, "hysteresisVolts", 0.05),
                new AnalogBlock("p", 0, 0, 1e6, p, N, null), new AnalogBlock("n", 0, 0, 1e6, n, N, null));
        Map<String, Double> value = new HashMap<>();
        Map<String, Severity> verdict = new HashMap<>();
        for (Annotation a : h.annotations("level-check")) {
            String q = (String) a.fields().get("quantity").value();
            value.put(q, ((Number) a.fields().get("valueVolts").value()).doubleValue());
            verdict.put(q, verdict(a));
        }
        assertEquals(0.200, value.get("vod-low"), 0.002, value.toString());
        assertEquals(0.200, value.get("vod-high"), 0.002, value.toString());
        assertEquals(0.200, value.get("vos"), 0.002, value.toString());
        assertEquals(Severity.INFO, verdict.get("vod-low"));
        assertEquals(Severity.INFO, verdict.get("vos"));
    }
}
