package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Edges;
import org.lanesift.plugin.InputFormatException;

/**
 * The sampler's guards against captures it cannot decode: a logic capture sampled below two
 * samples per unit interval is refused with the minimum rate, and a lane whose transitions sit
 * near the sample points (skewed by about half a UI or more against the clock) is flagged and named.
 */
class DecodableCaptureTest {
    static final Map<String, Object> SEVEN = Map.of("mode", "multiplied", "slots", 7, "lanes", 3);
    /** A 20 MHz pixel clock: UI = 50 ns / 7 = 7.142857 ns. */
    static final double PERIOD_FS = 50_000_000;

    /**
     * What a logic capture at one sample every {@code gridFs} makes of an edge list: each edge is
     * seen at the first sample after it, and a pulse between two samples is lost.
     */
    static Edges onGrid(Edges e, long gridFs) {
        long[] t = new long[e.count()];
        int n = 0;
        for (int i = 0; i < e.count(); i++) {
            long q = Math.floorDiv(e.timesFs()[i], gridFs) * gridFs + gridFs;
            if (n > 0 && t[n - 1] == q) {
                n--; // two transitions in one sample interval: the capture sees neither
            } else {
                t[n++] = q;
            }
        }
        long end = Math.floorDiv(e.endFs(), gridFs) * gridFs;
        long[] tt = Arrays.copyOf(t, n);
        int m = 0;
        while (m < n && tt[m] < end) {
            m++;
        }
        return Edges.of(e.channel(), 0, end, e.initialLevel(), Arrays.copyOf(tt, m));
    }

    static LinkSim link(double skewUi) {
        LinkSim sim = LinkSim.sevenToOne(PERIOD_FS, 400, 3);
        sim.skewFs[1] = skewUi * PERIOD_FS / 7;
        sim.build();
        return sim;
    }

    /**
     * Rule (derived in docs/sampling-rate.md): a logic capture sees every edge up to one sample
     * period late, on the clock and the data alike, so it needs Ts <= UI / 2: here at least
     * 2 / 7.142857 ns = 280 MS/s. 100 MS/s is refused, naming the lane and the minimum rate.
     */
    @Test
    void aLogicCaptureBelowTwoSamplesPerUnitIntervalIsRefusedWithTheMinimumRate() {
        LinkSim sim = link(0);
        long grid = 10_000_000; // 100 MS/s
        RuntimeException e = assertThrows(RuntimeException.class, () -> Run.whole(SEVEN, onGrid(sim.clock(), grid),
                onGrid(sim.lane(0), grid), onGrid(sim.lane(1), grid), onGrid(sim.lane(2), grid)));
        Throwable c = e;
        while (c != null && !(c instanceof InputFormatException)) {
            c = c.getCause();
        }
        assertTrue(c instanceof InputFormatException, "bad input, exit 2: " + e);
        String msg = c.getMessage();
        assertTrue(msg.contains("100 MS/s") && msg.contains("280 MS/s") && msg.contains("7.143 ns"), msg);
    }

    /**
     * An exact source (a simulation: every edge on a whole unit interval, here 1 ns) passes; the
     * same link taken at 100 MS/s, a grid of exactly 10 UI, is refused all the same.
     */
    @Test
    void edgesOnTheBitGridPassButAGridOfSeveralUnitIntervalsDoesNot() {
        LinkSim sim = LinkSim.sevenToOne(7_000_000, 400, 3); // UI exactly 1 ns, edges on whole ns
        sim.build();
        Run r = Run.whole(SEVEN, sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2));
        assertTrue(r.lanes.get(0).size() > 300 * 7);
        long grid = 10_000_000;
        RuntimeException e = assertThrows(RuntimeException.class, () -> Run.whole(SEVEN, onGrid(sim.clock(), grid),
                onGrid(sim.lane(0), grid), onGrid(sim.lane(1), grid), onGrid(sim.lane(2), grid)));
        // the 7 ns clock is itself aliased at 10 ns a sample (it shows a period of about 23 ns), so the
        // message must not state the unit interval as a fact: it states the period measured and the rule
        Throwable c = e;
        while (c != null && !(c instanceof InputFormatException)) {
            c = c.getCause();
        }
        assertTrue(c instanceof InputFormatException, String.valueOf(e));
        assertTrue(c.getMessage().contains("sample grid (100 MS/s)"), c.getMessage());
        assertFalse(c.getMessage().contains("unit interval is"), c.getMessage());
        assertTrue(c.getMessage().contains("the clock period measured on that grid is")
                && c.getMessage().contains("unit interval cannot be known from this capture")
                && c.getMessage().contains("at least 2 samples per unit interval (Ts <= UI / 2)"), c.getMessage());
    }

    /** At 400 MS/s (2.8 samples per UI) the same link decodes bit for bit, with the same grid check passed. */
    @Test
    void aLogicCaptureAboveTheMinimumRateDecodes() {
        LinkSim sim = link(0);
        long grid = 2_500_000; // 400 MS/s
        Run r = Run.whole(SEVEN, onGrid(sim.clock(), grid), onGrid(sim.lane(0), grid), onGrid(sim.lane(1), grid),
                onGrid(sim.lane(2), grid));
        for (int l = 0; l < 3; l++) {
            Run.Lane lane = r.lanes.get(l);
            assertTrue(lane.size() > 300 * 7, "bits " + lane.size());
            for (int i = 0; i < lane.size(); i++) {
                int k = (int) (7 * (lane.edge.get(i) + 1) + lane.slot.get(i)); // generator slot index (as in MultipliedClockTest)
                if (k < sim.bits) {
                    assertEquals(sim.data[l][k], lane.values.get(i), "lane " + l + " bit " + k);
                }
            }
        }
        assertTrue(r.of("lane-skew-ambiguous").isEmpty());
    }

    /**
     * The skew judgement does not depend on how the inputs were cut into blocks: the first block
     * holds the first min(searchBits, 8192) sample points however the edges arrive, and only those
     * count. A link of 14,000 bits (more than that window) with lane 1 skewed by 0.61 UI, 0.45 UI
     * (both named) or 0.2 UI (not named), pushed in 2 to 40 pieces, gives the same lane-skew findings and the same flagged
     * bits as pushed whole. (Before, the first block was whatever the first pieces made ready, and
     * in 12 pieces a lane skewed by 0.61 UI was not named.)
     */
    @ParameterizedTest
    @ValueSource(ints = {2, 3, 5, 12, 40})
    void theSkewJudgementDoesNotDependOnTheCuts(int parts) {
        for (double skewUi : new double[] {0.61, 0.45, 0.2}) {
            LinkSim sim = LinkSim.sevenToOne(PERIOD_FS, 2000, 3);
            sim.skewFs[1] = skewUi * PERIOD_FS / 7;
            sim.build();
            Edges[] in = {sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2)};
            Run whole = Run.whole(SEVEN, in[0], in[1], in[2], in[3]);
            List<List<Edges>> perInput = new java.util.ArrayList<>();
            for (Edges e : in) {
                long[] cuts = new long[parts - 1];
                for (int j = 1; j < parts; j++) {
                    cuts[j - 1] = e.startFs() + (e.endFs() - e.startFs()) / parts * j;
                }
                perInput.add(Run.cut(e, cuts));
            }
            int[] order = new int[parts * in.length];
            for (int j = 0; j < order.length; j++) {
                order[j] = j % in.length;
            }
            Run cut = Run.pieces(SEVEN, perInput, order);
            String what = parts + " pieces, skew " + skewUi + " UI";
            assertEquals(skewUi > DualEdgeStage.AMBIGUOUS_OFFSET_UI ? 1 : 0, whole.of("lane-skew-ambiguous").size(), what + ": " + whole.of("lane-skew-ambiguous"));
            assertEquals(whole.of("lane-skew-ambiguous").toString(), cut.of("lane-skew-ambiguous").toString(), what);
            for (int l = 0; l < 3; l++) {
                assertEquals(whole.lanes.get(l).flagged, cut.lanes.get(l).flagged, what + ", lane " + l);
            }
        }
    }

    /**
     * A data pair skewed 0.61 UI against the clock samples every bit one slot off with wide
     * margins; the sampler names the lane once and flags all its bits, and only its bits.
     */
    @ParameterizedTest
    @ValueSource(doubles = {0.61, -0.61, 0.45})
    void aLaneSkewedAboutHalfAUnitIntervalOrMoreIsNamedAndFlagged(double skewUi) {
        Run r = runSkewed(skewUi);
        List<Annotation> notes = r.of("lane-skew-ambiguous");
        assertEquals(1, notes.size(), notes.toString());
        assertTrue(notes.get(0).label().startsWith("D1:"), notes.get(0).label());
        assertTrue(r.of("margin-low").isEmpty(), "one finding for the lane, not margin runs besides: " + r.of("margin-low"));
        for (int l = 0; l < 3; l++) {
            Run.Lane lane = r.lanes.get(l);
            long flagged = lane.flagged.stream().filter(b -> b).count();
            if (l == 1) {
                assertEquals(lane.size(), flagged, "every bit of the skewed lane");
            } else {
                assertEquals(0, flagged, "lane " + l);
            }
        }
        // the skewed lane's blocks name the one finding behind their flags, covering every flagged bit;
        // the other lanes name none
        for (int l = 0; l < 3; l++) {
            for (org.lanesift.data.BitStream b : r.blocks.get(l)) {
                List<org.lanesift.data.FindingRef> refs = b.causes().stream()
                        .filter(x -> x.effect() == org.lanesift.data.FindingRef.Effect.FLAGGED_BITS).toList();
                if (l != 1) {
                    assertEquals(List.of(), refs, "lane " + l);
                    continue;
                }
                assertEquals(1, refs.size(), refs.toString());
                org.lanesift.data.FindingRef ref = refs.get(0);
                assertEquals("lane-skew-ambiguous", ref.kind());
                assertEquals(notes.get(0).startFs(), ref.atFs(), "refers to the finding made");
                for (int k = 0; k < b.count(); k++) {
                    assertTrue(!b.isFlagged(k) || ref.covers(b.timesFs()[k]), "bit " + k + " not covered by " + ref);
                }
            }
        }
    }

    /** Skews well inside half a UI leave the lanes alone. */
    @ParameterizedTest
    @ValueSource(doubles = {0.0, 0.2, -0.3})
    void aLaneSkewedWellInsideHalfAUnitIntervalIsNotFlagged(double skewUi) {
        Run r = runSkewed(skewUi);
        assertTrue(r.of("lane-skew-ambiguous").isEmpty());
        assertFalse(r.lanes.get(1).flagged.stream().anyMatch(b -> b) && Math.abs(skewUi) < 0.3);
    }

    private static Run runSkewed(double skewUi) {
        LinkSim sim = link(skewUi);
        return Run.whole(SEVEN, sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2));
    }
}
