package org.lanesift.plugins.discovery;

/**
 * How many wrong sync bits the generated chain lets the {@code packet-link} framed profile
 * accept ({@code syncErrors}) on a streaming link, where it restarts the word alignment at every
 * sync on a word boundary ({@code syncRestart}). Each bit allowed lets more damaged syncs through,
 * and makes more data look like a sync: on random bits a word boundary matches an {@code S}-bit
 * pattern with at most {@code e} differences with probability {@code sum_{i<=e} C(S, i) / 2^S}
 * (binomial count; common practice). The largest {@code e} up to {@link #MAX_ERRORS} (the
 * differences discovery's own sync share allows) and below {@code S / 4} is chosen for which the
 * word boundaries inside the examined bursts hold no such match and the expected chance matches
 * over them stay below {@link #MAX_EXPECTED}.
 */
final class SyncTolerance {
    /** Most differences tried (those {@link SyncFinder#match} is asked to allow for the sync share). */
    static final int MAX_ERRORS = 2;
    /** Expected chance matches over the examined word boundaries that are still accepted. */
    static final double MAX_EXPECTED = 0.01;

    /**
     * @param errors     the differences allowed
     * @param boundaries word boundaries examined inside the bursts (every lane)
     * @param chance     probability that one random word boundary matches with that many differences
     */
    record Choice(int errors, long boundaries, double chance) {
    }

    private SyncTolerance() {
    }

    /**
     * @param link     the link cut into bursts at its sync
     * @param syncWire the sync in wire order, '0'/'1'
     * @param wordBits bits per word on a lane
     * @return the choice; 0 errors for a link without sync
     */
    static Choice choose(SampledLink link, String syncWire, int wordBits) {
        int s = syncWire.length();
        if (s == 0 || wordBits <= 0) {
            return new Choice(0, 0, 0);
        }
        int[] nearest = new int[MAX_ERRORS + 1];
        long boundaries = 0;
        for (int k = 0; k < link.lanes().length; k++) {
            for (int b = 0; b < link.bursts(); b++) {
                for (int p = link.start()[b] + s; p + s <= link.end()[b]; p += wordBits) {
                    boundaries++;
                    int d = 0;
                    for (int j = 0; j < s && d <= MAX_ERRORS; j++) {
                        if (link.bit(k, p + j) != (syncWire.charAt(j) == '1')) {
                            d++;
                        }
                    }
                    if (d <= MAX_ERRORS) {
                        nearest[d]++;
                    }
                }
            }
        }
        int e = 0;
        int seen = nearest[0];
        double chance = chance(s, 0);
        for (int t = 1; t <= MAX_ERRORS && 4 * t < s; t++) {
            seen += nearest[t];
            double c = chance(s, t);
            if (seen > 0 || c * boundaries >= MAX_EXPECTED) {
                break;
            }
            e = t;
            chance = c;
        }
        return new Choice(e, boundaries, chance);
    }

    /** {@code sum_{i<=e} C(s, i) / 2^s}. */
    static double chance(int s, int e) {
        double sum = 0;
        double c = 1;
        for (int i = 0; i <= e; i++) {
            sum += c;
            c = c * (s - i) / (i + 1);
        }
        return sum / Math.pow(2, s);
    }
}
