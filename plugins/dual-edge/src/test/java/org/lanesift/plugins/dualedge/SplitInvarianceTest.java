package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.LongRange;
import net.jqwik.api.constraints.Size;
import org.lanesift.data.Edges;

/**
 * The output must not depend on where the inputs were cut into blocks, nor on the order in which
 * the inputs' blocks arrive: every input is cut at its own random times (testkit {@code Synth.split})
 * and the pieces are interleaved at random; bits (all fields), annotations (in order) and the report
 * must equal those of one whole block per input. The links carry jitter, a clock glitch, a clock
 * dropout and an unknown span, so every stateful path is crossed by cuts.
 */
class SplitInvarianceTest {

    static Edges[] ddrLink() {
        double ui = 1e15 / 5e8;
        LinkSim sim = LinkSim.ddr(ui, 1500, 2);
        sim.dataRjFs = 0.05 * ui;
        sim.clockRjFs = 0.02 * ui;
        sim.sjAmpFs = 0.3 * ui;
        sim.sjFreqHz = 5e8 / 97.1;
        sim.seed = 3;
        sim.build();
        return impair(sim, 600, 640, ui);
    }

    static Edges[] sevenLink() {
        double p = 1e15 / 70e6;
        LinkSim sim = LinkSim.sevenToOne(p, 260, 2);
        sim.dataRjFs = 0.04 * p / 7;
        sim.sjAmpFs = 0.35 * p / 7;
        sim.sjFreqHz = 70e6 / 13.3;
        sim.seed = 4;
        sim.build();
        return impair(sim, 200, 230, p / 7);
    }

    /** Adds a runt pulse and a dropout to the clock and an unknown span to lane 1. */
    static Edges[] impair(LinkSim sim, int gapFrom, int gapTo, double ui) {
        long[] c = sim.clockT.clone();
        Arrays.sort(c);
        List<Long> t = new ArrayList<>();
        for (int i = 0; i < c.length; i++) {
            if (i < gapFrom || i >= gapTo) {
                t.add(c[i]);
            }
            if (i == 100) {
                t.add(c[i] + (long) (0.4 * ui));
                t.add(c[i] + (long) (0.45 * ui));
            }
        }
        long[] ct = t.stream().mapToLong(Long::longValue).sorted().toArray();
        Edges clock = Edges.of("CLK", 0, sim.endFs, sim.clockInitial, ct);
        Edges l0 = sim.lane(0);
        Edges d = sim.lane(1);
        long a = d.endFs() / 3;
        long b = a + (long) (7.3 * ui);
        long[] all = Arrays.copyOf(d.timesFs(), d.count());
        long[] kept = Arrays.stream(all).filter(x -> x < a || x >= b).toArray();
        if (((all.length - kept.length) & 1) == 1) {
            kept = java.util.stream.LongStream.concat(Arrays.stream(kept), java.util.stream.LongStream.of(b)).sorted().toArray();
        }
        Edges l1 = new Edges("D1", d.startFs(), d.endFs(), d.initialLevel(), kept, kept.length, new long[] {a, b}, 1);
        return new Edges[] {clock, l0, l1};
    }

    static String outcome(Run r) {
        StringBuilder sb = new StringBuilder();
        for (Run.Lane l : r.lanes) {
            sb.append(l.fingerprint()).append('\n');
        }
        r.annotations.forEach(a -> sb.append(a).append('\n'));
        sb.append(r.report);
        return sb.toString();
    }

    void check(Map<String, Object> options, Edges[] in, List<Long> cutFractions, long orderSeed) {
        Run whole = Run.whole(options, in[0], in[1], in[2]);
        assertEquals(1, whole.of("clock-glitch").size(), "the link carries one clock glitch");
        assertEquals(1, whole.of("clock-dropout").size(), "the link carries one clock dropout");
        assertEquals(true, whole.lanes.get(1).flagged.stream().anyMatch(f -> f), "the unknown span flags bits");
        List<List<Edges>> pieces = new ArrayList<>();
        Random rnd = new Random(orderSeed);
        for (Edges e : in) {
            // each input gets its own cut times, drawn from the fractions with a per-input rotation
            long span = e.endFs() - e.startFs();
            long[] cuts = cutFractions.stream().mapToLong(f -> e.startFs() + (f * 7919 + rnd.nextInt(1000)) % 1_000_000 * span / 1_000_000)
                    .filter(x -> x > e.startFs() && x < e.endFs()).sorted().distinct().toArray();
            pieces.add(Run.cut(e, cuts));
        }
        int total = pieces.stream().mapToInt(List::size).sum();
        int[] order = new int[total];
        int[] left = pieces.stream().mapToInt(List::size).toArray();
        for (int i = 0; i < total; i++) {
            int in2;
            do {
                in2 = rnd.nextInt(left.length);
            } while (left[in2] == 0);
            left[in2]--;
            order[i] = in2;
        }
        Run split = Run.pieces(options, pieces, order);
        for (int l = 0; l < whole.lanes.size(); l++) {
            Run.Lane a = whole.lanes.get(l);
            Run.Lane b = split.lanes.get(l);
            assertEquals(a.size(), b.size(), "lane " + l + " bit count");
            for (int i = 0; i < a.size(); i++) {
                String x = a.values.get(i) + " " + a.times.get(i) + " " + a.edge.get(i) + " " + a.falling.get(i) + " " + a.slot.get(i)
                        + " " + a.setup.get(i) + " " + a.hold.get(i) + " " + a.flagged.get(i);
                String y = b.values.get(i) + " " + b.times.get(i) + " " + b.edge.get(i) + " " + b.falling.get(i) + " " + b.slot.get(i)
                        + " " + b.setup.get(i) + " " + b.hold.get(i) + " " + b.flagged.get(i);
                assertEquals(x, y, "lane " + l + " bit " + i + " (blocks " + b.blockSizes + ")");
            }
        }
        assertEquals(whole.annotations.size(), split.annotations.size(), "annotation count");
        for (int i = 0; i < whole.annotations.size(); i++) {
            assertEquals(whole.annotations.get(i).toString(), split.annotations.get(i).toString(), "annotation " + i);
        }
        assertEquals(whole.report, split.report);
    }

    @Property(tries = 40)
    void ddrIndependentOfBlocks(@ForAll @Size(max = 25) List<@LongRange(min = 0, max = 999_999) Long> cuts,
                                @ForAll long orderSeed, @ForAll boolean autoPhase) {
        check(Map.of("lanes", 2, "autoPhase", autoPhase, "searchBits", 300), ddrLink(), cuts, orderSeed);
    }

    @Property(tries = 40)
    void multipliedIndependentOfBlocks(@ForAll @Size(max = 25) List<@LongRange(min = 0, max = 999_999) Long> cuts,
                                       @ForAll long orderSeed, @ForAll @IntRange(min = 0, max = 1) int auto) {
        check(Map.of("lanes", 2, "mode", "multiplied", "autoPhase", auto == 1, "searchBits", 300), sevenLink(), cuts,
                orderSeed);
    }
}
