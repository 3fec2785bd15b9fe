package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * Outputs {@code diff} (P-N) and {@code common} ((P+N)/2) of mode pair: sample for sample what
 * the legs give, aligned as the comparator aligns them, whatever the block cuts.
 */
class PairSignalsTest {
    static final double P = 200_000;
    static final int N = 9000;
    /** Leg P starts this many samples before leg N: the aligner drops them. */
    static final int LEAD = 5;

    /** A 1.2 V common mode with a few hundred millivolts of NRZ-like difference, noise and a common-mode wobble. */
    static AnalogBlock leg(boolean positive, int n, long startFs, long seed) {
        java.util.Random r = new java.util.Random(seed);
        boolean[] bits = Synth.randomBits(n / 40 + 2, 7);
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            int k = i + (positive ? 0 : LEAD);
            double d = bits[k / 40] ? 0.175 : -0.175;
            double cm = 1.2 + 0.02 * Math.sin(k / 300.0);
            v[i] = (float) (cm + (positive ? d : -d) + 0.004 * r.nextGaussian());
        }
        return new AnalogBlock(positive ? "p" : "n", 0, startFs, P, v, n, null);
    }

    static AnalogBlock withInvalid(AnalogBlock b, int from, int to) {
        long[] inv = new long[BitSets.words(b.length())];
        for (int i = from; i < to; i++) {
            inv[i >>> 6] |= 1L << i;
        }
        return new AnalogBlock(b.channel(), b.firstIndex(), b.startFs(), b.periodFs(), b.volts(), b.length(), inv);
    }

    /** One output's blocks joined: samples, invalid flags, time of the first sample and channel name. */
    record Joined(float[] volts, boolean[] invalid, long startFs, String channel) {
    }

    /** Joins a port's blocks, checking that each follows the one before in sample number and time. */
    static Joined joined(StageHarness h, String port) {
        List<AnalogBlock> bs = h.outputs(port, AnalogBlock.class);
        assertTrue(!bs.isEmpty(), port + ": no blocks");
        AnalogBlock head = bs.get(0);
        int total = bs.stream().mapToInt(AnalogBlock::length).sum();
        Joined j = new Joined(new float[total], new boolean[total], head.startFs(), head.channel());
        int pos = 0;
        for (AnalogBlock b : bs) {
            // sample numbers as the capture counts them (leg p's), so segments of a capture agree
            assertEquals(LEAD + pos, b.firstIndex(), port + ": blocks must follow each other");
            assertEquals(head.startFs() + Math.round(pos * P), b.startFs(), 1, port + " block time");
            System.arraycopy(b.volts(), 0, j.volts(), pos, b.length());
            for (int i = 0; b.invalid() != null && i < b.length(); i++) {
                j.invalid()[pos + i] = BitSets.get(b.invalid(), i);
            }
            pos += b.length();
        }
        return j;
    }

    static StageHarness run(Map<String, ?> options, List<AnalogBlock> p, List<AnalogBlock> n) {
        StageHarness h = StageHarness.of(new DifferentialPlugin(), options);
        int i = 0;
        int j = 0;
        // interleave the legs, P ahead, as a capture reader would deliver them
        while (i < p.size() || j < n.size()) {
            if (i < p.size()) {
                h.push("p", p.get(i++));
            }
            if (j < n.size() && (i >= p.size() || j < i)) {
                h.push("n", n.get(j++));
            }
        }
        return h.finish();
    }

    static final Map<String, Object> BOTH = Map.of("name", "D0", "diffOutput", true, "commonOutput", true, "levelProfile", "lvds");

    @Test
    void differenceIsPMinusNAndCommonModeIsTheMeanSampleForSampleAfterAlignment() {
        AnalogBlock p = leg(true, N + LEAD, 1_000_000, 1);
        p.volts()[LEAD + 5000] = Float.NaN; // a sample that is not a number counts as invalid
        AnalogBlock n = withInvalid(leg(false, N, 1_000_000 + Math.round(LEAD * P), 2), 3000, 3017);
        for (Map<String, Object> o : List.<Map<String, Object>>of(BOTH, Map.of("name", "D0", "diffOutput", true, "commonOutput",
                true, "thresholdVolts", 0.0, "hysteresisVolts", 0.05))) {
            StageHarness h = run(o, List.of(p), List.of(n));
            Joined d = joined(h, "diff");
            Joined c = joined(h, "common");
            float[] dv = d.volts();
            float[] cv = c.volts();
            boolean[] inv = d.invalid();
            assertEquals(N, dv.length, o + ": one difference sample per aligned sample pair");
            assertEquals(N, cv.length);
            assertEquals(n.startFs(), d.startFs(), "the difference starts at the first sample both legs have");
            assertEquals("D0 (P-N)", d.channel());
            assertEquals("D0 (P+N)/2", c.channel());
            for (int i = 0; i < N; i++) {
                float pv = p.volts()[i + LEAD];
                float nv = n.volts()[i];
                assertEquals(pv - nv, dv[i], 0f, "P-N at sample " + i);
                assertEquals((float) ((pv + (double) nv) / 2), cv[i], 0f, "(P+N)/2 at sample " + i);
                assertEquals(i >= 3000 && i < 3017 || i == 5000, inv[i], "invalid where a leg is, sample " + i);
                assertEquals(inv[i], c.invalid()[i]);
            }
        }
    }

    @Test
    void cuttingTheLegsIntoBlocksAnywhereChangesNothing() {
        AnalogBlock p = leg(true, N + LEAD, 0, 3);
        AnalogBlock n = withInvalid(leg(false, N, Math.round(LEAD * P), 4), 100, 164);
        StageHarness whole = run(BOTH, List.of(p), List.of(n));
        int[][] cuts = {{1, 63, 64, 872}, {4096}, {17, 5000, 3}, {777, 2}};
        for (int k = 0; k < cuts.length; k++) {
            StageHarness cut = run(BOTH, Synth.split(p, cuts[k]), Synth.split(n, cuts[(k + 1) % cuts.length]));
            for (String port : new String[] {"diff", "common"}) {
                Joined a = joined(whole, port);
                Joined b = joined(cut, port);
                assertEquals(N, b.volts().length);
                assertTrue(java.util.Arrays.equals(a.volts(), b.volts()), port + " samples, cuts " + k);
                assertTrue(java.util.Arrays.equals(a.invalid(), b.invalid()), port + " invalid flags, cuts " + k);
                assertEquals(a.startFs(), b.startFs());
            }
        }
    }

    @Test
    void theOutputsExistOnlyWhenAskedForAndOnlyInModePair() {
        var d = new DifferentialPlugin().descriptor();
        List<String> ports = new ArrayList<>();
        d.outputs(org.lanesift.plugin.OptionValues.validate(d, Map.of())).forEach(s -> ports.add(s.name()));
        assertEquals(List.of("edges", "logic", "report"), ports, "off by default: run would write unwired analog outputs to CSV");
        ports.clear();
        d.outputs(org.lanesift.plugin.OptionValues.validate(d, Map.of("commonOutput", true))).forEach(s -> ports.add(s.name()));
        assertEquals(List.of("edges", "logic", "report", "common"), ports);
        String m = ChainAndOptionsTest.optionError(Map.of("mode", "differential", "diffOutput", true));
        assertTrue(m.contains("option 'diffOutput' of plugin 'differential'") && m.contains("only available in mode 'pair'"), m);
        m = ChainAndOptionsTest.optionError(Map.of("mode", "single", "commonOutput", true));
        assertTrue(m.contains("option 'commonOutput'") && m.contains("mode 'pair'"), m);
        StageHarness h = run(Map.of("diffOutput", true), List.of(leg(true, 3000 + LEAD, 0, 5)), List.of(leg(false, 3000, Math.round(LEAD * P), 6)));
        assertEquals(3000, joined(h, "diff").volts().length);
    }
}
