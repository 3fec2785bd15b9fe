package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Edges;
import org.lanesift.testkit.Synth;

/**
 * Clock lanes with unknown spans. By the edge-list convention (host-api {@code Edges}) a producer
 * emits no transition inside an unknown span and, when the level after the span differs from the one
 * before it, places one level-restoring transition exactly at the span's end; a capture that starts
 * unknown starts low (the differential stage's convention). Such a transition tells the level, not
 * the time of a clock edge, and neither does the transition the sampler itself places at the start
 * of a block whose level jumped after a gap. None of them may count as a clock edge: not for the
 * period, not for dropouts, not for bits. The clocks here are testkit {@code Synth.clock} clocks
 * whose edge times are exact to the femtosecond, so every expected edge, bit and period is known.
 */
class UnknownClockSpanTest {
    static final double P = 50_000_000; // 20 MHz clock, 50 ns

    /**
     * A clock lane that idles high before its first cycle, seen by a capture whose first part is
     * unknown: the capture starts low, the restoring rising transition comes at the span's end
     * {@code s}, and the clock's first true edge is its first falling edge, 1.25 periods later
     * (the idle time). The first true rising edge comes 1.68 periods after {@code s}: taking the
     * restoring transition for a rising edge makes that look like a dropout.
     *
     * @param duty   high fraction of the running clock
     * @param cycles clock cycles (the first cycle's rising edge is replaced by the idle-high start)
     * @return index 0: the clock as the sampler gets it; index 1: the true clock edges (index 0 unused)
     */
    static Object[] idleHighBehindUnknown(double duty, int cycles) {
        long firstRise = Math.round(2 * P);
        Edges truth = Synth.clock("CLK", P, duty, firstRise, cycles);
        long[] t = Arrays.copyOf(truth.timesFs(), truth.count());
        long s = t[1] - Math.round(1.25 * P);
        long[] seen = t.clone();
        seen[0] = s; // the restoring transition: the level is high from the span's end on
        Edges clock = new Edges("CLK", 0, truth.endFs(), false, seen, seen.length, new long[] {0, s}, 1);
        return new Object[] {clock, t};
    }

    /** Data for DDR: bit k is centred on true clock edge k (UI = P / 2), random bits. */
    static boolean[] ddrBits(int n) {
        return Synth.randomBits(n, 11);
    }

    static Edges ddrLane(boolean[] bits) {
        long firstRise = Math.round(2 * P);
        return Synth.nrz("D0", bits, firstRise - Math.round(P / 4), P / 2, false);
    }

    @Test
    void restoringTransitionAtTheCaptureStartIsNoClockEdgeDdr() {
        int cycles = 200;
        Object[] in = idleHighBehindUnknown(0.5, cycles);
        Edges clock = (Edges) in[0];
        long[] t = (long[]) in[1];
        boolean[] bits = ddrBits(2 * cycles);
        Run r = Run.whole(Map.of(), clock, ddrLane(bits));
        assertEquals(List.of(), r.of("clock-dropout"), "no dropout at the start");
        assertEquals(List.of(), r.of("clock-restart"));
        assertEquals(List.of(), r.of("clock-glitch"));
        List<Annotation> acq = r.of("clock-acquired");
        assertEquals(1, acq.size());
        assertEquals(t[1], acq.get(0).startFs(), "the clock is acquired at its first true edge");
        assertEquals(0, r.reportNumber(null, "dropouts"));
        // every same-direction interval of the true edges is one period (rounding: 1 fs)
        assertEquals(P, r.reportNumber("periodFs", "min"), 1);
        assertEquals(P, r.reportNumber("periodFs", "max"), 1);
        assertEquals(0.5, r.reportNumber("duty", "min"), 1e-6);
        // one bit per true edge, numbered from the first true edge
        Run.Lane lane = r.lanes.get(0);
        assertEquals(2 * cycles - 1, lane.size());
        for (int i = 0; i < lane.size(); i++) {
            assertEquals(t[i + 1], lane.times.get(i), "bit " + i + " at true edge " + (i + 1));
            assertEquals(bits[i + 1], lane.values.get(i), "bit " + i);
            assertEquals(i, lane.edge.get(i));
        }
    }

    /**
     * The same start on a 7:1 link (duty 4/7, the pattern of docs/reference-facts.md#pixel-link-clock-and-slot-mappings): pixel c lies
     * between true rising edges c and c+1, slot 0 starting 2/7 period after edge c; the first true
     * rising edge is edge 1, so pixels 1 .. cycles-2 are made and numbered from 0.
     */
    @Test
    void restoringTransitionAtTheCaptureStartIsNoClockEdgeMultiplied() {
        int cycles = 120;
        Object[] in = idleHighBehindUnknown(4.0 / 7, cycles);
        Edges clock = (Edges) in[0];
        long[] t = (long[]) in[1];
        boolean[] bits = Synth.randomBits(7 * cycles, 12);
        Edges lane0 = Synth.nrz("D0", bits, t[0] + Math.round(2 * P / 7), P / 7, false);
        Run r = Run.whole(Map.of("mode", "multiplied"), clock, lane0);
        assertEquals(List.of(), r.of("clock-dropout"), "no dropout at the start");
        assertEquals(List.of(), r.of("clock-restart"));
        assertEquals(1, r.of("clock-pattern").size());
        assertEquals(t[1], r.of("clock-acquired").get(0).startFs());
        assertEquals(P, r.reportNumber("periodFs", "min"), 1);
        assertEquals(P, r.reportNumber("periodFs", "max"), 1);
        assertEquals(0, r.reportNumber(null, "pixelsDroppedAtDropouts"));
        Run.Lane lane = r.lanes.get(0);
        assertEquals(7 * (cycles - 2), lane.size());
        for (int i = 0; i < lane.size(); i++) {
            int c = i / 7 + 1;
            int j = i % 7;
            assertEquals(bits[7 * c + j], lane.values.get(i), "pixel " + c + " slot " + j);
            assertEquals(c - 1, lane.edge.get(i));
            assertEquals(j, lane.slot.get(i));
        }
    }

    /**
     * A real dropout right after the unknown start is still found: four true edges, then the clock
     * stops for 20 periods (40 edges missing), then runs again. Exactly one dropout, from the last
     * true edge before the gap to the first after it, and one restart there.
     */
    @Test
    void realDropoutRightAfterTheUnknownStartIsReported() {
        int cycles = 200;
        Object[] in = idleHighBehindUnknown(0.5, cycles);
        Edges full = (Edges) in[0];
        long[] t = (long[]) in[1];
        int gapFrom = 5;
        int gapTo = 45;
        long[] seen = new long[full.count() - (gapTo - gapFrom)];
        int n = 0;
        for (int k = 0; k < full.count(); k++) {
            if (k < gapFrom || k >= gapTo) {
                seen[n++] = full.timesFs()[k];
            }
        }
        Edges clock = new Edges("CLK", 0, full.endFs(), false, seen, n, new long[] {0, seen[0]}, 1);
        boolean[] bits = ddrBits(2 * cycles);
        Run r = Run.whole(Map.of(), clock, ddrLane(bits));
        List<Annotation> drop = r.of("clock-dropout");
        assertEquals(1, drop.size(), drop.toString());
        assertEquals(t[gapFrom - 1], drop.get(0).startFs());
        assertEquals(t[gapTo], drop.get(0).endFs());
        assertEquals(20.5, drop.get(0).fields().get("periods").asDouble(), 1e-4);
        List<Annotation> restart = r.of("clock-restart");
        assertEquals(1, restart.size());
        assertEquals(t[gapTo], restart.get(0).startFs());
        assertEquals(t[1], r.of("clock-acquired").get(0).startFs());
        Run.Lane lane = r.lanes.get(0);
        assertEquals((gapFrom - 1) + (2 * cycles - gapTo), lane.size());
        for (int i = 0; i < lane.size(); i++) {
            int k = i < gapFrom - 1 ? i + 1 : i + 1 + (gapTo - gapFrom);
            assertEquals(t[k], lane.times.get(i), "bit " + i);
            assertEquals(bits[k], lane.values.get(i), "bit " + i);
            assertEquals(i, lane.edge.get(i));
        }
    }

    /**
     * An unknown span in the middle of a running DDR clock hides edges 200..206 (an odd number, so
     * the level comes back changed) and ends 0.1 period before true edge 207, where the restoring
     * transition sits. The clock is unknown for 4 periods, longer than the dropout limit: one dropout
     * from true edge 199 to true edge 207 and a restart at 207; the restoring transition is neither a
     * clock edge nor half of a glitch with edge 207.
     */
    @Test
    void unknownSpanInsideTheClockEndsAtATrueEdge() {
        int cycles = 300;
        long firstRise = Math.round(2 * P);
        Edges truth = Synth.clock("CLK", P, 0.5, firstRise, cycles);
        long[] t = Arrays.copyOf(truth.timesFs(), truth.count());
        long a = t[199] + Math.round(0.1 * P);
        long b = t[207] - Math.round(0.1 * P);
        Edges clock = hide(truth, a, b);
        boolean[] bits = ddrBits(2 * cycles);
        Run r = Run.whole(Map.of(), clock, ddrLane(bits));
        checkHiddenSpan(r, t, bits, 199, 207);
    }

    /**
     * The same through the block boundary: the clock arrives as two blocks with a gap between them
     * (edges 200..206 fall into it), and the second block starts at the level the clock has there,
     * not the one the first block ended with. The sampler marks the gap unknown and places a
     * transition at the second block's start; that transition is no clock edge either.
     */
    @Test
    void levelJumpAtABlockStartAfterAGapIsNoClockEdge() {
        int cycles = 300;
        long firstRise = Math.round(2 * P);
        Edges truth = Synth.clock("CLK", P, 0.5, firstRise, cycles);
        long[] t = Arrays.copyOf(truth.timesFs(), truth.count());
        long g0 = t[199] + Math.round(0.1 * P);
        long g1 = t[207] - Math.round(0.1 * P);
        List<Edges> parts = Synth.split(truth, g0, g1);
        Edges second = parts.get(2);
        assertFalse(second.initialLevel() == parts.get(0).finalLevel(), "the level after the gap differs");
        boolean[] bits = ddrBits(2 * cycles);
        Edges lane = ddrLane(bits);
        try (var h = org.lanesift.testkit.StageHarness.of(new DualEdgePlugin(), Map.of())) {
            h.push("clock", parts.get(0));
            h.push("clock", second);
            h.push("lane0", lane);
            h.finish();
            List<Annotation> glitches = h.annotations("clock-glitch");
            assertEquals(List.of(), glitches);
            List<Annotation> drop = h.annotations("clock-dropout");
            assertEquals(1, drop.size(), drop.toString());
            assertEquals(t[199], drop.get(0).startFs());
            assertEquals(t[207], drop.get(0).endFs());
            long[] times = h.outputs("bits0", org.lanesift.data.BitStream.class).stream()
                    .flatMapToLong(bs -> Arrays.stream(bs.timesFs(), 0, bs.count())).toArray();
            for (long s : times) {
                assertFalse(s == g1, "a bit at the sampler's own level-jump transition");
            }
            assertEquals(2 * cycles - 7, times.length, "one bit per true edge outside the gap");
        }
    }

    /** The outcome must not depend on where the clock was cut, also right at the span's end. */
    @Test
    void independentOfCutsAroundTheSpan() {
        int cycles = 300;
        long firstRise = Math.round(2 * P);
        Edges truth = Synth.clock("CLK", P, 0.5, firstRise, cycles);
        long[] t = Arrays.copyOf(truth.timesFs(), truth.count());
        long a = t[199] + Math.round(0.1 * P);
        long b = t[207] - Math.round(0.1 * P);
        Edges clock = hide(truth, a, b);
        Edges lane = ddrLane(ddrBits(2 * cycles));
        Run whole = Run.whole(Map.of(), clock, lane);
        long[][] cutSets = {{b}, {b + 1}, {b - 1, b, t[207]}, {a, b}, {t[207] + 1}, {a + 1, t[207]}};
        for (long[] cuts : cutSets) {
            List<List<Edges>> pieces = List.of(Run.cut(clock, cuts), List.of(lane));
            int[] order = new int[pieces.get(0).size() + 1];
            order[order.length - 1] = 1;
            Run split = Run.pieces(Map.of(), pieces, order);
            assertEquals(SplitInvarianceTest.outcome(whole), SplitInvarianceTest.outcome(split), Arrays.toString(cuts));
        }
        // the leading span too, cut right at its end
        Object[] in = idleHighBehindUnknown(0.5, 200);
        Edges c2 = (Edges) in[0];
        long s = c2.timesFs()[0];
        Edges l2 = ddrLane(ddrBits(400));
        Run w2 = Run.whole(Map.of(), c2, l2);
        for (long[] cuts : new long[][] {{s}, {s + 1}, {s - 1, s}}) {
            List<List<Edges>> pieces = List.of(Run.cut(c2, cuts), List.of(l2));
            int[] order = new int[pieces.get(0).size() + 1];
            order[order.length - 1] = 1;
            assertEquals(SplitInvarianceTest.outcome(w2), SplitInvarianceTest.outcome(Run.pieces(Map.of(), pieces, order)),
                    Arrays.toString(cuts));
        }
    }

    /** Bits at true edges outside the hidden ones, one dropout from the last edge before to the first after. */
    static void checkHiddenSpan(Run r, long[] t, boolean[] bits, int lastBefore, int firstAfter) {
        assertEquals(List.of(), r.of("clock-glitch"), "the restoring transition is not half of a glitch");
        List<Annotation> drop = r.of("clock-dropout");
        assertEquals(1, drop.size(), drop.toString());
        assertEquals(t[lastBefore], drop.get(0).startFs());
        assertEquals(t[firstAfter], drop.get(0).endFs());
        List<Annotation> restart = r.of("clock-restart");
        assertEquals(1, restart.size());
        assertEquals(t[firstAfter], restart.get(0).startFs());
        Run.Lane lane = r.lanes.get(0);
        int hidden = firstAfter - lastBefore - 1;
        assertEquals(t.length - hidden, lane.size());
        for (int i = 0; i < lane.size(); i++) {
            int k = i <= lastBefore ? i : i + hidden;
            assertEquals(t[k], lane.times.get(i), "bit " + i);
            assertEquals(bits[k], lane.values.get(i), "bit " + i);
            assertEquals(i, lane.edge.get(i), "edges are numbered as seen");
        }
    }

    /**
     * The clock as a producer following the convention delivers it with {@code [a, b)} unknown: no
     * transition inside, one restoring transition at {@code b} if the level changed across it.
     */
    static Edges hide(Edges truth, long a, long b) {
        List<Long> kept = new ArrayList<>();
        int hidden = 0;
        for (int i = 0; i < truth.count(); i++) {
            long x = truth.timesFs()[i];
            if (x >= a && x < b) {
                hidden++;
            } else {
                kept.add(x);
            }
        }
        if ((hidden & 1) == 1) {
            kept.add(b);
        }
        long[] k = kept.stream().mapToLong(Long::longValue).sorted().toArray();
        return new Edges(truth.channel(), truth.startFs(), truth.endFs(), truth.initialLevel(), k, k.length, new long[] {a, b}, 1);
    }
}
