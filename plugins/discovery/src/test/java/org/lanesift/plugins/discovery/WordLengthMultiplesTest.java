package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * A multiple of the word length that a few spoiled bursts push below the exact-length bar is still
 * a candidate, and the bit statistics per position (entropy per bit position, compared by the
 * Bayesian information criterion, {@link PositionStatistics}) put the true length first: 24-bit
 * words whose two halves carry differently distributed bits are not read as 12, while words whose
 * halves are alike stay at 12 (the period twice as long only fits noise). Hand-made bursts of one
 * lane, back to back as a streaming link cut at its sync (invented test data).
 */
class WordLengthMultiplesTest {
    static final int SYNC = 16;

    @Test
    void twentyFourBitWordsWithTwoSpoiledBurstsAreNotReadAsTwelve() {
        SampledLink link = link(true, 1);
        List<WordLengthFinder.Candidate> ranked = WordLengthFinder.rank(link, SYNC, 1);
        assertTrue(WordLengthFinder.wholeShare(link, SYNC, 24, 1) < WordLengthFinder.ELIGIBLE_EXACT, "the lengths alone spoil 24");
        assertEquals(24, ranked.get(0).wordBits(), ranked::toString);
        assertTrue(ranked.get(0).multiple(), ranked::toString);
        assertEquals(12, ranked.get(1).wordBits(), ranked::toString);
        assertEquals(SYNC, ranked.get(0).syncBits());
    }

    @Test
    void twelveBitWordsStayTwelveAndTwentyFourIsStillTried() {
        SampledLink link = link(false, 2);
        List<WordLengthFinder.Candidate> ranked = WordLengthFinder.rank(link, SYNC, 1);
        assertEquals(12, ranked.get(0).wordBits(), ranked::toString);
        int at24 = -1;
        for (int i = 0; i < ranked.size(); i++) {
            at24 = ranked.get(i).wordBits() == 24 && at24 < 0 ? i : at24;
        }
        assertTrue(ranked.get(at24).multiple() && at24 < WordLengthFinder.tried(ranked, DiscoveryEngine.WORD_CANDIDATES), ranked::toString);
    }

    @Test
    void thePeriodOfTheBitStatisticsScoresBest() {
        SampledLink wide = link(true, 3);
        double[] bic = PositionStatistics.bic(wide, new int[] {12, 24, 48}, new int[] {SYNC, SYNC, SYNC});
        assertTrue(bic[1] < bic[0] && bic[1] < bic[2], () -> java.util.Arrays.toString(bic));
        SampledLink narrow = link(false, 4);
        double[] b2 = PositionStatistics.bic(narrow, new int[] {12, 24}, new int[] {SYNC, SYNC});
        assertTrue(b2[0] < b2[1], () -> java.util.Arrays.toString(b2));
    }

    /**
     * 40 bursts of a 16-bit sync and 6 to 40 words of 24 bits; two bursts lose 12 bits (a cut
     * inside a word). Bit j of a word is a one with probability 0.9 for j < 4, 0.1 for 12 <= j < 16
     * ({@code halvesDiffer}; otherwise also for j - 12 in those ranges), else 0.5.
     */
    private static SampledLink link(boolean halvesDiffer, long seed) {
        Random r = new Random(seed);
        int bursts = 40;
        long[] lane = new long[(bursts * (SYNC + 40 * 24) + 63) / 64 + 1];
        int[] start = new int[bursts];
        int[] end = new int[bursts];
        int n = 0;
        for (int b = 0; b < bursts; b++) {
            start[b] = n;
            for (int j = 0; j < SYNC; j++) {
                set(lane, n++, (0xB38E >>> j & 1) != 0);
            }
            int words = 6 + r.nextInt(35);
            int bits = words * 24 - (b == 11 || b == 27 ? 12 : 0);
            for (int i = 0; i < bits; i++) {
                int j = i % 24;
                int k = halvesDiffer ? j : j % 12;
                double p = k < 4 ? 0.9 : k >= 12 && k < 16 ? 0.1 : 0.5;
                set(lane, n++, r.nextDouble() < p);
            }
            end[b] = n;
        }
        return new SampledLink(new long[][] {lane}, n, start, end, bursts, new boolean[] {false}, "streaming", 0);
    }

    private static void set(long[] lane, int i, boolean v) {
        if (v) {
            lane[i >>> 6] |= 1L << i;
        }
    }
}
