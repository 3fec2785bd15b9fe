package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import java.util.function.LongPredicate;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;
import org.lanesift.data.LogicBlock;

class EdgeAlignmentTest {
    /** 40 ns / 7, not a whole number of 1 ns sample periods: the grid meets the edges at every phase. */
    static final long UI_FS = 5_714_286;
    static final double PERIOD_FS = 1_000_000; // 1 GS/s

    /** A random NRZ stream, one bit per 5 ns, as a function of time in fs. */
    static LongPredicate nrz(long seed) {
        return nrz(seed, UI_FS);
    }

    static LongPredicate nrz(long seed, long uiFs) {
        boolean[] bits = new boolean[200_000];
        Random r = new Random(seed);
        for (int i = 0; i < bits.length; i++) {
            bits[i] = r.nextBoolean();
        }
        return t -> bits[(int) Math.floorMod(Math.floorDiv(t, uiFs), (long) bits.length)];
    }

    /** Logic samples of {@code signal} seen by an acquisition whose file time 0 is link time {@code linkStartFs}. */
    static SharedEdges sampled(LongPredicate signal, long linkStartFs, int samples) {
        SharedEdges e = new SharedEdges();
        int block = 4096;
        for (int first = 0; first < samples; first += block) {
            int n = Math.min(block, samples - first);
            long[] bits = new long[(n + 63) >>> 6];
            for (int i = 0; i < n; i++) {
                if (signal.test(linkStartFs + Math.round((first + i) * PERIOD_FS))) {
                    bits[i >>> 6] |= 1L << i;
                }
            }
            e.accept(new LogicBlock("s", first, Math.round(first * PERIOD_FS), PERIOD_FS, bits, n, null));
        }
        return e;
    }

    /** Offsets that are not whole samples are found to a fifth of a sample, either way. */
    @ParameterizedTest
    @ValueSource(longs = {0, 37_310_000L, -61_770_000L, 250_400L, -1_999_600_000L})
    void theOffsetIsFoundToAFractionOfASample(long triggerShiftFs) {
        LongPredicate s = nrz(5);
        SharedEdges ref = sampled(s, 10_000_000_000L, 60_000);
        SharedEdges other = sampled(s, 10_000_000_000L + triggerShiftFs, 60_000);
        EdgeAlignment.Result r = EdgeAlignment.align(ref, other, 7_500_000_000L);
        // a transition at link time L is at file time L - start: the other's come triggerShift earlier
        assertEquals(-triggerShiftFs, r.offsetFs(), 0.2 * PERIOD_FS, r.toString());
        assertTrue(r.matched() > 0.95, r.toString());
        assertTrue(r.runnerUp() < 0.6, r.toString());
        if (triggerShiftFs % (long) PERIOD_FS != 0) {
            assertTrue(r.standardErrorFs() < 0.05 * PERIOD_FS, r.toString());
        } else {
            // the same sample phase in both: every difference alike, the error is that of one sample
            assertEquals(PERIOD_FS / Math.sqrt(12), r.standardErrorFs(), 1, r.toString());
        }
    }

    @Test
    void aClockAlignsAmbiguouslyAndOtherContentDoesNotMatch() {
        LongPredicate clock = t -> Math.floorMod(t, 7 * UI_FS) < 2 * UI_FS;
        EdgeAlignment.Result c = EdgeAlignment.align(sampled(clock, 0, 60_000), sampled(clock, 3_333_333, 60_000), 7_500_000_000L);
        assertTrue(c.runnerUp() > EdgeAlignment.MAX_RUNNER_UP, c.toString());
        EdgeAlignment.Result o = EdgeAlignment.align(sampled(nrz(5), 0, 60_000), sampled(nrz(6), 0, 60_000), 7_500_000_000L);
        assertTrue(o.matched() < EdgeAlignment.MIN_MATCHED, o.toString());
        // a unit interval of exactly 5 samples: every edge meets the grid at the same phase, the offset is
        // known to a sample and the standard error says so (one sample / sqrt(12))
        EdgeAlignment.Result q = EdgeAlignment.align(sampled(nrz(5, 5_000_000), 0, 60_000), sampled(nrz(5, 5_000_000), 37_310_000L, 60_000),
                7_500_000_000L);
        assertEquals(-37_310_000L, q.offsetFs(), PERIOD_FS, q.toString());
        assertEquals(PERIOD_FS / Math.sqrt(12), q.standardErrorFs(), 1, q.toString());
        // a search range wider than the acquisitions leaves no overlap to vote in
        assertNull(EdgeAlignment.align(sampled(nrz(5), 0, 1000), sampled(nrz(5), 0, 1000), 600_000_000L));
    }
}
