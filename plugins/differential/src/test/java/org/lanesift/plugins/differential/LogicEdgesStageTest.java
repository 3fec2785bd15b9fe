package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;

class LogicEdgesStageTest {
    static final double PERIOD_FS = 1e15 / 50e6; // 20 ns

    static LogicBlock block(String ch, long first, boolean[] v, int from, int to) {
        long[] bits = new long[(to - from + 63) / 64];
        for (int i = from; i < to; i++) {
            if (v[i]) {
                bits[(i - from) >>> 6] |= 1L << (i - from);
            }
        }
        return new LogicBlock(ch, first, Math.round(first * PERIOD_FS), PERIOD_FS, bits, to - from, null);
    }

    /** Transition times read sample by sample: between sample j-1 and j, at (j - 0.5) periods. */
    static List<Long> expectedTimes(boolean[] v, long first, int from, int to) {
        List<Long> t = new ArrayList<>();
        for (int j = from + 1; j < to; j++) {
            if (v[j] != v[j - 1]) {
                t.add(Math.round(first * PERIOD_FS) + Math.round((j - from - 0.5) * PERIOD_FS));
            }
        }
        return t;
    }

    static long[] times(List<Edges> es) {
        List<Long> all = new ArrayList<>();
        for (Edges e : es) {
            for (int k = 0; k < e.count(); k++) {
                all.add(e.timesFs()[k]);
            }
        }
        return all.stream().mapToLong(Long::longValue).toArray();
    }

    static double number(Annotation a, String name) {
        return ((Number) a.fields().get(name).value()).doubleValue();
    }

    @Test
    void edgesMatchASampleBySampleReadingWhereverTheBlocksAreCut() {
        Random r = new Random(7);
        boolean[] v = new boolean[5000];
        boolean level = false;
        for (int i = 0; i < v.length; i++) {
            if (r.nextInt(5) == 0) {
                level = !level;
            }
            v[i] = level;
        }
        long[] want = expectedTimes(v, 0, 0, v.length).stream().mapToLong(Long::longValue).toArray();
        int[][] cuts = {{0, 5000}, {0, 1, 63, 64, 65, 700, 4999, 5000}, {0, 128, 129, 2000, 5000}};
        for (int[] cut : cuts) {
            StageHarness h = StageHarness.of(new LogicEdgesProvider(), Map.of("channels", 1));
            for (int k = 0; k + 1 < cut.length; k++) {
                h.push("in0", block("ch0", cut[k], v, cut[k], cut[k + 1]));
            }
            h.finish();
            assertArrayEquals(want, times(h.outputs("out0", Edges.class)), "cut at " + java.util.Arrays.toString(cut));
            Annotation act = h.annotations("logic-activity").get(0);
            assertEquals(want.length, number(act, "transitions"));
            assertEquals(0, number(act, "gaps"));
        }
    }

    @Test
    void aGapResetsTheChannelAndNoEdgeOrPulseIsMadeUpAcrossIt() {
        // high 3 samples, low 2, high 5 ... then a gap; after the gap the line is low for 1 sample, then high
        boolean[] a = {false, true, true, true, false, false, true, true, true, true, true};
        boolean[] b = {false, true, true, true, true, false, false, false, false, true};
        StageHarness h = StageHarness.of(new LogicEdgesProvider(), Map.of("channels", 1));
        h.push("in0", block("d", 0, a, 0, a.length));
        long resume = a.length + 1000; // 1000 samples never arrived
        h.push("in0", block("d", resume, b, 0, b.length));
        h.finish();
        List<Edges> out = h.outputs("out0", Edges.class);
        assertEquals(2, out.size());
        Edges after = out.get(1);
        assertFalse(after.initialLevel(), "after the gap the level is the first sample's, not the one before the gap");
        assertEquals(expectedTimes(b, resume, 0, b.length).size(), after.count(), "no transition at the start of the block after the gap");
        Annotation act = h.annotations("logic-activity").get(0);
        assertEquals(1, number(act, "gaps"));
        assertEquals(expectedTimes(a, 0, 0, a.length).size() + expectedTimes(b, resume, 0, b.length).size(), number(act, "transitions"));
        // pulses between two transitions of one stretch: highs 3 and 4, lows 2 and 4 samples. The
        // 1-sample low at the block start after the gap is not bounded by a seen transition.
        assertEquals(Math.round(3 * PERIOD_FS), number(act, "shortestHighFs"), 1.0);
        assertEquals(Math.round(2 * PERIOD_FS), number(act, "shortestLowFs"), 1.0);
    }

    @Test
    void aShortPulseAcrossABlockBoundaryIsMeasured() {
        boolean[] v = {false, false, true, false, false, false};
        StageHarness h = StageHarness.of(new LogicEdgesProvider(), Map.of("channels", 1));
        h.push("in0", block("d", 0, v, 0, 3)).push("in0", block("d", 3, v, 3, 6)).finish();
        Annotation act = h.annotations("logic-activity").get(0);
        assertEquals(Math.round(PERIOD_FS), number(act, "shortestHighFs"), 1.0);
        assertTrue(act.fields().get("shortestLowFs") == null, "no low pulse is bounded by two transitions");
    }

    @Test
    void overlappingBlocksAreRefusedNamingTheInput() {
        boolean[] v = new boolean[100];
        StageHarness h = StageHarness.of(new LogicEdgesProvider(), Map.of("channels", 2));
        h.push("in1", block("ch1", 0, v, 0, 100));
        Exception e = assertThrows(RuntimeException.class, () -> h.push("in1", block("ch1", 50, v, 0, 50)));
        String m = String.valueOf(e.getMessage()) + " " + String.valueOf(e.getCause());
        assertTrue(m.contains("in1") && m.contains("sample 50") && m.contains("sample 100"), m);
    }
}
