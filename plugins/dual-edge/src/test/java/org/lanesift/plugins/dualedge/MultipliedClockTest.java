package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.data.BitStream;
import org.lanesift.data.Edges;

/**
 * The 7:1 multiplied-clock mode against synthetic pixel links whose slot 0 is known. The clock
 * pattern (high in slots 0-1 and 5-6, low in 2-4) is the one of docs/reference-facts.md#pixel-link-clock-and-slot-mappings (JEIDA-59-1999,
 * Open LVDS Display Interface 0.95 and VESA Notebook Panel Standard 2007 as tabulated there).
 */
class MultipliedClockTest {
    static final long U = BitStream.UNKNOWN_MARGIN;
    static final Map<String, Object> SEVEN = Map.of("mode", "multiplied", "lanes", 4);

    /**
     * Worked by hand. A 50 MHz pixel clock: period P = 20 ns = 20,000,000 fs; seven slots give
     * UI = 20 ns / 7 = 2857.142857 ps. The rising clock edge starts slot 5 of the previous pixel, so
     * slot 0 starts 2 UI = 5714.286 ps after it and its centre is 2.5 UI = 7142.857 ps after it; slot j's
     * centre is (2.5 + j) UI after it (slot 6: 8.5 UI = 24285.714 ps, i.e. 1.5 UI after the next rising
     * edge). Lane 2 is delayed by 300 ps: setup = UI/2 - 300 ps = 1428.571 - 300 = 1128.571 ps and
     * hold = 1428.571 + 300 = 1728.571 ps; the other lanes have 1428.571 ps both sides. The flag
     * threshold is 0.15 UI = 428.571 ps, so nothing is flagged. The duty cycle is 4/7 = 0.5714.
     */
    @Test
    void handWorkedSlotZeroAndMargins() {
        double p = 20_000_000;
        double ui = p / 7;
        LinkSim sim = LinkSim.sevenToOne(p, 600, 4);
        sim.skewFs[2] = 300_000;
        sim.build();
        Run r = Run.whole(SEVEN, sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2), sim.lane(3));
        assertEquals(1, r.of("clock-pattern").size());
        assertTrue(r.of("clock-inverted").isEmpty());
        int pixels = 599; // pixel 0 has no rising edge before it: it is partial and not made
        for (int l = 0; l < 4; l++) {
            Run.Lane lane = r.lanes.get(l);
            assertEquals(7 * pixels, lane.size(), "lane " + l);
            double expSetup = l == 2 ? 1_128_571.4 : 1_428_571.4;
            double expHold = l == 2 ? 1_728_571.4 : 1_428_571.4;
            for (int i = 0; i < lane.size(); i++) {
                int k = i / 7;
                int j = i % 7;
                int bit = 7 * (k + 1) + j; // generator slot index
                assertEquals(sim.data[l][bit], lane.values.get(i), "lane " + l + " pixel " + k + " slot " + j);
                assertEquals(j, lane.slot.get(i));
                assertEquals(k, lane.edge.get(i), "every slot of a pixel has the rising edge's number");
                long rise = sim.clockT[2 * k + 1];
                assertEquals(rise + (2.5 + j) * ui, lane.times.get(i), 2, "slot centre");
                assertFalse(lane.flagged.get(i));
                if (sim.changesAt(l, bit)) {
                    assertEquals(expSetup, lane.setup.get(i), 0.01 * ui);
                }
                if (bit + 1 < sim.bits && sim.changesAt(l, bit + 1)) {
                    assertEquals(expHold, lane.hold.get(i), 0.01 * ui);
                }
            }
            assertEquals(r.lanes.get(0).edge, lane.edge, "same clock edge numbers on every lane");
        }
        assertEquals(4.0 / 7, r.reportNumber("duty", "mean"), 1e-6);
        assertTrue(org.lanesift.testkit.JsonScan.members(org.lanesift.testkit.JsonScan.parse("report", r.report)).stream()
                .anyMatch(m -> m.value().isString() && m.value().asString().contains("slot 0 starts 2/7 period after each rising edge")),
                r.report);
        assertEquals(599, r.reportNumber(null, "pixels"));
        assertEquals(ui, r.blocks.get(0).get(0).unitIntervalFs(), 1);
    }

    /** An inverted clock lane (3/7 high) is recognised, annotated and decoded to the same bits. */
    @Test
    void invertedClockIsHandled() {
        LinkSim a = LinkSim.sevenToOne(15_384_615, 300, 4);
        a.build();
        LinkSim b = LinkSim.sevenToOne(15_384_615, 300, 4);
        b.invertClock = true;
        b.build();
        Run ra = Run.whole(SEVEN, a.clock(), a.lane(0), a.lane(1), a.lane(2), a.lane(3));
        Run rb = Run.whole(SEVEN, b.clock(), b.lane(0), b.lane(1), b.lane(2), b.lane(3));
        assertEquals(1, rb.of("clock-inverted").size());
        assertTrue(rb.of("clock-pattern").isEmpty());
        assertEquals(3.0 / 7, rb.reportNumber(null, "atAcquisition"), 1e-6);
        assertTrue(org.lanesift.testkit.JsonScan.first(org.lanesift.testkit.JsonScan.parse("report", rb.report), "inverted")
                .value().asBoolean(), rb.report);
        for (int l = 0; l < 4; l++) {
            Run.Lane x = ra.lanes.get(l);
            Run.Lane y = rb.lanes.get(l);
            assertEquals(x.values, y.values);
            assertEquals(x.edge, y.edge);
            assertEquals(x.slot, y.slot);
            assertEquals(x.times, y.times);
            assertEquals(x.setup, y.setup);
            assertTrue(y.falling.stream().allMatch(f -> f), "reference edges are falling edges of the inverted lane");
        }
    }

    /**
     * Gaussian jitter on data (0.03 UI) and clock (0.01 UI), sinusoidal jitter on the data (0.05 UI),
     * duty distortion (0.54 instead of 4/7, moving only the falling edge, which slot placement does not
     * use) and skew: zero bit errors, and every margin within 1 % of a UI of its analytic value: the
     * sample point is the documented interpolation between the generator's own rising edges,
     * s = r(k) + f * (r(k+1) - r(k)) for slot positions f = (2.5 + j) / 7 below one period, and
     * r(k+1) + (f - 1) * (r(k+1) - r(k)) beyond.
     */
    @Test
    void jitterZeroErrorsAnalyticMargins() {
        double p = 1e15 / 85e6;
        double ui = p / 7;
        LinkSim sim = LinkSim.sevenToOne(p, 3000, 4);
        sim.dataRjFs = 0.03 * ui;
        sim.clockRjFs = 0.01 * ui;
        sim.sjAmpFs = 0.05 * ui;
        sim.sjFreqHz = 85e6 * 7 / 731.3;
        sim.duty = 0.54;
        sim.skewFs[0] = 0.08 * ui;
        sim.skewFs[1] = -0.06 * ui;
        sim.seed = 5;
        sim.build();
        Run r = Run.whole(SEVEN, sim.clock(), sim.lane(0), sim.lane(1), sim.lane(2), sim.lane(3));
        assertEquals(0.54, r.reportNumber("duty", "mean"), 0.005);
        for (int l = 0; l < 4; l++) {
            Run.Lane lane = r.lanes.get(l);
            assertEquals(7 * 2999, lane.size());
            for (int i = 0; i < lane.size(); i++) {
                int k = i / 7;
                int j = i % 7;
                int bit = 7 * (k + 1) + j;
                assertEquals(sim.data[l][bit], lane.values.get(i), "bit error lane " + l + " pixel " + k + " slot " + j);
                long r0 = sim.clockT[2 * k + 1];
                long r1 = sim.clockT[2 * k + 3];
                double f = (2.5 + j) / 7;
                double s = f < 1 ? r0 + f * (r1 - r0) : r1 + (f - 1) * (r1 - r0);
                assertEquals(s, lane.times.get(i), 2);
                long si = lane.times.get(i);
                long es = sim.changesAt(l, bit) ? si - sim.boundary[l][bit] : U;
                long eh = bit + 1 < sim.bits && sim.changesAt(l, bit + 1) ? sim.boundary[l][bit + 1] - si : U;
                DdrSamplingTest.assertMargin(es, lane.setup.get(i), ui, "setup");
                DdrSamplingTest.assertMargin(eh, lane.hold.get(i), ui, "hold");
            }
        }
    }

    /**
     * The pixel clock stops for 12 pixels: pixels whose slots reach into the gap are not made (no
     * bits invented), slot 0 is found again after the restart, and clock edge numbers go on counting.
     */
    @Test
    void dropoutDropsOnlyTheBrokenPixels() {
        double p = 1e15 / 40e6;
        LinkSim sim = LinkSim.sevenToOne(p, 800, 1);
        sim.build();
        // remove the clock edges of pixels 300..311 (fall at slot 2, rise at slot 5)
        long[] t = new long[sim.clockT.length - 24];
        int n = 0;
        for (int e = 0; e < sim.clockT.length; e++) {
            int pix = e / 2;
            if (pix < 300 || pix >= 312) {
                t[n++] = sim.clockT[e];
            }
        }
        Run r = Run.whole(Map.of("mode", "multiplied"), Edges.of("CLK", 0, sim.endFs, true, t), sim.lane(0));
        assertEquals(1, r.of("clock-dropout").size());
        assertEquals(1, r.of("clock-restart").size());
        long gapStart = sim.clockT[2 * 299 + 1];
        long gapEnd = sim.clockT[2 * 312];
        Run.Lane lane = r.lanes.get(0);
        // Rising edge i starts slot 5 of generator pixel i and is numbered i up to 299, the last one
        // before the gap. The pixel of edges 297 -> 298 is generator pixel 298. Generator pixel 299
        // (edges 298 -> 299) would need its slots 5 and 6 after edge 299, where the clock stopped:
        // it is dropped. After the gap the clock restarts with pixel 312's falling edge; rising edge
        // 312 is number 300 and starts the first whole pixel again, generator pixel 313.
        int before = 298;
        int after = 800 - 313;
        assertEquals(7 * (before + after), lane.size());
        for (int i = 0; i < lane.size(); i++) {
            int k = i / 7;
            int j = i % 7;
            int pixel = k < before ? k + 1 : 313 + (k - before);
            long edge = k < before ? k : 300 + (k - before);
            assertEquals(sim.data[0][7 * pixel + j], lane.values.get(i), "pixel " + pixel + " slot " + j);
            assertEquals(edge, lane.edge.get(i), "pixel " + pixel);
            assertEquals(j, lane.slot.get(i));
            long s = lane.times.get(i);
            assertFalse(s > gapStart && s < gapEnd, "sample inside the gap");
        }
        assertEquals(1, r.reportNumber(null, "pixelsDroppedAtDropouts"));
    }

    /** A clock whose duty is neither 4/7 nor 3/7 is used but reported as unexpected. */
    @Test
    void unexpectedDutyIsReported() {
        LinkSim sim = LinkSim.sevenToOne(1e15 / 30e6, 200, 1);
        sim.duty = 0.5;
        sim.build();
        Run r = Run.whole(Map.of("mode", "multiplied"), sim.clock(), sim.lane(0));
        assertEquals(1, r.of("clock-duty-unexpected").size());
        for (int i = 0; i < r.lanes.get(0).size(); i++) {
            assertEquals(sim.data[0][7 + i], r.lanes.get(0).values.get(i));
        }
    }

    /** autoPhase in multiplied mode finds a skew of 0.2 UI relative to the slot centres. */
    @Test
    void autoPhaseOnSlots() {
        double p = 1e15 / 65e6;
        double ui = p / 7;
        LinkSim sim = LinkSim.sevenToOne(p, 2000, 2);
        sim.skewFs[0] = 0.2 * ui;
        sim.skewFs[1] = 0.2 * ui;
        sim.build();
        Run r = Run.whole(Map.of("mode", "multiplied", "lanes", 2, "autoPhase", true), sim.clock(), sim.lane(0), sim.lane(1));
        assertEquals(0.2, r.of("eye-centre").get(0).fields().get("phaseUI").asDouble(), 0.01);
        Run.Lane lane = r.lanes.get(0);
        for (int i = 0; i < lane.size(); i++) {
            if (sim.changesAt(0, 7 + i)) {
                assertEquals(0.5 * ui, lane.setup.get(i), 0.01 * ui);
            }
        }
    }
}
