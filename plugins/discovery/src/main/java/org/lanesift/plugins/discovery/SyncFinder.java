package org.lanesift.plugins.discovery;

/**
 * The common prefix of the bursts: bit position by bit position, the share of bursts that agree
 * with the majority; the prefix ends at the first position where fewer than {@link #AGREEMENT}
 * agree, so a few bit errors (or one burst cut by the start of the capture) do not end it early.
 */
final class SyncFinder {
    /** Share of bursts that must agree for a bit to count as part of the common prefix. */
    static final double AGREEMENT = 0.9;
    static final int MAX_BITS = 64;

    private SyncFinder() {
    }

    /**
     * @return per lane: {@code [prefixBits, patternBits...]}: the prefix length and the majority bit at each position
     */
    static int[][] prefixes(SampledLink link) {
        int lanes = link.lanes().length;
        int[][] out = new int[lanes][];
        for (int k = 0; k < lanes; k++) {
            int[] maj = new int[MAX_BITS + 1];
            int p = 0;
            for (; p < MAX_BITS; p++) {
                int ones = 0;
                int seen = 0;
                for (int b = 0; b < link.bursts(); b++) {
                    if (link.length(b) > p) {
                        seen++;
                        if (link.bit(k, link.start()[b] + p)) {
                            ones++;
                        }
                    }
                }
                if (seen < Math.max(2, link.bursts() / 2)) {
                    break;
                }
                int agree = Math.max(ones, seen - ones);
                if (agree < AGREEMENT * seen) {
                    break;
                }
                maj[p + 1] = ones * 2 > seen ? 1 : 0;
            }
            maj[0] = p;
            out[k] = maj;
        }
        return out;
    }

    /** Share of bursts whose first {@code bits} bits on lane {@code k} equal the pattern, with up to {@code errors} differences. */
    static double match(SampledLink link, int k, int[] pattern, int bits, int errors) {
        int ok = 0;
        for (int b = 0; b < link.bursts(); b++) {
            if (link.length(b) < bits) {
                continue;
            }
            int diff = 0;
            for (int p = 0; p < bits; p++) {
                if ((link.bit(k, link.start()[b] + p) ? 1 : 0) != pattern[p + 1]) {
                    diff++;
                }
            }
            if (diff <= errors) {
                ok++;
            }
        }
        return link.bursts() == 0 ? 0 : ok / (double) link.bursts();
    }
}
