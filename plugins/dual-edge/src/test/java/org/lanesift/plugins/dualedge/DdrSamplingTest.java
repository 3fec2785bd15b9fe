package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.BitStream;

class DdrSamplingTest {
    static final long U = BitStream.UNKNOWN_MARGIN;

    /**
     * Worked by hand. A 400 Mbit/s DDR link: UI = 1 s / 400e6 = 2.5 ns = 2,500,000 fs, so the clock
     * runs at 200 MHz, period P = 5 ns. Duty cycle 45 %: the clock is high 0.45 * 5 ns = 2.25 ns, so
     * every falling edge comes 2.5 - 2.25 = 0.25 ns early against the ideal half period. Data is
     * centre-aligned: transitions lie half a UI (1.25 ns) either side of the ideal clock edge; lane 1
     * is delayed (skewed) by 100 ps. The sampler samples at the clock edge (phase 0).
     * <ul>
     * <li>lane 0, rising-edge bit: setup = 1250 ps, hold = 1250 ps;</li>
     * <li>lane 0, falling-edge bit: the sample point is 250 ps early: setup = 1250 - 250 = 1000 ps,
     *     hold = 1250 + 250 = 1500 ps;</li>
     * <li>lane 1, rising-edge bit: the previous transition is 100 ps later, the next one too:
     *     setup = 1250 - 100 = 1150 ps, hold = 1250 + 100 = 1350 ps;</li>
     * <li>lane 1, falling-edge bit: setup = 1250 - 250 - 100 = 900 ps, hold = 1250 + 250 + 100 = 1600 ps.</li>
     * </ul>
     * Each pair adds up to one UI (2500 ps), as it must. The flag threshold is 0.15 UI = 375 ps, so no
     * bit is flagged. The margins must be within 1 % of a UI (25 ps) of these values; the only error
     * is the rounding of edge times to whole femtoseconds.
     */
    @Test
    void handWorkedDdrMargins() {
        LinkSim sim = LinkSim.ddr(2_500_000, 4000, 2);
        sim.duty = 0.45;
        sim.skewFs[1] = 100_000;
        sim.build();
        Run r = Run.whole(Map.of("lanes", 2), sim.clock(), sim.lane(0), sim.lane(1));
        long[][] expSetup = {{1_250_000, 1_000_000}, {1_150_000, 900_000}};
        long[][] expHold = {{1_250_000, 1_500_000}, {1_350_000, 1_600_000}};
        for (int l = 0; l < 2; l++) {
            Run.Lane lane = r.lanes.get(l);
            assertEquals(4000, lane.size());
            for (int k = 0; k < 4000; k++) {
                assertEquals(sim.data[l][k], lane.values.get(k), "lane " + l + " bit " + k);
                assertEquals(k, lane.edge.get(k));
                assertEquals((k & 1) == 1, lane.falling.get(k));
                assertEquals(-1, lane.slot.get(k));
                assertFalse(lane.flagged.get(k), "flag lane " + l + " bit " + k + " setup " + lane.setup.get(k) + " hold "
                        + lane.hold.get(k));
                int f = k & 1;
                if (sim.changesAt(l, k)) {
                    assertEquals(expSetup[l][f], lane.setup.get(k), 25_000, "setup lane " + l + " bit " + k);
                } else {
                    assertEquals(U, lane.setup.get(k), "no transition within 1 UI before bit " + k);
                }
                if (k + 1 < 4000 && sim.changesAt(l, k + 1)) {
                    assertEquals(expHold[l][f], lane.hold.get(k), 25_000, "hold lane " + l + " bit " + k);
                } else {
                    assertEquals(U, lane.hold.get(k));
                }
            }
        }
        assertEquals(5_000_000, r.reportNumber("periodFs", "mean"), 1);
        assertEquals(0.45, r.reportNumber("duty", "mean"), 1e-6);
        assertEquals(2.0e8, r.reportNumber(null, "frequencyHz"), 1);
        assertEquals(900_000, r.reportNumber("lane", "1", "minFs"), 2);
        assertEquals(0, r.reportNumber("lane", "0", "flagged"));
        assertEquals(1, r.of("clock-acquired").size());
        assertTrue(r.of("margin-low").isEmpty());
    }

    /**
     * Several rates with every impairment at once; the expected margin of each bit is computed from the
     * generator's own transition times (s_k - boundary_k, boundary_{k+1} - s_k), so any error in the
     * sampler's clock edge association, search or arithmetic shows. The eye stays open: total
     * deterministic closure 0.03 UI (duty) *2 + 0.05 UI (skew) + 0.08 UI (sinusoidal) plus Gaussian
     * jitter of 0.02 UI rms per edge.
     */
    @ParameterizedTest
    @ValueSource(doubles = {1e8, 1.0e9, 3.2e9})
    void zeroErrorsAndAnalyticMarginsWithJitter(double bitRate) {
        double ui = 1e15 / bitRate;
        LinkSim sim = LinkSim.ddr(ui, 20000, 3);
        sim.duty = 0.47;
        sim.skewFs[0] = 0.05 * ui;
        sim.skewFs[1] = -0.04 * ui;
        sim.skewFs[2] = 0.02 * ui;
        sim.dataRjFs = 0.02 * ui;
        sim.clockRjFs = 0.015 * ui;
        sim.sjAmpFs = 0.08 * ui;
        sim.sjFreqHz = bitRate / 997.3;
        sim.seed = (long) (bitRate / 1e6);
        sim.build();
        Run r = Run.whole(Map.of("lanes", 3), sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2));
        double thr = 0.15 * ui;
        for (int l = 0; l < 3; l++) {
            Run.Lane lane = r.lanes.get(l);
            assertEquals(sim.bits, lane.size());
            int errors = 0;
            for (int k = 0; k < sim.bits; k++) {
                if (lane.values.get(k) != sim.data[l][k]) {
                    errors++;
                }
                long s = sim.clockT[k];
                assertEquals(s, lane.times.get(k));
                long es = sim.changesAt(l, k) ? s - sim.boundary[l][k] : U;
                long eh = k + 1 < sim.bits && sim.changesAt(l, k + 1) ? sim.boundary[l][k + 1] - s : U;
                assertMargin(es, lane.setup.get(k), ui, "setup lane " + l + " bit " + k);
                assertMargin(eh, lane.hold.get(k), ui, "hold lane " + l + " bit " + k);
                boolean expectFlag = es < thr || eh < thr;
                assertEquals(expectFlag, lane.flagged.get(k), "flag lane " + l + " bit " + k);
            }
            assertEquals(0, errors, "bit errors on lane " + l);
        }
    }

    static void assertMargin(long expected, long actual, double ui, String what) {
        if (expected == U || expected > ui) {
            assertEquals(U, actual, what + ": expected no transition within reach");
        } else {
            assertEquals(expected, actual, 0.01 * ui, what);
        }
    }

    /**
     * Gaussian jitter only: with data jitter sigma_d and clock jitter sigma_c per edge, the setup
     * margin of a bit that follows a transition is UI/2 + j_clock - j_data, normally distributed with
     * mean UI/2 and sigma = sqrt(sigma_d^2 + sigma_c^2). Its percentiles must match the normal
     * quantiles (Apache Commons Math NormalDistribution as the reference) within 1 % of a UI, both as
     * computed from the bit stream and as given in the report.
     */
    @Test
    void marginDistributionMatchesNormalQuantiles() {
        double ui = 1e15 / 1.5e9;
        LinkSim sim = LinkSim.ddr(ui, 60000, 1);
        sim.dataRjFs = 0.04 * ui;
        sim.clockRjFs = 0.03 * ui;
        sim.seed = 99;
        sim.build();
        Run r = Run.whole(Map.of("lanes", 1), sim.clock(), sim.lane(0));
        Run.Lane lane = r.lanes.get(0);
        double[] su = lane.setup.stream().filter(v -> v != U).mapToDouble(v -> v / ui).sorted().toArray();
        assertTrue(su.length > 25000, "bits following a transition: " + su.length);
        NormalDistribution nd = new NormalDistribution(0.5, Math.hypot(0.04, 0.03));
        for (double p : new double[] {1, 5, 10, 50, 90, 99}) {
            double expected = nd.inverseCumulativeProbability(p / 100);
            double fromBits = su[(int) Math.ceil(p / 100 * su.length) - 1];
            assertEquals(expected, fromBits, 0.01, "setup percentile " + p);
            String key = p == Math.rint(p) ? Long.toString((long) p) : Double.toString(p);
            assertEquals(expected, r.reportNumber("setup", key), 0.01, "report setup percentile " + p);
        }
        for (int k = 0; k < sim.bits; k++) {
            assertEquals(sim.data[0][k], lane.values.get(k));
        }
    }

    /**
     * Sinusoidal jitter of amplitude A = 0.2 UI on the data only: every transition moves by
     * A sin(...), so the smallest setup and hold margins over many jitter cycles are UI/2 - A = 0.3 UI.
     */
    @Test
    void sinusoidalJitterMinimumMargin() {
        double ui = 1e15 / 8e8;
        LinkSim sim = LinkSim.ddr(ui, 40000, 1);
        sim.sjAmpFs = 0.2 * ui;
        sim.sjFreqHz = 8e8 / 313.7;
        sim.build();
        Run r = Run.whole(Map.of("lanes", 1), sim.clock(), sim.lane(0));
        assertEquals(0.3 * ui, r.reportNumber("setup", "minFs"), 0.01 * ui);
        assertEquals(0.3 * ui, r.reportNumber("hold", "minFs"), 0.01 * ui);
        assertEquals(0.3, r.reportNumber("setup", "minUI"), 0.01);
        assertEquals(0, r.reportNumber("lane", "0", "flagged"));
    }

    /**
     * The eye closed on purpose: sinusoidal jitter of 0.6 UI moves transitions past the sample point.
     * Bits come out wrong, and every wrong one must be flagged: a transition displaced by d in
     * (0.5, 0.6] UI past the sample point leaves a margin d - 0.5 <= 0.1 UI, below the 0.15 UI threshold.
     */
    @Test
    void closedEyeFlagsEveryWrongBit() {
        double ui = 1e15 / 1e9;
        LinkSim sim = LinkSim.ddr(ui, 30000, 2);
        sim.sjAmpFs = 0.6 * ui;
        sim.sjFreqHz = 1e9 / 411.3;
        sim.build();
        Run r = Run.whole(Map.of("lanes", 2), sim.clock(), sim.lane(0), sim.lane(1));
        for (int l = 0; l < 2; l++) {
            Run.Lane lane = r.lanes.get(l);
            int wrong = 0;
            int flagged = 0;
            for (int k = 0; k < sim.bits; k++) {
                boolean bad = lane.values.get(k) != sim.data[l][k];
                if (bad) {
                    wrong++;
                    assertTrue(lane.flagged.get(k), "wrong bit " + k + " of lane " + l + " not flagged");
                }
                if (lane.flagged.get(k)) {
                    flagged++;
                }
            }
            assertTrue(wrong > 100, "the eye should really be closed: " + wrong + " wrong bits");
            assertTrue(flagged > wrong, "flagged " + flagged + " wrong " + wrong);
        }
        assertFalse(r.of("margin-low").isEmpty());
        assertTrue(r.reportNumber("lane", "0", "flagged") > 100);

        // marginFindings = decoder: the same bits are flagged, but the runs are left to the decoder
        Run quiet = Run.whole(Map.of("lanes", 2, "marginFindings", "decoder"), sim.clock(), sim.lane(0), sim.lane(1));
        assertTrue(quiet.of("margin-low").isEmpty(), quiet.of("margin-low").toString());
        for (int l = 0; l < 2; l++) {
            assertEquals(r.lanes.get(l).flagged, quiet.lanes.get(l).flagged, "lane " + l + ": flags differ");
        }
        assertEquals(r.reportNumber("lane", "0", "flagged"), quiet.reportNumber("lane", "0", "flagged"));
    }

    /**
     * Edge-aligned data (transitions at the clock edges) with lane skew 0.12 UI: with
     * alignment = edge the nominal point is half a UI after the edge, and autoPhase must put the
     * sample point in the middle of the window, 0.12 UI later, reporting that phase; all bits right.
     */
    @Test
    void autoPhaseFindsTheEyeCentre() {
        double ui = 1e15 / 6e8;
        LinkSim sim = LinkSim.ddr(ui, 12000, 2);
        sim.edgeAligned = true;
        sim.skewFs[0] = 0.12 * ui;
        sim.skewFs[1] = 0.12 * ui;
        sim.dataRjFs = 0.01 * ui;
        sim.build();
        Run r = Run.whole(Map.of("lanes", 2, "alignment", "edge", "autoPhase", true), sim.clock(), sim.lane(0), sim.lane(1));
        Annotation eye = r.of("eye-centre").get(0);
        assertEquals(0.12, eye.fields().get("phaseUI").asDouble(), 0.01);
        assertEquals(0.12, r.reportNumber("phase", "phaseUI"), 0.01);
        assertEquals(0.12, r.reportNumber("perLane", "centreUI"), 0.01);
        for (int l = 0; l < 2; l++) {
            Run.Lane lane = r.lanes.get(l);
            for (int k = 0; k < sim.bits; k++) {
                assertEquals(sim.data[l][k], lane.values.get(k));
                assertFalse(lane.flagged.get(k));
                long s = lane.times.get(k);
                assertEquals(sim.clockT[k] + 0.62 * ui, s, 0.01 * ui);
            }
        }
        assertTrue(r.of("eye-closed").isEmpty());
    }

    /** Single-edge modes: UI = period; a bit per rising (or falling) edge, edge indices count both edges. */
    @Test
    void risingAndFallingModes() {
        double ui = 1e15 / 2e8;
        // an SDR link: one bit per period P = UI; use the DDR simulator at twice the rate and keep even bits
        LinkSim sim = LinkSim.ddr(ui / 2, 4000, 1);
        sim.build();
        Run rise = Run.whole(Map.of("mode", "rising", "phase", "0ps"), sim.clock(), sim.lane(0));
        Run fall = Run.whole(Map.of("mode", "falling"), sim.clock(), sim.lane(0));
        assertEquals(2000, rise.lanes.get(0).size());
        assertEquals(2000, fall.lanes.get(0).size());
        for (int i = 0; i < 2000; i++) {
            assertEquals(sim.data[0][2 * i], rise.lanes.get(0).values.get(i));
            assertEquals(2 * i, rise.lanes.get(0).edge.get(i));
            assertFalse(rise.lanes.get(0).falling.get(i));
            assertEquals(sim.data[0][2 * i + 1], fall.lanes.get(0).values.get(i));
            assertTrue(fall.lanes.get(0).falling.get(i), "bit " + i + " " + fall.lanes.get(0).blockSizes);
        }
        assertEquals(ui, rise.blocks.get(0).get(0).unitIntervalFs(), 1);
    }

    /** An absolute phase in picoseconds moves the sample point exactly; a phase in UI scales with the clock. */
    @Test
    void fixedPhaseInPsAndUi() {
        double ui = 2_000_000;
        LinkSim sim = LinkSim.ddr(ui, 2000, 1);
        sim.build();
        Run ps = Run.whole(Map.of("phase", "150ps"), sim.clock(), sim.lane(0));
        Run u = Run.whole(Map.of("phase", "-0.1UI"), sim.clock(), sim.lane(0));
        for (int k = 0; k < 2000; k++) {
            assertEquals(sim.clockT[k] + 150_000, ps.lanes.get(0).times.get(k));
            assertEquals(sim.clockT[k] - 200_000, u.lanes.get(0).times.get(k), 2);
            if (sim.changesAt(0, k)) {
                assertEquals(1_150_000, ps.lanes.get(0).setup.get(k));
                assertEquals(800_000, u.lanes.get(0).setup.get(k), 2);
            }
        }
    }

    /** Runt pulses on the clock are ignored and annotated; bits and edge numbers stay as without them. */
    @Test
    void clockGlitchesAreIgnored() {
        double ui = 1e15 / 4e8;
        LinkSim sim = LinkSim.ddr(ui, 6000, 1);
        sim.build();
        long[] t = sim.clockT;
        long[] withGlitches = Arrays.copyOf(t, t.length + 20);
        for (int g = 0; g < 10; g++) {
            long at = t[500 * g + 100] + (long) (0.3 * ui); // inside a clock half-period
            withGlitches[t.length + 2 * g] = at;
            withGlitches[t.length + 2 * g + 1] = at + (long) (0.05 * ui);
        }
        Arrays.sort(withGlitches);
        Run r = Run.whole(Map.of(), org.lanesift.data.Edges.of("CLK", 0, sim.endFs, false, withGlitches), sim.lane(0));
        assertEquals(10, r.of("clock-glitch").size());
        Run.Lane lane = r.lanes.get(0);
        assertEquals(6000, lane.size());
        for (int k = 0; k < 6000; k++) {
            assertEquals(sim.data[0][k], lane.values.get(k));
            assertEquals(k, lane.edge.get(k));
        }
        assertEquals(10, r.reportNumber(null, "glitches"));
    }

    /**
     * The clock stops for 20 periods and restarts: a dropout and a restart are annotated, no bit is
     * sampled inside the gap, the bits either side are right, and edge numbers go on counting the
     * edges seen (the missing ones are not invented).
     */
    @Test
    void clockDropoutAndRestart() {
        double ui = 1e15 / 3e8;
        LinkSim sim = LinkSim.ddr(ui, 8000, 1);
        sim.build();
        int gapFrom = 3000;
        int gapTo = 3040; // 40 edges = 20 periods missing
        long[] t = new long[sim.bits - (gapTo - gapFrom)];
        int n = 0;
        for (int k = 0; k < sim.bits; k++) {
            if (k < gapFrom || k >= gapTo) {
                t[n++] = sim.clockT[k];
            }
        }
        Run r = Run.whole(Map.of(), org.lanesift.data.Edges.of("CLK", 0, sim.endFs, false, t), sim.lane(0));
        List<Annotation> drop = r.of("clock-dropout");
        assertEquals(1, drop.size());
        assertEquals(sim.clockT[gapFrom - 1], drop.get(0).startFs());
        assertEquals(sim.clockT[gapTo], drop.get(0).endFs());
        assertEquals(1, r.of("clock-restart").size());
        Run.Lane lane = r.lanes.get(0);
        assertEquals(sim.bits - 40, lane.size());
        for (int i = 0; i < lane.size(); i++) {
            int k = i < gapFrom ? i : i + 40;
            assertEquals(sim.data[0][k], lane.values.get(i), "bit " + k);
            assertEquals(i, lane.edge.get(i));
            long s = lane.times.get(i);
            assertFalse(s > sim.clockT[gapFrom - 1] && s < sim.clockT[gapTo], "bit inside the gap");
        }
        assertEquals(1, r.reportNumber(null, "dropouts"));
        assertEquals(1, r.reportNumber(null, "restarts"));
        // the bits name the dropout finding (once, on the first block made after it) for the decoders downstream
        List<org.lanesift.data.FindingRef> refs = r.blocks.get(0).stream().flatMap(b -> b.causes().stream()).toList();
        assertEquals(List.of(new org.lanesift.data.FindingRef("dut", "clock-dropout", drop.get(0).startFs(),
                org.lanesift.data.FindingRef.Effect.CLOCK_BREAK, drop.get(0).startFs(), drop.get(0).endFs())), refs);
        // no later than the first block holding bits after the gap, so a decoder knows it when it meets the break
        List<org.lanesift.data.BitStream> blocks = r.blocks.get(0);
        int namedAt = -1;
        int afterAt = -1;
        for (int i = blocks.size() - 1; i >= 0; i--) {
            org.lanesift.data.BitStream b = blocks.get(i);
            namedAt = b.causes().isEmpty() ? namedAt : i;
            afterAt = b.count() > 0 && b.timesFs()[b.count() - 1] > sim.clockT[gapTo] ? i : afterAt;
        }
        assertTrue(namedAt >= 0 && namedAt <= afterAt, "named in block " + namedAt + ", first bits after the gap in block " + afterAt);

        // a shorter gap (3 periods) that a sampler is told to tolerate (dropoutPeriods 5): no dropout
        // finding, and its bits name none
        long[] t3 = new long[sim.bits - 4];
        n = 0;
        for (int k = 0; k < sim.bits; k++) {
            if (k < gapFrom || k >= gapFrom + 4) {
                t3[n++] = sim.clockT[k];
            }
        }
        org.lanesift.data.Edges clock3 = org.lanesift.data.Edges.of("CLK", 0, sim.endFs, false, t3);
        assertEquals(1, Run.whole(Map.of(), clock3, sim.lane(0)).of("clock-dropout").size(), "a dropout by default");
        Run tolerant = Run.whole(Map.of("dropoutPeriods", 5.0), clock3, sim.lane(0));
        assertEquals(List.of(), tolerant.of("clock-dropout"));
        assertEquals(List.of(), tolerant.blocks.get(0).stream().flatMap(b -> b.causes().stream()).toList());
    }

    /** A clock lane that never toggles gives an error annotation and no bits, not a crash or invented bits. */
    @Test
    void absentClock() {
        LinkSim sim = LinkSim.ddr(1e6, 500, 1).build();
        Run r = Run.whole(Map.of(), org.lanesift.data.Edges.of("CLK", 0, sim.endFs, false), sim.lane(0));
        assertEquals(0, r.lanes.get(0).size());
        assertEquals(1, r.of("clock-absent").size());
        assertEquals(org.lanesift.annotation.Severity.ERROR, r.of("clock-absent").get(0).severity());
        assertEquals(0, r.reportNumber(null, "acceptedEdges"));
    }

    /** Bits sampled inside an unknown span of a lane are flagged; margins next to it count its edges as transitions. */
    @Test
    void unknownSpanFlagsBits() {
        double ui = 1e6;
        LinkSim sim = LinkSim.ddr(ui, 1000, 1).build();
        org.lanesift.data.Edges d = sim.lane(0);
        long a = sim.clockT[400] - 300_000;
        long b = sim.clockT[410] + 100_000;
        // producers leave out transitions inside unknown spans; a level change across it shows at its end
        long[] all = Arrays.copyOf(d.timesFs(), d.count());
        long[] kept = Arrays.stream(all).filter(x -> x < a || x >= b).toArray();
        long removed = all.length - kept.length;
        if ((removed & 1) == 1) {
            kept = java.util.stream.LongStream.concat(Arrays.stream(kept), java.util.stream.LongStream.of(b)).sorted().toArray();
        }
        boolean init = d.initialLevel();
        org.lanesift.data.Edges withSpan = new org.lanesift.data.Edges("D0", d.startFs(), d.endFs(), init, kept, kept.length,
                new long[] {a, b}, 1);
        Run r = Run.whole(Map.of(), sim.clock(), withSpan);
        Run.Lane lane = r.lanes.get(0);
        for (int k = 400; k <= 410; k++) {
            assertTrue(lane.flagged.get(k), "bit " + k + " in the unknown span");
            assertEquals(U, lane.setup.get(k));
        }
        // bit 411 is sampled 0.9 UI after the span's end: setup is at most that
        assertTrue(lane.setup.get(411) <= 900_000);
        assertEquals(11, r.reportNumber(null, "unknownSamples"));
        // bit 399 is sampled 0.7 UI before the span starts: hold is at most that
        assertTrue(lane.hold.get(399) <= 700_000);
        for (int k = 0; k < 1000; k++) {
            if (k < 400 || k > 410) {
                assertEquals(sim.data[0][k], lane.values.get(k), "bit " + k);
            }
        }
    }
}
