package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.testkit.StageHarness;

/**
 * The {@code logic-activity} shortest pulses, which the stage stops reading the times for once
 * both are one sample period on a grid of whole periods, equal those measured naively over every
 * transition the stage emitted, stretch by stretch: over seeded streams cut into random blocks,
 * with gaps, blocks whose start leaves the grid (by 1 fs or a third of a period, or by a period that is not a whole
 * number of femtoseconds), blocks with unknown samples, and channels that reach one period early
 * or never.
 */
class LogicEdgesPulseOracleTest {
    private record Case(List<LogicBlock> blocks) {
    }

    /** One channel: toggle probability, blocks of random length, a gap or an off-grid start now and then. */
    private static Case stream(Random r, double periodFs) {
        List<LogicBlock> blocks = new ArrayList<>();
        double toggle = new double[] {0.9, 0.5, 0.1, 0.02}[r.nextInt(4)];
        boolean level = r.nextBoolean();
        long index = r.nextInt(1000);
        long jitterFs = 0;
        for (int b = 0; b < 30; b++) {
            int n = 1 + r.nextInt(r.nextBoolean() ? 40 : 700);
            long[] bits = new long[(n + 63) / 64];
            long[] inv = r.nextInt(8) == 0 ? new long[bits.length] : null;
            for (int i = 0; i < n; i++) {
                if (r.nextDouble() < toggle) {
                    level = !level;
                }
                if (level) {
                    bits[i >>> 6] |= 1L << i;
                }
                if (inv != null && r.nextInt(20) == 0) {
                    inv[i >>> 6] |= 1L << i;
                }
            }
            if (r.nextInt(10) == 0) {
                // the start leaves the grid from here on: by a femtosecond, or back by a third of a
                // period (a transition just before and one just after make a pulse shorter than a period)
                jitterFs += r.nextBoolean() ? 1 : -Math.round(periodFs / 3);
            }
            long startFs = Math.round(index * periodFs) + jitterFs;
            blocks.add(new LogicBlock("d", index, startFs, periodFs, bits, n, inv));
            index += n + (r.nextInt(12) == 0 ? 1 + r.nextInt(50) : 0); // now and then a gap
        }
        return new Case(blocks);
    }

    /** Shortest high and low pulse over the emitted edges, never across a gap or an unknown span. */
    private static long[] naive(List<LogicBlock> in, List<Edges> out) {
        long high = Long.MAX_VALUE;
        long low = Long.MAX_VALUE;
        long last = Long.MIN_VALUE;
        long next = -1;
        for (int i = 0; i < out.size(); i++) {
            LogicBlock b = in.get(i);
            Edges e = out.get(i);
            if (next >= 0 && b.firstIndex() != next) {
                last = Long.MIN_VALUE;
            }
            next = b.firstIndex() + b.length();
            if (e.count() == 0) {
                continue;
            }
            if (e.invalidCount() > 0) {
                last = Long.MIN_VALUE;
                continue;
            }
            for (int k = 0; k < e.count(); k++) {
                long t = e.timesFs()[k];
                boolean before = e.initialLevel() ^ (k % 2 == 1);
                if (last != Long.MIN_VALUE) {
                    if (before) {
                        high = Math.min(high, t - last);
                    } else {
                        low = Math.min(low, t - last);
                    }
                }
                last = t;
            }
        }
        return new long[] {high, low};
    }

    private static long field(Annotation a, String name) {
        Object f = a.fields().get(name);
        return f == null ? Long.MAX_VALUE : ((Number) a.fields().get(name).value()).longValue();
    }

    @Test
    void shortestPulsesEqualANaiveMeasureOverEveryTransition() {
        int reachedOnePeriod = 0;
        for (long seed = 1; seed <= 300; seed++) {
            Random r = new Random(seed);
            double periodFs = r.nextInt(4) == 0 ? 2.5e6 / 3 : 20_000_000; // 1.2 GS/s is not a whole number of fs
            Case c = stream(r, periodFs);
            StageHarness h = StageHarness.of(new LogicEdgesProvider(), Map.of("channels", 1));
            for (LogicBlock b : c.blocks()) {
                h.push("in0", b);
            }
            h.finish();
            long[] want = naive(c.blocks(), h.outputs("out0", Edges.class));
            Annotation act = h.annotations("logic-activity").get(0);
            assertEquals(want[0], field(act, "shortestHighFs"), "seed " + seed + ": shortest high pulse");
            assertEquals(want[1], field(act, "shortestLowFs"), "seed " + seed + ": shortest low pulse");
            if (want[0] <= periodFs && want[1] <= periodFs) {
                reachedOnePeriod++;
            }
        }
        // the shortcut was taken in many of the cases (and the answers still matched)
        assertEquals(true, reachedOnePeriod > 50, "cases where both pulses reached one period: " + reachedOnePeriod);
    }
}
