package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionException;
import org.lanesift.testkit.StageHarness;

/**
 * The guards of issue 16: a lanes-mode estimate with {@code unitInterval} 0 and a clock on lane 0
 * derives the unit interval from the clock or refuses naming the option, and an estimate that is
 * ambiguous, weak or near half an interval is carried as suspect into the table and reported by
 * {@code deskew} when applied. Data are invented for the tests.
 */
class SkewGuardsTest {
    static final double UI_FS = 1_000_000;  // 1 ns slots
    static final long T0 = 50_000_000;

    /**
     * A 7:1 pixel-link clock: high for slots 0, 1, 5, 6 and low for 2, 3, 4, so a period is one
     * rising edge then 4 slots high... expressed as transitions: rise at slot 5, fall at slot 2 of
     * the next period (high 4 slots, low 3 slots).
     * Source: docs/reference-facts.md#pixel-link-clock-and-slot-mappings (pattern 1100011).
     */
    static Edges pixelClock(String name, int periods, double uiFs, long t0, double jitterFs, long seed) {
        Random r = new Random(seed);
        long[] t = new long[2 * periods];
        for (int k = 0; k < periods; k++) {
            t[2 * k] = t0 + Math.round((7 * k + 2) * uiFs + r.nextGaussian() * jitterFs);     // falls after slot 1
            t[2 * k + 1] = t0 + Math.round((7 * k + 5) * uiFs + r.nextGaussian() * jitterFs); // rises before slot 5
        }
        Arrays.sort(t);
        return Edges.of(name, 0, t0 + Math.round((7L * periods + 7) * uiFs), true, t);
    }

    static SkewTable table(StageHarness h) {
        List<Artifact> a = h.outputs("table", Artifact.class);
        assertEquals(1, a.size());
        return SkewTable.parse(a.get(0).fileName(), new String(a.get(0).content(), StandardCharsets.UTF_8));
    }

    private static void pushAll(StageHarness h, Edges... lanes) {
        for (int k = 0; k < 4; k++) {
            for (int l = 0; l < lanes.length; l++) {
                h.push("lane" + l, SkewEstimateTest.pieces(lanes[l], 4).get(k));
            }
        }
        h.finish();
    }

    /** Without the derivation the clock's 3- and 4-slot intervals are read as one "unit interval" of about 3.5 slots. */
    @Test
    void unitIntervalZeroWithAClockOnLaneZeroIsDerivedFromTheClockShape() {
        int periods = 6000;
        double[] skewFs = {0, 180_000, -260_000, 330_000};
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "lanes", "lanes", 4, "unitInterval", "0ps"))) {
            Edges[] e = new Edges[4];
            e[0] = pixelClock("CLKX", periods, UI_FS, T0, 15_000, 3);
            for (int l = 1; l < 4; l++) {
                e[l] = LinkSynth.lane("DX" + l, 7 * periods, UI_FS, T0, 0, skewFs[l], 20_000, 40 + l);
            }
            pushAll(h, e);
            SkewTable t = table(h);
            for (int l = 1; l < 4; l++) {
                SkewTable.Entry row = t.get("DX" + l);
                assertEquals(-skewFs[l] / 1000, row.offsetPs(), 10.0, "DX" + l + ": " + row);
                assertFalse(row.isSuspect(), row.suspect());
            }
            Annotation ui = h.annotations("skew-unit-interval").get(0);
            assertEquals(UI_FS / 1000, ui.fields().get("unitIntervalPs").asDouble(), 1.0);
            assertEquals(7.0, ui.fields().get("bitsPerClock").asDouble());
            assertTrue(ui.fields().get("detail").value().toString().contains("4:3"), ui.fields().get("detail").value().toString());
        }
    }

    @Test
    void anEvenClockOnLaneZeroNeedsBitsPerClockAndIsRefusedWithoutIt() {
        int cycles = 6000;
        double clockFs = 2 * UI_FS; // data on both edges: 2 bits per clock period
        Edges clk = LinkSynth.clock("CK", cycles, clockFs, T0, 10_000, 5);
        Edges d = LinkSynth.lane("DQ", 2 * cycles, UI_FS, T0, 0, 210_000, 20_000, 6);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "lanes", "lanes", 2))) {
            RuntimeException x = assertThrows(RuntimeException.class, () -> pushAll(h, clk, d));
            OptionException o = optionCause(x);
            assertEquals("unitInterval", o.option(), o.getMessage());
            assertTrue(o.getMessage().contains("bitsPerClock") && o.getMessage().contains("lane0 is a clock"), o.getMessage());
        }
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "lanes", "lanes", 2, "bitsPerClock", 2))) {
            pushAll(h, clk, d);
            assertEquals(-210.0, table(h).get("DQ").offsetPs(), 10.0);
            assertEquals(UI_FS / 1000, h.annotations("skew-unit-interval").get(0).fields().get("unitIntervalPs").asDouble(), 1.0);
        }
    }

    private static OptionException optionCause(Throwable t) {
        for (Throwable c = t; c != null; c = c.getCause()) {
            if (c instanceof OptionException o) {
                return o;
            }
        }
        throw new AssertionError("no OptionException in " + t, t);
    }

    /**
     * Lanes-mode estimate at a given 1 ns unit interval over random-data lanes named A, B, C...
     * with the given skews and jitter (femtoseconds); the harness is finished, the caller closes it.
     */
    private static StageHarness estimateLanes(double[] skewFs, double[] jitterFs, long seed) {
        StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "lanes", "lanes", skewFs.length, "unitInterval", "1ns"));
        Edges[] e = new Edges[skewFs.length];
        for (int l = 0; l < e.length; l++) {
            e[l] = LinkSynth.lane(String.valueOf((char) ('A' + l)), 20_000, UI_FS, T0, 0, skewFs[l], jitterFs[l], seed + l);
        }
        pushAll(h, e);
        return h;
    }

    /** A lane whose transitions sit 0.45 UI from the reference's cannot be told from one 0.55 UI the other way. */
    @Test
    void aSkewNearHalfAnIntervalIsSuspectInTheTable() {
        try (StageHarness h = estimateLanes(new double[] {0, 450_000, 120_000}, new double[] {10_000, 10_000, 10_000}, 7)) {
            SkewTable t = table(h);
            assertTrue(t.get("B").isSuspect(), t.toString());
            assertTrue(t.get("B").suspect().contains("half an interval"), t.get("B").suspect());
            assertFalse(t.get("C").isSuspect(), t.get("C").suspect());
            List<Annotation> warned = h.annotations("skew-suspect");
            assertEquals(1, warned.size(), warned.toString());
            assertEquals("B", warned.get(0).track());
        }
    }

    /** Jitter of a third of the UI leaves no fixed phase: the row is suspect and says why. */
    @Test
    void aLowConfidenceEstimateIsSuspectInTheTable() {
        try (StageHarness h = estimateLanes(new double[] {0, 100_000}, new double[] {10_000, 330_000}, 11)) {
            SkewTable.Entry row = table(h).get("B");
            assertTrue(row.confidence() < 0.5, row.toString());
            assertTrue(row.suspect().contains("low confidence"), row.suspect());
        }
    }

    @Test
    void deskewReportsASuspectRowWhenItAppliesIt(@TempDir java.nio.file.Path dir) throws Exception {
        java.nio.file.Path f = dir.resolve("t.json");
        SkewTable t = new SkewTable("lanes", List.of(new SkewTable.Entry("A", 0, 1, "reference", 0),
                new SkewTable.Entry("B", 120.5, 0.93, "lanes", 5000, "ambiguous: transitions fall in 2 clusters")));
        java.nio.file.Files.writeString(f, t.toJson());
        assertEquals("ambiguous: transitions fall in 2 clusters", SkewTable.read(f).get("B").suspect());
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "edges", "channels", 2, "offsetsFile", f.toString()))) {
            h.push("in0", Edges.of("A", 0, 1_000_000, false, new long[] {10, 20}));
            h.push("in1", Edges.of("B", 0, 1_000_000, false, new long[] {10, 20}));
            h.finish();
            List<Annotation> s = h.annotations("skew-suspect");
            assertEquals(1, s.size(), s.toString());
            assertEquals("B", s.get(0).track());
            assertEquals(Severity.WARNING, s.get(0).severity());
            assertTrue(s.get(0).fields().get("detail").value().toString().contains("2 clusters"), s.get(0).toString());
        }
    }

    @Test
    void aMissingTableNamesTheFolderItLookedIn(@TempDir java.nio.file.Path dir) throws Exception {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SkewTable.read(dir.resolve("none.json")));
        assertTrue(e.getMessage().contains("looked in folder " + dir.toAbsolutePath().normalize()), e.getMessage());
    }
}
