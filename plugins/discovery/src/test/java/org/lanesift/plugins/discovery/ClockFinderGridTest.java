package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * Clocking from a logic capture: every edge time lies on the capture's sample grid, so the phases
 * of one slot boundary fall on a few discrete values one sample period apart. Finer than that the
 * histogram shows spikes with empty bins between them, not one cluster; they must not be counted
 * as more slots. Synthetic double-edge link (8 ns clock, 20 ps RMS Gaussian jitter on every edge),
 * each edge moved to the first sample at or after it, as a sampling logic analyser reports it
 * (common practice). Invented test data.
 */
class ClockFinderGridTest {
    static final long PERIOD_FS = 8_000_000;
    /** Data changes this long after its clock edge (clock to output), not a whole number of samples. */
    static final long LAUNCH_FS = 1_234_567;

    @Test
    void doubleEdgeLinkSampledAtOrdinaryLogicRatesIsDoubleEdge() {
        for (double rateHz : new double[] {1e9, 2e9, 2.5e9, 2.7e9, 4e9, 16e9}) {
            Clocking c = find(1, rateHz, 2);
            assertEquals("double-edge", c.name(), "at " + rateHz / 1e9 + " GS/s: " + Arrays.toString(c.transitionPhases()));
        }
    }

    @Test
    void singleEdgeAndMultipliedClockingSurviveTheGridToo() {
        Clocking one = find(2, 2.7e9, 1);
        assertEquals("single-edge-falling", one.name()); // data changes at the rising edge
        // four slots of 2 ns: at 4 GS/s two samples per slot, the least a decode needs (Ts <= UI/2)
        assertEquals("multiplied-4", find(3, 4e9, 4).name());
    }

    @Test
    void edgesOffAnyGridKeepTheFineHistogram() {
        // no grid (rate 0): times to the femtosecond; the clocking is found as before
        assertEquals("double-edge", find(4, 0, 2).name());
        assertEquals("multiplied-4", find(5, 0, 4).name());
    }

    /** A link with {@code slots} bits per clock period, its edges on the sample grid of {@code rateHz} (0: none). */
    private static Clocking find(long seed, double rateHz, int slots) {
        Random rnd = new Random(seed);
        int periods = 4000;
        long[] rise = new long[periods];
        long[] fall = new long[periods];
        long[][] lanes = new long[2][periods * slots];
        int[] counts = new int[2];
        double ts = rateHz > 0 ? 1e15 / rateHz : 0;
        double offset = rnd.nextDouble() * PERIOD_FS;
        int[] level = new int[2];
        for (int p = 0; p < periods; p++) {
            double t0 = offset + (double) p * PERIOD_FS;
            rise[p] = grid(t0 + 20_000 * rnd.nextGaussian(), ts);
            fall[p] = grid(t0 + PERIOD_FS / 2.0 + 20_000 * rnd.nextGaussian(), ts);
            for (int s = 0; s < slots; s++) {
                for (int k = 0; k < 2; k++) {
                    int bit = rnd.nextInt(2);
                    if (bit != level[k]) {
                        level[k] = bit;
                        lanes[k][counts[k]++] = grid(t0 + s * (double) PERIOD_FS / slots + LAUNCH_FS + 20_000 * rnd.nextGaussian(), ts);
                    }
                }
            }
        }
        return ClockFinder.find(rise, periods, fall, periods, lanes, counts);
    }

    private static long grid(double tFs, double ts) {
        return ts > 0 ? Math.round(Math.ceil(tFs / ts) * ts) : Math.round(tFs);
    }
}
