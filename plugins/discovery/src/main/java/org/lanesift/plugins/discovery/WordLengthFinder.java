package org.lanesift.plugins.discovery;

import java.util.ArrayList;
import java.util.List;

/**
 * Word length and sync length from the lengths of the bursts: a burst carries whole words, so
 * after the sync its length is a multiple of the word length (or, with idle runs, is most often
 * one: the hidden end of a burst whose last bits equal the idle level spoils the rest). For
 * every word length 4 to 32 the sync length at or below the common prefix that makes the most
 * bursts whole is taken; the longest word length that makes at least {@link #ELIGIBLE} of the
 * best share whole ({@link #ELIGIBLE_EXACT} when the clock stops between bursts) ranks first (its divisors make as many whole, its multiples about half).
 */
final class WordLengthFinder {
    static final int MIN_BITS = 4;
    static final int MAX_BITS = 32;
    static final double ELIGIBLE = 0.8;
    /** The same where the clock stops between bursts, so that burst lengths are exact. */
    static final double ELIGIBLE_EXACT = 0.97;

    /**
     * A candidate.
     *
     * @param wordBits   word length
     * @param syncBits   sync length that goes with it
     * @param wholeShare share of bursts that are whole words after that sync
     * @param eligible   whether the share is within {@link #ELIGIBLE} of the best
     */
    record Candidate(int wordBits, int syncBits, double wholeShare, boolean eligible) {
    }

    private WordLengthFinder() {
    }

    /**
     * @param link   the bursts
     * @param prefix common prefix length (the longest the sync can be)
     * @param lanesFactor 1 to test each lane's payload, N to test the payload of N lanes merged bit by bit
     * @return candidates, best first
     */
    static List<Candidate> rank(SampledLink link, int prefix, int lanesFactor) {
        double[] share = new double[MAX_BITS + 1];
        int[] sync = new int[MAX_BITS + 1];
        double best = 0;
        for (int w = MIN_BITS; w <= MAX_BITS; w++) {
            double top = -1;
            for (int s = prefix; s >= Math.max(0, prefix - w + 1); s--) {
                double d = wholeShare(link, s, w, lanesFactor);
                if (d > top + 1e-9) {
                    top = d;
                    sync[w] = s;
                }
            }
            share[w] = top;
            best = Math.max(best, top);
        }
        double eligible = link.burstMode().equals("clock-stops") ? ELIGIBLE_EXACT : ELIGIBLE;
        List<Candidate> out = new ArrayList<>();
        for (int w = MAX_BITS; w >= MIN_BITS; w--) {
            if (share[w] >= eligible * best) {
                out.add(new Candidate(w, sync[w], share[w], true));
            }
        }
        List<Candidate> rest = new ArrayList<>();
        for (int w = MIN_BITS; w <= MAX_BITS; w++) {
            if (share[w] < eligible * best) {
                rest.add(new Candidate(w, sync[w], share[w], false));
            }
        }
        rest.sort((a, b) -> Double.compare(b.wholeShare(), a.wholeShare()));
        out.addAll(rest);
        return out;
    }

    /**
     * Share of the distinct payload lengths of the inner bursts (the first and last may be cut by
     * the capture) that are whole words; distinct, so that many bursts of one length (a picture
     * sent in equal chunks) count once and do not make every divisor of that length look right.
     */
    static double wholeShare(SampledLink link, int syncBits, int wordBits, int lanesFactor) {
        int n = link.bursts();
        int from = n > 4 ? 1 : 0;
        int to = n > 4 ? n - 1 : n;
        java.util.Set<Long> lengths = new java.util.HashSet<>();
        for (int b = from; b < to; b++) {
            long len = (long) (link.length(b) - syncBits) * lanesFactor;
            if (len > 0) {
                lengths.add(len);
            }
        }
        int whole = 0;
        for (long len : lengths) {
            if (len % wordBits == 0) {
                whole++;
            }
        }
        return lengths.isEmpty() ? 0 : whole / (double) lengths.size();
    }
}
