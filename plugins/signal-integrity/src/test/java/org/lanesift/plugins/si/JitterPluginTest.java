package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.lanesift.plugins.si.EyeDiagramPluginTest.num;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

class JitterPluginTest {

    /** Rising and falling edges of a clock whose rising edge k is at k T + N(0, sigma^2), falling edges midway. */
    static Edges clock(int cycles, double periodFs, double sigmaFs, long seed, int dropFrom, int dropTo) {
        Random r = new Random(seed);
        long[] t = new long[2 * cycles];
        int m = 0;
        for (int k = 0; k < cycles; k++) {
            long rise = 1_000_000 + Math.round(k * periodFs + r.nextGaussian() * sigmaFs);
            long fall = 1_000_000 + Math.round((k + 0.5) * periodFs);
            if (k >= dropFrom && k < dropTo) {
                continue; // a missing stretch of clock
            }
            t[m++] = rise;
            t[m++] = fall;
        }
        return Edges.of("clk", 0, Math.round(1_000_000 + (cycles + 1) * periodFs), false, Arrays.copyOf(t, m));
    }

    static String json(StageHarness h) {
        return new String(h.outputs("files", Artifact.class).get(0).content(), StandardCharsets.UTF_8);
    }

    @Test
    void rmsTieOfGaussianJitterMatchesSigma() {
        // Independent Gaussian edge jitter sigma (statistics textbook): TIE RMS = sigma, period jitter
        // RMS = sigma sqrt(2) (difference of two), cycle-to-cycle RMS = sigma sqrt(6) (e2 - 2 e1 + e0).
        // With n = 200000 the sample RMS has a relative sd of about 1/sqrt(2n) = 0.16 %; we allow 1 %.
        double sigma = 2_000; // 2 ps
        double period = 1_000_123.4; // slightly off 1 GHz: the fit must find it
        StageHarness h = StageHarness.of(new JitterPlugin(), Map.of());
        h.push("clock", clock(200_000, period, sigma, 42, -1, -1)).finish();
        String j = json(h);
        assertEquals(2.0, num(j, "tieRmsPs"), 0.02, j);
        assertEquals(2.0 * Math.sqrt(2), num(j, "periodJitterRmsPs"), 0.03, j);
        assertEquals(2.0 * Math.sqrt(6), num(j, "cycleToCycleRmsPs"), 0.05, j);
        assertEquals(period / 1000, num(j, "idealPeriodPs"), 1e-4, j);
        // Gaussian peak-to-peak over 200000 samples is about 2 * 4.4 sigma; it must at least exceed 8 sigma
        assertEquals(1, Math.signum(num(j, "tiePeakToPeakPs") - 16), j);
        SynthSignals.save(h.outputs("files", Artifact.class).get(1));
    }

    /** Every value of the report carries its source in the one host-api shape; no separate provenance object. */
    @Test
    void valuesSayWhereTheyComeFrom() {
        StageHarness h = StageHarness.of(new JitterPlugin(), Map.of());
        h.push("clock", clock(20_000, 1_000_000, 1_000, 7, -1, -1)).finish();
        org.lanesift.json.JsonValue v = org.lanesift.testkit.JsonScan.parse("report", json(h));
        assertEquals(null, v.get("provenance"));
        assertEquals("ps", v.at("/tieRmsPs/unit").asString());
        assertTrue(v.at("/tieRmsPs/source").asString().startsWith("measured"));
        assertTrue(v.at("/ber/source").asString().startsWith("assumed by default"));
        assertTrue(v.at("/decomposition/qOfBer/source").asString().startsWith("standard: ")
                && v.at("/decomposition/qOfBer/source").asString().endsWith("(docs/reference-facts.md#jitter-under-the-dual-dirac-model)"));
        assertTrue(v.at("/decomposition/totalJitterPs/source").asString().startsWith("derived: TJ(BER) = DJ(dual-Dirac) + 2 Q(BER) RJ"));
    }

    @Test
    void missingEdgesAreSkippedInTheNumbering() {
        StageHarness h = StageHarness.of(new JitterPlugin(), Map.of());
        h.push("clock", clock(20_000, 1e6, 1_000, 7, 5000, 5010)).finish();
        String j = json(h);
        assertEquals(1, num(j, "missingEdgePlaces"), j);
        assertEquals(1.0, num(j, "tieRmsPs"), 0.03, j);
        assertEquals(19_990, num(j, "edgesAnalysed"));
    }

    @Test
    void blockBoundariesDoNotChangeTheResult() {
        Edges e = clock(10_000, 1e6, 1_000, 3, -1, -1);
        StageHarness one = StageHarness.of(new JitterPlugin(), Map.of("edge", "both"));
        one.push("clock", e).finish();
        StageHarness many = StageHarness.of(new JitterPlugin(), Map.of("edge", "both"));
        for (Edges p : Synth.split(e, 1_234_567, 2_000_000_000L, 7_777_777_777L)) {
            many.push("clock", p);
        }
        many.finish();
        assertEquals(json(one), json(many));
    }

    @Test
    void tooFewEdgesIsReportedNotThrown() {
        StageHarness h = StageHarness.of(new JitterPlugin(), Map.of());
        h.push("clock", Edges.of("clk", 0, 100, false, 10, 20)).finish();
        assertEquals(1, h.annotations("jitter-too-few-edges").size());
    }

    @Test
    void theExitFromAnUnknownStartIsNoClockEdge() {
        // a clean 1 GHz clock with 1 ps Gaussian jitter whose list starts with an unknown span (as a
        // deskew stage leaves it): the transition that ends the span (low to high) only restores the
        // level; counted as a rising edge it would add a TIE outlier of hundreds of ps
        // the unknown span hides the first rising edge; the level comes back high at its end
        Edges clean = clock(20_001, 1e6, 1_000, 11, -1, -1);
        long spanEnd = 1_000_000 + 400_000;
        long[] t = clean.timesFs().clone();
        t[0] = spanEnd;
        Edges withStart = new Edges("clk", 0, clean.endFs(), false, t, t.length, new long[] {0, spanEnd}, 1);
        for (int cut = 0; cut < 2; cut++) {
            StageHarness h = StageHarness.of(new JitterPlugin(), Map.of());
            if (cut == 0) {
                h.push("clock", withStart);
            } else {
                // the span ends exactly where the next block begins
                h.push("clock", withStart.slice(0, spanEnd));
                h.push("clock", withStart.slice(spanEnd, withStart.endFs()));
            }
            h.finish();
            String j = json(h);
            assertEquals(20_000, num(j, "edgesAnalysed"), j);
            assertEquals(1.0, num(j, "tieRmsPs"), 0.03, j);
            assertEquals(0, num(j, "missingEdgePlaces"), j);
            assertEquals(1, Math.signum(10 - num(j, "tiePeakToPeakPs")), "no 600 ps outlier: " + j);
        }
    }
}
