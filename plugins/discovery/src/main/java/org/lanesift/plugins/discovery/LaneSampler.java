package org.lanesift.plugins.discovery;

import java.util.Arrays;
import org.lanesift.data.BitSets;

/**
 * Samples each data lane at the sample points of a {@link Clocking} (one bit per slot of every
 * running clock period) and cuts the bits into bursts: a pause of the clock ends a burst, and so
 * does a run of at least {@link #IDLE_RUN_BITS} bits during which every lane stays at its idle
 * level (a flip of one or two bits with long idle runs on both sides is part of the idle run,
 * see {@link #GLITCH_GUARD_BITS}). At most {@code maxBits} bits per lane are kept, so memory is bounded by the bits examined.
 */
final class LaneSampler {
    /** Shortest idle run that separates bursts on a running clock (common practice: idle gaps last many unit intervals). */
    static final int IDLE_RUN_BITS = 96;
    /** Longest non-idle stretch inside an idle run taken as a bit error rather than a burst. */
    static final int GLITCH_BITS = 2;
    /**
     * Idle bits needed on both sides of such a stretch: more than a word of the longest length
     * (32 bits) plus a leading word, so that the last one bit of a burst that ends in a small
     * value sent MSB first is not taken for an error.
     */
    static final int GLITCH_GUARD_BITS = 48;

    private LaneSampler() {
    }

    static SampledLink sample(Clocking c, long[] risingFs, int nRising, boolean[] laneInitial, long[][] laneEdgesFs, int[] laneCounts,
                              int maxBits) {
        int lanes = laneEdgesFs.length;
        int slots = c.slotsPerPeriod();
        long cap = Math.min((long) maxBits, (long) nRising * slots);
        int n = (int) cap;
        long[][] bits = new long[lanes][BitSets.words(n)];
        int[] ptr = new int[lanes];
        boolean[] level = laneInitial.clone();
        int[] stopAfter = new int[16];
        int stops = 0;
        int i = 0;
        double period = c.periodFs();
        for (int r = 0; r < nRising && i + slots <= n; r++) {
            long next = r + 1 < nRising ? risingFs[r + 1] : Long.MAX_VALUE;
            boolean stop = next - risingFs[r] > 1.5 * period;
            double p = stop ? period : next - risingFs[r];
            for (int j = 0; j < slots; j++) {
                long t = risingFs[r] + Math.round(c.samplePhases()[j] * p);
                for (int k = 0; k < lanes; k++) {
                    long[] e = laneEdgesFs[k];
                    int q = ptr[k];
                    while (q < laneCounts[k] && e[q] <= t) {
                        level[k] = !level[k];
                        q++;
                    }
                    ptr[k] = q;
                    if (level[k]) {
                        bits[k][i >>> 6] |= 1L << i;
                    }
                }
                i++;
            }
            if (stop && r + 1 < nRising) {
                if (stops == stopAfter.length) {
                    stopAfter = Arrays.copyOf(stopAfter, stops * 2);
                }
                stopAfter[stops++] = i;
            }
        }
        n = i;
        boolean[] idle = idleLevels(bits, n);
        int[][] cut = cut(bits, n, idle, stopAfter, stops);
        String mode = stops > 0 ? "clock-stops" : cut[0].length > 1 ? "idle-runs" : "streaming";
        return new SampledLink(bits, n, cut[0], cut[1], cut[0].length, idle, mode, IDLE_RUN_BITS);
    }

    /** The level at which each lane makes the most runs of at least {@link #IDLE_RUN_BITS} equal bits (ties: the longest run). */
    private static boolean[] idleLevels(long[][] bits, int n) {
        boolean[] idle = new boolean[bits.length];
        for (int k = 0; k < bits.length; k++) {
            int[] runs = new int[2];
            int[] longest = new int[2];
            int run = 0;
            boolean prev = false;
            for (int i = 0; i <= n; i++) {
                boolean b = i < n && (bits[k][i >>> 6] >>> i & 1L) != 0;
                if (i < n && i > 0 && b == prev) {
                    run++;
                    continue;
                }
                if (i > 0) {
                    int lv = prev ? 1 : 0;
                    if (run >= IDLE_RUN_BITS) {
                        runs[lv]++;
                    }
                    longest[lv] = Math.max(longest[lv], run);
                }
                run = 1;
                prev = b;
            }
            idle[k] = runs[1] != runs[0] ? runs[1] > runs[0] : longest[1] > longest[0];
        }
        return idle;
    }

    /** Whether every lane is at its idle level at bit {@code i}. */
    private static boolean quiet(long[][] bits, boolean[] idle, int i) {
        for (int k = 0; k < bits.length; k++) {
            if (((bits[k][i >>> 6] >>> i & 1L) != 0) != idle[k]) {
                return false;
            }
        }
        return true;
    }

    /**
     * The length of a bit error in an idle run at bit {@code i}: at most {@link #GLITCH_BITS}
     * non-quiet bits followed by at least {@link #GLITCH_GUARD_BITS} quiet ones (the caller has
     * seen as many before), or 0 when this is not one. Counted as idle, such a flip neither
     * stretches the burst before it nor joins two bursts.
     */
    private static int glitch(long[][] bits, boolean[] idle, int i, int end) {
        int len = 0;
        while (len < GLITCH_BITS && i + len < end && !quiet(bits, idle, i + len)) {
            len++;
        }
        if (i + len + GLITCH_GUARD_BITS > end) {
            return 0;
        }
        for (int j = i + len; j < i + len + GLITCH_GUARD_BITS; j++) {
            if (!quiet(bits, idle, j)) {
                return 0;
            }
        }
        return len;
    }

    private static int[][] cut(long[][] bits, int n, boolean[] idle, int[] stopAfter, int stops) {
        int[] s = new int[64];
        int[] e = new int[64];
        int m = 0;
        int segStart = 0;
        for (int g = 0; g <= stops; g++) {
            int segEnd = g < stops ? stopAfter[g] : n;
            int burstStart = segStart;
            int quietRun = 0;
            for (int i = segStart; i < segEnd; i++) {
                if (quiet(bits, idle, i)) {
                    quietRun++;
                    continue;
                }
                int glitch = quietRun >= GLITCH_GUARD_BITS ? glitch(bits, idle, i, segEnd) : 0;
                if (glitch > 0) {
                    quietRun += glitch;
                    i += glitch - 1;
                    continue;
                }
                if (quietRun >= IDLE_RUN_BITS) {
                    if (i - quietRun > burstStart) {
                        if (m == s.length) {
                            s = Arrays.copyOf(s, m * 2);
                            e = Arrays.copyOf(e, m * 2);
                        }
                        s[m] = burstStart;
                        e[m++] = i - quietRun;
                    }
                    burstStart = i;
                }
                quietRun = 0;
            }
            int last = quietRun >= IDLE_RUN_BITS ? segEnd - quietRun : segEnd;
            if (last > burstStart) {
                if (m == s.length) {
                    s = Arrays.copyOf(s, m * 2);
                    e = Arrays.copyOf(e, m * 2);
                }
                s[m] = burstStart;
                e[m++] = last;
            }
            segStart = segEnd;
        }
        return new int[][] {Arrays.copyOf(s, m), Arrays.copyOf(e, m)};
    }
}
