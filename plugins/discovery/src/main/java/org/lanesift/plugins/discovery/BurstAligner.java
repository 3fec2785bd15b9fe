package org.lanesift.plugins.discovery;

/**
 * Moves the start of a burst to its sync on idle-run links. A bit error in the idle run less
 * than {@link LaneSampler#GLITCH_GUARD_BITS} bits before a burst is taken as the burst's first
 * bit, so the burst would be read from the error on, every word shifted, and its leading word
 * lost. A burst whose first bits do not show the common prefix (more than {@link #START_ERRORS}
 * differences over all lanes) is searched, up to {@link #MAX_SHIFT_BITS} bits in, for the place
 * where every lane shows it with at most {@link #FOUND_ERRORS} difference; the start moves there.
 * A burst cut by the start of the capture has no such place and stays as it is.
 */
final class BurstAligner {
    /** Differences at a burst's start up to which it is left alone (a bit error inside the sync). */
    static final int START_ERRORS = 2;
    /** Differences allowed where the sync is found after the start. */
    static final int FOUND_ERRORS = 1;
    /** How far into a burst the sync is searched (more than the glitch guard). */
    static final int MAX_SHIFT_BITS = 64;
    /** Shortest common prefix worth aligning on (a shorter one also matches by chance). */
    static final int MIN_PREFIX_BITS = 8;

    private BurstAligner() {
    }

    /**
     * @param link the sampled link
     * @param pre  per lane the common prefix, as {@link SyncFinder#prefixes} gives it
     * @return the link with aligned burst starts (the same object when none moved or the link has no idle runs)
     */
    static SampledLink align(SampledLink link, int[][] pre) {
        int bits = Integer.MAX_VALUE;
        for (int[] p : pre) {
            bits = Math.min(bits, p[0]);
        }
        if (!link.burstMode().equals("idle-runs") || bits < MIN_PREFIX_BITS) {
            return link;
        }
        int[] start = link.start().clone();
        boolean moved = false;
        for (int b = 0; b < link.bursts(); b++) {
            if (link.length(b) < bits + MAX_SHIFT_BITS || differences(link, pre, bits, start[b], START_ERRORS + 1) <= START_ERRORS) {
                continue;
            }
            for (int d = 1; d <= MAX_SHIFT_BITS; d++) {
                if (differences(link, pre, bits, start[b] + d, FOUND_ERRORS + 1) <= FOUND_ERRORS) {
                    start[b] += d;
                    moved = true;
                    break;
                }
            }
        }
        return moved ? new SampledLink(link.lanes(), link.bits(), start, link.end(), link.bursts(), link.idleLevel(), link.burstMode(),
                link.idleRunBits()) : link;
    }

    /** Differences between the prefix and the bits at {@code at} over all lanes, counted up to {@code limit}. */
    private static int differences(SampledLink link, int[][] pre, int bits, int at, int limit) {
        int diff = 0;
        for (int k = 0; k < pre.length && diff < limit; k++) {
            for (int p = 0; p < bits && diff < limit; p++) {
                if ((link.bit(k, at + p) ? 1 : 0) != pre[k][p + 1]) {
                    diff++;
                }
            }
        }
        return diff;
    }
}
