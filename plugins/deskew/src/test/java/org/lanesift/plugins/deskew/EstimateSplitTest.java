package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.Size;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/** The estimate does not depend on how the capture was cut into blocks. */
class EstimateSplitTest {
    static final Edges CLK = LinkSynth.clock("clk", 3000, 10_000_000, 20_000_000, 20_000, 1);
    static final Edges L0 = LinkSynth.lane("lane0", 6000, 5_000_000, 20_000_000, 0, 400_000, 100_000, 2);
    static final Edges L1 = LinkSynth.lane("lane1", 6000, 5_000_000, 20_000_000, 0, -900_000, 100_000, 3);
    static final AnalogBlock[] PN = LinkSynth.legs(3000, 1_000_000, 10e9, 250_000, 170_000, 20_000, 0.005, 4);

    static String json(StageHarness h) {
        Artifact a = h.outputs("table", Artifact.class).get(0);
        return new String(a.content(), StandardCharsets.UTF_8);
    }

    static long[] cuts(List<Integer> fractions, Edges e) {
        long span = e.endFs() - e.startFs();
        return fractions.stream().mapToLong(f -> e.startFs() + span * f / 1000).sorted().distinct()
                .filter(t -> t > e.startFs() && t < e.endFs()).toArray();
    }

    static String runEdges(String mode, long[] cut) {
        // lanes mode with the even clock on lane0: its bits per clock must be given (issue 16)
        Map<String, Object> opts = mode.equals("clock") ? Map.of("mode", "clock", "lanes", 2)
                : Map.of("mode", "lanes", "lanes", 3, "bitsPerClock", 2);
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), opts)) {
            List<List<Edges>> s = new ArrayList<>();
            for (Edges e : new Edges[] {CLK, L0, L1}) {
                s.add(Synth.split(e, cut));
            }
            String[] ports = mode.equals("clock") ? new String[] {"clock", "lane0", "lane1"} : new String[] {"lane0", "lane1", "lane2"};
            for (int k = 0; k < s.get(0).size(); k++) {
                for (int p = 0; p < 3; p++) {
                    h.push(ports[p], s.get(p).get(k));
                }
            }
            h.finish();
            return json(h);
        }
    }

    @Property(tries = 15)
    void edgeModesGiveTheSameTableForAnySplit(@ForAll @Size(max = 8) List<@IntRange(min = 1, max = 999) Integer> at) {
        for (String mode : new String[] {"clock", "lanes"}) {
            assertEquals(runEdges(mode, new long[0]), runEdges(mode, cuts(at, CLK)), mode);
        }
    }

    @Property(tries = 10)
    void legsGiveTheSameTableForAnySplit(@ForAll @Size(min = 1, max = 5) List<@IntRange(min = 1, max = 20_000) Integer> sizes) {
        int[] sz = sizes.stream().mapToInt(Integer::intValue).toArray();
        String whole;
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs"))) {
            h.push("p", PN[0]).push("n", PN[1]).finish();
            whole = json(h);
        }
        try (StageHarness h = StageHarness.of(new SkewEstimatePlugin(), Map.of("mode", "legs"))) {
            List<AnalogBlock> p = Synth.split(PN[0], sz);
            List<AnalogBlock> n = Synth.split(PN[1], sz);
            for (int k = 0; k < p.size(); k++) {
                h.push("p", p.get(k)).push("n", n.get(k));
            }
            h.finish();
            assertEquals(whole, json(h));
        }
    }
}
