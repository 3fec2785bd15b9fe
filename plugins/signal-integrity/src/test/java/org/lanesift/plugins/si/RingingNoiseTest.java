package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.lanesift.plugins.si.EdgeMetricsPluginTest.in;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The ringing fit on noisy captures. External check: ngspice (Debian package) transient of
 * src/test/spice/probe-square.cir, a 1 V square wave (80 edges) through R = 20 ohm, L = 100 nH
 * (ground lead), C = 10 pF (probe tip). Series RLC theory (textbook): f0 = 1 / (2 pi sqrt(L C))
 * = 159.15 MHz. The test adds seeded Gaussian noise of 10 and 20 mV RMS; every seed must give f0
 * within 3 % and, with the 10 pF given, L within 10 %.
 */
class RingingNoiseTest {
    static final double L_H = 100e-9;
    static final double C_F = 10e-12;
    static final double F0_HZ = 1 / (2 * Math.PI * Math.sqrt(L_H * C_F));

    @Test
    void averagedEdgesGiveF0AndInductanceAtTenAndTwentyMillivoltsOfNoise(@TempDir Path dir) throws Exception {
        check(Spice.run("probe-square.cir", "probe-square.out", dir), "80 edges", 60_000_000L);
    }

    @Test
    void eightEdgesAreEnoughAtTenAndTwentyMillivolts(@TempDir Path dir) throws Exception {
        // src/test/spice/probe-step.cir: the same circuit, 800 ns of a 200 ns square wave (8 edges)
        check(Spice.run("probe-step.cir", "probe-step.out", dir), "8 edges", 100_000_000L);
    }

    private static void check(AnalogBlock clean, String what, long halfPeriodFs) {
        StringBuilder table = new StringBuilder();
        for (double noise : new double[] {0.010, 0.020}) {
            for (long seed = 1; seed <= 9; seed++) {
                AnalogBlock sig = Synth.withNoise(clean, noise, seed);
                // levels given: the test is about the fit, not about finding the levels in noise
                StageHarness h = StageHarness.of(new RingingPlugin(), Map.of("probeCapacitancePf", 10.0,
                        "levelsVolts", List.of(0.0, 1.0), "maxFits", 1L));
                for (AnalogBlock b : Synth.split(sig, 8192)) {
                    h.push("signal", b);
                }
                h.finish();
                String j = RingingPluginTest.json(h, "-ringing.json");
                double f0 = in(j, "summary", "naturalHz");
                double lNh = in(j, "summary", "loopInductanceNh");
                table.append(String.format(Locale.ROOT, "%s, noise %2.0f mV seed %d: f0 %.2f MHz (%+.2f %%), L %.1f nH (%+.2f %%), edges averaged %.0f%n",
                        what, noise * 1e3, seed, f0 / 1e6, 100 * (f0 / F0_HZ - 1), lNh, 100 * (lNh / 100 - 1), in(j, "average", "edgesAveraged")));
                assertEquals("the averaged edge", org.lanesift.testkit.JsonScan.first(org.lanesift.testkit.JsonScan.parse("report", j), "from").value().asString(), j);
                assertEquals(F0_HZ, f0, 0.03 * F0_HZ, table + j);
                assertEquals(100, lNh, 10, table + j);
                // the annotation spans one fitted edge (at most the half period of the square wave), not the capture
                Annotation a = h.annotations("ringing").get(0);
                assertTrue(a.endFs() - a.startFs() <= halfPeriodFs && a.endFs() > a.startFs(), a.toString());
            }
        }
        System.out.print(table);
    }

    @Test
    void averagingRescuesAFitThatOneEdgeAloneCannotGive(@TempDir Path dir) throws Exception {
        // 150 mV RMS on the 1 V square wave: a single edge's samples do not show the ring well enough
        // (R^2 of its fit far below 0.8), the average of 80 (noise / sqrt(80) = 17 mV) does
        AnalogBlock clean = Spice.run("probe-square.cir", "probe-square.out", dir);
        StringBuilder table = new StringBuilder();
        for (long seed = 1; seed <= 3; seed++) {
            StageHarness h = StageHarness.of(new RingingPlugin(), Map.of("probeCapacitancePf", 10.0,
                    "levelsVolts", List.of(0.0, 1.0), "maxFits", 10L));
            h.push("signal", Synth.withNoise(clean, 0.150, seed)).finish();
            String j = RingingPluginTest.json(h, "-ringing.json");
            double f0 = in(j, "summary", "naturalHz");
            table.append(String.format(Locale.ROOT, "150 mV seed %d: averaged f0 %.2f MHz (%+.2f %%), single edges fitted %.0f of the first 10%n",
                    seed, f0 / 1e6, 100 * (f0 / F0_HZ - 1), EyeDiagramPluginTest.num(j, "fitted")));
            assertEquals("the averaged edge", org.lanesift.testkit.JsonScan.first(org.lanesift.testkit.JsonScan.parse("report", j), "from").value().asString(), j);
            assertEquals(F0_HZ, f0, 0.03 * F0_HZ, table + j);
            assertTrue(EyeDiagramPluginTest.num(j, "fitted") <= 2, "most single edges cannot be fitted at 150 mV: " + table);
        }
        System.out.print(table);
    }
}
