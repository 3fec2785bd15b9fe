package org.lanesift.plugins.dualedge;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionException;

/**
 * Issue 18 item 5: on a legal capture whose clock period changes abruptly, multiplied mode placed
 * the slots after the next reference edge with the period before it, so sample times went backwards
 * and the sampler's own check ("annotation 'margin-low' ends before it starts") failed the run as if
 * the input were wrong. Sample times now never go backwards (such a sample is held and flagged
 * suspect), and the only refusals left are option errors. Clocks and lanes are seeded random edge
 * lists with sudden period changes and unknown spans.
 */
class IrregularClockTest {
    private static Edges withUnknown(Random r, String name, long[] t, long end) {
        if (r.nextBoolean()) {
            return Edges.of(name, 0, end, false, t);
        }
        int k = r.nextInt(3) + 1;
        long[] spans = new long[2 * k];
        long at = 0;
        for (int i = 0; i < k; i++) {
            at += 1 + (long) (r.nextDouble() * end / (k + 1));
            spans[2 * i] = at;
            at += 1 + r.nextInt(2_000_000);
            spans[2 * i + 1] = at;
        }
        return at >= end ? Edges.of(name, 0, end, false, t) : new Edges(name, 0, end, false, t, t.length, spans, k);
    }

    @Test
    void sampleTimesNeverGoBackwardsOnAnIrregularClock() {
        Random r = new Random(1);
        int runs = 0;
        for (int trial = 0; trial < 300; trial++) {
            int nClk = 50 + r.nextInt(200);
            long[] clk = new long[nClk];
            long t = 1000;
            for (int i = 0; i < nClk; i++) {
                // mostly 100-150 ps half periods, now and then a pause of up to 3 ns
                t += 100_000 + (r.nextInt(4) == 0 ? r.nextInt(3_000_000) : r.nextInt(50_000));
                clk[i] = t;
            }
            int nD = 5 + r.nextInt(300);
            long[] d = new long[nD];
            long u = 500;
            for (int i = 0; i < nD; i++) {
                u += 1 + r.nextInt(400_000);
                d[i] = u;
            }
            long end = Math.max(t, u) + 1000;
            String phase = new String[] {"0UI", "0.45UI", "-0.45UI", "20ps"}[r.nextInt(4)];
            Edges clock = withUnknown(r, "CLK", clk, end);
            Edges lane = withUnknown(r, "D0", d, end);
            Run run;
            try {
                run = Run.whole(Map.of("mode", "multiplied", "phase", phase, "marginThreshold", 0.4), clock, lane);
            } catch (RuntimeException e) {
                Throwable c = e.getCause() == null ? e : e.getCause();
                if (c instanceof OptionException) {
                    continue; // a phase longer than the recovered UI is refused as an option error, rightly
                }
                fail("trial " + trial + " (phase " + phase + "): " + c, e);
                return;
            }
            runs++;
            Run.Lane l = run.lanes.get(0);
            for (int k = 1; k < l.size(); k++) {
                long a = l.times.get(k - 1);
                long b = l.times.get(k);
                assertTrue(b >= a, "trial " + trial + ": bit " + k + " sampled at " + b + " fs, before bit " + (k - 1) + " at " + a);
            }
        }
        assertTrue(runs > 200, "most trials decode: " + runs);
    }
}
