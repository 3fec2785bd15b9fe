package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.chain.ChainException;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * External checks of the estimators (issue 5): known skews injected into synthetic data with
 * noise and Gaussian jitter must come back within 2 % of a unit interval. The injected values
 * are the reference; the data is invented for the test.
 */
class SkewEstimateTest {
    static final double CLOCK_FS = 10_000_000;      // 100 MHz clock
    static final double UI_FS = CLOCK_FS / 2;        // DDR: 200 Mbit/s per lane, UI 5 ns
    static final long T0 = 20_000_000;

    static SkewTable table(StageHarness h) {
        List<Artifact> a = h.outputs("table", Artifact.class);
        assertEquals(1, a.size());
        assertEquals("dut-skew.json", a.get(0).fileName());
        return SkewTable.parse(a.get(0).fileName(), new String(a.get(0).content(), StandardCharsets.UTF_8));
    }

    static List<Edges> pieces(Edges e, int n) {
        long[] cuts = new long[n - 1];
        for (int i = 1; i < n; i++) {
            cuts[i - 1] = e.startFs() + (e.endFs() - e.startFs()) * i / n;
        }
        return Synth.split(e, cuts);
    }

    @ParameterizedTest
    @CsvSource({"edge, 0", "centre, 2500000"})
    void clockModeRecoversInjectedSkewsOnDdrData(String alignment, double phaseFs) {
        double[] skewFs = {400_000, -730_000, 1_100_000};
        int bits = 40_000;
        double jitter = 150_000; // 150 ps RMS on every edge
        Edges clk = LinkSynth.clock("clk", bits / 2 + 2, CLOCK_FS, T0, 30_000, 1);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock", "lanes", 3, "alignment", alignment))) {
            Edges[] lanes = new Edges[3];
            for (int l = 0; l < 3; l++) {
                lanes[l] = LinkSynth.lane("lane" + l, bits, UI_FS, T0, phaseFs, skewFs[l], jitter, 10 + l);
            }
            List<Edges> cp = pieces(clk, 7);
            for (int k = 0; k < 7; k++) {
                h.push("clock", cp.get(k));
                for (int l = 0; l < 3; l++) {
                    h.push("lane" + l, pieces(lanes[l], 7).get(k));
                }
            }
            h.finish();
            SkewTable t = table(h);
            assertEquals(0.0, t.get("clk").offsetPs());
            for (int l = 0; l < 3; l++) {
                SkewTable.Entry e = t.get("lane" + l);
                double errUi = (e.offsetPs() * 1000 + skewFs[l]) / UI_FS;
                System.out.printf("clock/%s lane%d: injected %.1f ps, correction %.1f ps, error %.3f %% UI, confidence %.3f%n",
                        alignment, l, skewFs[l] / 1000, e.offsetPs(), 100 * errUi, e.confidence());
                assertTrue(Math.abs(errUi) < 0.02, "error " + errUi + " UI");
                assertTrue(e.confidence() > 0.8, "confidence " + e.confidence());
                assertEquals("clock-" + alignment, e.method());
                assertTrue(e.edges() > bits / 3);
            }
            assertTrue(h.annotations().stream().noneMatch(a -> a.severity() != Severity.INFO), h.annotations().toString());
            assertEquals(3, h.annotations("skew-estimate").size());
        }
    }

    @Test
    void sdrClockFoldsOnTheWholePeriod() {
        // single data rate: one bit per clock period, launched on the rising edge
        int bits = 20_000;
        Edges clk = LinkSynth.clock("clk", bits + 2, CLOCK_FS, T0, 20_000, 3);
        Edges d = LinkSynth.lane("d", bits, CLOCK_FS, T0, 0, -1_300_000, 200_000, 4);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock", "ddr", false))) {
            h.push("clock", clk).push("lane0", d).finish();
            SkewTable.Entry e = table(h).get("d");
            assertEquals(1300.0, e.offsetPs(), 0.02 * CLOCK_FS / 1000);
        }
    }

    @Test
    void wrongDdrSettingShowsTwoClusters() {
        int bits = 20_000;
        Edges clk = LinkSynth.clock("clk", bits / 2 + 2, CLOCK_FS, T0, 20_000, 5);
        Edges d = LinkSynth.lane("d", bits, UI_FS, T0, 0, 300_000, 100_000, 6);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock", "ddr", false))) {
            h.push("clock", clk).push("lane0", d).finish();
            List<Annotation> w = h.annotations("skew-multimodal");
            assertEquals(1, w.size(), h.annotations().toString());
            assertEquals(Severity.WARNING, w.get(0).severity());
            assertEquals(1, h.annotations("skew-low-confidence").size(), "two opposite clusters cancel: concentration near 0");
        }
        // the same data with ddr=true is clean
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock", "ddr", true))) {
            h.push("clock", clk).push("lane0", d).finish();
            assertTrue(h.annotations("skew-multimodal").isEmpty());
            assertEquals(-300.0, table(h).get("d").offsetPs(), 0.02 * UI_FS / 1000);
        }
    }

    @Test
    void fewEdgesAndUnrelatedDataAreFlagged() {
        Edges clk = LinkSynth.clock("clk", 4000, CLOCK_FS, T0, 20_000, 7);
        Edges few = LinkSynth.lane("few", 60, UI_FS, T0, 0, 0, 50_000, 8);
        // transitions at random times: no phase relation to the clock
        java.util.Random r = new java.util.Random(9);
        long[] t = new long[3000];
        for (int i = 0; i < t.length; i++) {
            t[i] = T0 + (long) (r.nextDouble() * 3990 * CLOCK_FS);
        }
        java.util.Arrays.sort(t);
        Edges random = Edges.of("rnd", 0, T0 + (long) (4000 * CLOCK_FS), false, t);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock", "lanes", 2))) {
            h.push("clock", clk).push("lane0", few).push("lane1", random).finish();
            List<Annotation> fe = h.annotations("skew-few-edges");
            assertEquals(1, fe.size());
            assertEquals("few", fe.get(0).track());
            List<Annotation> lc = h.annotations("skew-low-confidence");
            assertEquals(1, lc.size(), h.annotations().toString());
            assertEquals("rnd", lc.get(0).track());
            assertTrue(table(h).get("rnd").confidence() < 0.1);
        }
    }

    @ParameterizedTest
    @CsvSource({"0ps", "5000ps"})
    void lanesModeAlignsLanesWithLaneZero(String ui) {
        double[] skewFs = {250_000, -600_000, 1_700_000, 90_000};
        int bits = 30_000;
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "lanes", "lanes", 4, "unitInterval", ui))) {
            Edges[] e = new Edges[4];
            for (int l = 0; l < 4; l++) {
                e[l] = LinkSynth.lane("lane" + l, bits, UI_FS, T0, 0, skewFs[l], 120_000, 20 + l);
            }
            for (int k = 0; k < 5; k++) {
                for (int l = 0; l < 4; l++) {
                    h.push("lane" + l, pieces(e[l], 5).get(k));
                }
            }
            h.finish();
            SkewTable t = table(h);
            assertEquals(0.0, t.get("lane0").offsetPs());
            assertEquals("reference", t.get("lane0").method());
            for (int l = 1; l < 4; l++) {
                double expect = -(skewFs[l] - skewFs[0]);
                double errUi = (t.get("lane" + l).offsetPs() * 1000 - expect) / UI_FS;
                System.out.printf("lanes (ui %s) lane%d: expected %.1f ps, got %.1f ps, error %.3f %% UI, confidence %.3f%n",
                        ui, l, expect / 1000, t.get("lane" + l).offsetPs(), 100 * errUi, t.get("lane" + l).confidence());
                assertTrue(Math.abs(errUi) < 0.02, "lane" + l + " error " + errUi + " UI");
            }
            double uiPs = h.annotations("skew-estimate").get(0).fields().get("intervalPs").asDouble();
            assertEquals(5000.0, uiPs, 5.0, "unit interval used");
        }
    }

    /**
     * Legs: P against -N with a known skew on N, noise 5 mV RMS on a 350 mV swing, 25 ps RMS
     * jitter, 1 Gbit/s sampled at 10 GS/s (10 samples per UI): error under 2 % of the UI.
     */
    @ParameterizedTest
    @CsvSource({"137.0", "-61.3", "0.0", "412.5", "-1234.0"})
    void legsModeRecoversTheSkewBetweenPAndN(double skewPs) {
        double ui = 1_000_000;
        AnalogBlock[] pn = LinkSynth.legs(20_000, ui, 10e9, 250_000, skewPs * 1000, 25_000, 0.005, 42);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs", "maxSkew", "2ns"))) {
            List<AnalogBlock> ps = Synth.split(pn[0], 30_000, 12_345);
            List<AnalogBlock> ns = Synth.split(pn[1], 30_000, 12_345);
            for (int k = 0; k < ps.size(); k++) {
                h.push("p", ps.get(k)).push("n", ns.get(k));
            }
            h.finish();
            SkewTable t = table(h);
            assertEquals(0.0, t.get("d0p").offsetPs());
            SkewTable.Entry n = t.get("d0n");
            double errUi = (n.offsetPs() + skewPs) * 1000 / ui;
            System.out.printf("legs: injected %.1f ps, correction %.2f ps, error %.3f %% UI, confidence %.3f%n",
                    skewPs, n.offsetPs(), 100 * errUi, n.confidence());
            assertTrue(Math.abs(errUi) < 0.02, "error " + errUi + " UI");
            assertTrue(n.confidence() > 0.9, "confidence " + n.confidence());
            assertTrue(h.annotations().stream().noneMatch(a -> a.severity() != Severity.INFO), h.annotations().toString());
        }
    }

    @Test
    void legsSkewBeyondTheSearchRangeIsAnError() {
        AnalogBlock[] pn = LinkSynth.legs(4000, 1_000_000, 10e9, 250_000, 900_000, 10_000, 0.005, 43);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs", "maxSkew", "300ps"))) {
            h.push("p", pn[0]).push("n", pn[1]).finish();
            List<Annotation> a = h.annotations("skew-out-of-range");
            assertEquals(1, a.size(), h.annotations().toString());
            assertEquals(Severity.ERROR, a.get(0).severity());
        }
    }

    @Test
    void legsOfAClockAreAmbiguous() {
        // a clock pattern 1010...: correlation repeats every 2 UI
        double periodFs = 100_000;
        AnalogBlock p = Synth.analog("cp", 10e9, 40_000, t -> 1.2 + 0.175 * Math.signum(Math.sin(2 * Math.PI * 2.5e8 * t + 0.1)));
        AnalogBlock n = Synth.analog("cn", 10e9, 40_000, t -> 1.2 - 0.175 * Math.signum(Math.sin(2 * Math.PI * 2.5e8 * (t - 3e-10) + 0.1)));
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs", "maxSkew", "10ns"))) {
            h.push("p", p).push("n", n).finish();
            assertEquals(1, h.annotations("skew-ambiguous").size(), h.annotations().toString());
        }
        assertTrue(periodFs > 0);
    }

    @Test
    void legsWithNanSamplesStillGiveAnEstimateAndSaySo() {
        AnalogBlock[] pn = LinkSynth.legs(4000, 1_000_000, 10e9, 250_000, 150_000, 10_000, 0.005, 44);
        float[] v = pn[1].volts().clone();
        v[1000] = Float.NaN;
        v[20_000] = Float.NEGATIVE_INFINITY;
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs"))) {
            h.push("p", pn[0]).push("n", AnalogBlock.of("d0n", 0, pn[1].periodFs(), v)).finish();
            assertEquals(1, h.annotations("skew-bad-samples").size());
            assertEquals(-150.0, table(h).get("d0n").offsetPs(), 20.0);
        }
    }

    @Test
    void legsMisalignedStartsAreRefused() {
        AnalogBlock p = Synth.analog("p", 1e9, 100, t -> 0);
        AnalogBlock n = new AnalogBlock("n", 0, 5_000_000, 1e6, new float[100], 100, null);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs"))) {
            h.push("p", p);
            Exception e = assertThrows(RuntimeException.class, () -> h.push("n", n));
            assertTrue(e.getMessage().contains("must start at the same sample time"), e.getMessage());
        }
    }

    @Test
    void optionErrorsNameTheOption() {
        ChainException a = assertThrows(ChainException.class, () -> StageHarness.of(new SkewEstimatePlugin(),
                Map.of("mode", "lanes", "lanes", 1)));
        assertTrue(a.getMessage().contains("'lanes'") && a.getMessage().contains("at least 2"), a.getMessage());
        ChainException b = assertThrows(ChainException.class, () -> StageHarness.of(new SkewEstimatePlugin(),
                Map.of("mode", "lanes", "lanes", 2, "unitInterval", "3samples")));
        assertTrue(b.getMessage().contains("unitInterval"), b.getMessage());
        RuntimeException c = assertThrows(RuntimeException.class, () -> StageHarness.of(new SkewEstimatePlugin(),
                Map.of("mode", "sideways")));
        assertTrue(c.getMessage().contains("legs, clock, lanes"), c.getMessage());
    }

    @Test
    void noDataGivesAnErrorAnnotationNotAnException() {
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "clock"))) {
            h.finish();
            assertFalse(h.annotations("skew-no-estimate").isEmpty());
            assertEquals(0.0, table(h).get("lane0").confidence());
        }
    }
}
