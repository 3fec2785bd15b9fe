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
 *
 * <p>Exact lengths (clock pauses, streaming links cut at their sync): a few bursts spoiled by a
 * bit error or a chance occurrence of the sync inside data make a multiple of the true word
 * length fall below {@link #ELIGIBLE_EXACT} while its divisors stay whole, so a divisor would win
 * (24-bit words read as 12). The multiples of the first candidate that make at least
 * {@link #MULTIPLE_SHARE} of the bursts whole after the same sync are therefore kept as
 * candidates too (lanes read one by one; not with bits spread over lanes), ordered by
 * the bit statistics per position ({@link PositionStatistics}): a multiple whose per-position
 * bit probabilities explain the payload better than the shorter period does (Bayesian
 * information criterion) goes before it, the others right after it; the framing that explains
 * most (picture, checksum, length field) decides among them.
 */
final class WordLengthFinder {
    static final int MIN_BITS = 4;
    static final int MAX_BITS = 32;
    static final double ELIGIBLE = 0.8;
    /** The same where the clock stops between bursts or a streaming link is cut at its sync, so that burst lengths are exact. */
    static final double ELIGIBLE_EXACT = 0.97;

    /**
     * A candidate.
     *
     * @param wordBits   word length
     * @param syncBits   sync length that goes with it
     * @param wholeShare share of bursts that are whole words after that sync
     * @param eligible   whether the share is within {@link #ELIGIBLE} of the best
     * @param multiple   a multiple of the best length by burst lengths, moved up (see the class comment)
     */
    record Candidate(int wordBits, int syncBits, double wholeShare, boolean eligible, boolean multiple) {
        Candidate(int wordBits, int syncBits, double wholeShare, boolean eligible) {
            this(wordBits, syncBits, wholeShare, eligible, false);
        }
    }

    /**
     * Share of the inner bursts (counted one by one, not by distinct length) that a multiple of
     * the first candidate must make whole to be a candidate (common practice: a few bursts
     * spoiled by bit errors or chance cuts; from the accuracy measurements, DiscoveryAccuracyTest).
     */
    static final double MULTIPLE_SHARE = 0.9;

    private WordLengthFinder() {
    }

    /**
     * @param link   the bursts
     * @param prefix common prefix length (the longest the sync can be)
     * @param lanesFactor 1 to test each lane's payload, N to test the payload of N lanes merged bit by bit
     * @return candidates, best first
     */
    static List<Candidate> rank(SampledLink link, int prefix, int lanesFactor) {
        if (link.burstMode().equals("idle-runs")) {
            return rankHiddenTails(link, prefix, lanesFactor);
        }
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
        double eligible = link.burstMode().equals("idle-runs") ? ELIGIBLE : ELIGIBLE_EXACT;
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
        return withMultiples(link, out, lanesFactor);
    }

    /**
     * The ranking with the multiples of its first candidate that make at least
     * {@link #MULTIPLE_SHARE} of the bursts whole moved up: those the bit statistics per
     * position prefer to the first candidate before it (best first), the others right after it,
     * all marked eligible.
     */
    private static List<Candidate> withMultiples(SampledLink link, List<Candidate> ranked, int lanesFactor) {
        Candidate first = ranked.get(0);
        int w0 = first.wordBits();
        if (lanesFactor != 1) {
            // bits spread over N lanes: every burst carries a whole number of bits on each lane, so the lengths make
            // the multiples of N times the lane unit whole whatever the word length; they say nothing about multiples
            return ranked;
        }
        List<Candidate> admitted = new ArrayList<>();
        int s = first.syncBits();
        for (Candidate c : ranked) {
            // with the first candidate's sync: a longer sync or a shorter one can swallow a header word and make the
            // data bursts whole at the pixel's length instead
            if (c.wordBits() > w0 && c.wordBits() % w0 == 0 && !c.eligible() && burstShare(link, s, c.wordBits(), 1) >= MULTIPLE_SHARE) {
                admitted.add(new Candidate(c.wordBits(), s, wholeShare(link, s, c.wordBits(), 1), true, true));
            }
        }
        if (admitted.isEmpty()) {
            return ranked;
        }
        int[] periods = new int[admitted.size() + 1];
        int[] syncs = new int[periods.length];
        periods[0] = w0;
        syncs[0] = first.syncBits();
        for (int i = 0; i < admitted.size(); i++) {
            periods[i + 1] = admitted.get(i).wordBits();
            syncs[i + 1] = admitted.get(i).syncBits();
        }
        double[] bic = PositionStatistics.bic(link, periods, syncs);
        List<Candidate> before = new ArrayList<>();
        List<Candidate> after = new ArrayList<>();
        for (int i = 0; i < admitted.size(); i++) {
            (bic[i + 1] < bic[0] ? before : after).add(admitted.get(i));
        }
        before.sort((a, b) -> Double.compare(bic[indexOf(periods, a.wordBits())], bic[indexOf(periods, b.wordBits())]));
        List<Candidate> out = new ArrayList<>(before);
        out.add(first);
        out.addAll(after);
        for (Candidate c : ranked.subList(1, ranked.size())) {
            if (indexOf(periods, c.wordBits()) < 0) {
                out.add(c);
            }
        }
        return out;
    }

    private static int indexOf(int[] a, int v) {
        for (int i = 0; i < a.length; i++) {
            if (a[i] == v) {
                return i;
            }
        }
        return -1;
    }

    /** Candidates to try in a ranking: the first {@code base} and every multiple {@link #rank} moved up. */
    static int tried(List<Candidate> ranked, int base) {
        int n = base;
        for (int i = 0; i < ranked.size(); i++) {
            if (ranked.get(i).multiple() && i >= base) {
                n = i + 1;
            }
        }
        return Math.min(n, ranked.size());
    }

    /** Share of the inner bursts (the first and last may be cut by the capture), one by one, whose payload is whole words. */
    static double burstShare(SampledLink link, int syncBits, int wordBits, int lanesFactor) {
        int n = link.bursts();
        int from = n > 4 ? 1 : 0;
        int to = n > 4 ? n - 1 : n;
        int seen = 0;
        int whole = 0;
        for (int b = from; b < to; b++) {
            long len = (long) (link.length(b) - syncBits) * lanesFactor;
            if (len > 0) {
                seen++;
                whole += len % wordBits == 0 ? 1 : 0;
            }
        }
        return seen == 0 ? 0 : whole / (double) seen;
    }

    /**
     * Idle runs: a burst's visible end is its last bit that differs from the idle level, so the
     * payload seen is the payload sent less a hidden tail of idle-level bits (about half the
     * bursts end in one such bit, a quarter in two, and so on). For word length {@code w} and
     * sync {@code s}, each distinct visible payload length needs a pad {@code p} (bits up to the
     * next whole word, per lane) and scores the likelihood of that tail against a length drawn
     * at random: {@code log((1 - OUTLIER) * u * sum_j 2^-(p + j*u + 1) + OUTLIER)}, where
     * {@code u} is the per-lane word unit. A longer word predicts the lengths more sharply
     * ({@code u} grows), so a divisor of the true word length scores lower by about
     * {@code log 2} per length, and a multiple misses half the lengths (Bayesian model
     * comparison with an Occam factor; common practice). Candidates within
     * {@link #TAIL_ELIGIBLE} of the best score per length are eligible, best score first.
     */
    private static List<Candidate> rankHiddenTails(SampledLink link, int prefix, int lanesFactor) {
        double[] score = new double[MAX_BITS + 1];
        int[] sync = new int[MAX_BITS + 1];
        double weight = 1;
        double best = Double.NEGATIVE_INFINITY;
        for (int w = MIN_BITS; w <= MAX_BITS; w++) {
            score[w] = Double.NEGATIVE_INFINITY;
            for (int s = prefix; s >= Math.max(0, prefix - w + 1); s--) {
                long[][] lengths = distinctLengths(link, s);
                double d = tailScore(lengths[0], lengths[1], w, lanesFactor);
                if (d > score[w] + 1e-9) {
                    score[w] = d;
                    sync[w] = s;
                    weight = 0;
                    for (long x : lengths[1]) {
                        weight += x;
                    }
                }
            }
            best = Math.max(best, score[w]);
        }
        List<Candidate> out = new ArrayList<>();
        for (int w = MIN_BITS; w <= MAX_BITS; w++) {
            out.add(new Candidate(w, sync[w], wholeShare(link, sync[w], w, lanesFactor),
                    score[w] >= best - TAIL_ELIGIBLE * Math.max(1, weight)));
        }
        double[] sc = score;
        out.sort((a, b) -> a.eligible() != b.eligible() ? (a.eligible() ? -1 : 1)
                : Double.compare(sc[b.wordBits()], sc[a.wordBits()]) != 0 ? Double.compare(sc[b.wordBits()], sc[a.wordBits()])
                : Integer.compare(b.wordBits(), a.wordBits()));
        return out;
    }

    /** Share of lengths assumed hit by a bit error or a cut (any length equally likely then). */
    static final double OUTLIER = 0.05;
    /** Score per unit of weight below the best that still counts as eligible. */
    static final double TAIL_ELIGIBLE = 0.1;
    /**
     * Most weight one distinct length gets (its burst count, up to this): a length seen once may
     * be a bit error in the idle run, one seen often is sent; capped so that many equal data
     * bursts do not make every divisor of their length look right.
     */
    static final int MAX_WEIGHT = 3;

    /**
     * Weighted log-likelihood of the hidden tails that word length {@code w} asks of these
     * visible payload lengths (per lane).
     */
    static double tailScore(long[] lengths, long[] weights, int w, int lanesFactor) {
        int u = w / (int) gcd(w, lanesFactor);
        double sum = 0;
        for (int i = 0; i < lengths.length; i++) {
            long len = lengths[i];
            int pad = (int) ((u - len % u) % u);
            double g = Math.pow(2, -(pad + 1)) / (1 - Math.pow(2, -u));
            sum += weights[i] * Math.log((1 - OUTLIER) * u * g + OUTLIER);
        }
        return sum;
    }

    /**
     * The distinct payload lengths (after {@code syncBits}) of the inner bursts, longest first,
     * and their weights (burst count, at most {@link #MAX_WEIGHT}); a length less than
     * {@link #MIN_BITS} below a kept one is taken as the same sent length with a longer hidden
     * tail and counted with it.
     */
    private static long[][] distinctLengths(SampledLink link, int syncBits) {
        int n = link.bursts();
        int from = n > 4 ? 1 : 0;
        int to = n > 4 ? n - 1 : n;
        java.util.TreeMap<Long, Integer> counts = new java.util.TreeMap<>();
        for (int b = from; b < to; b++) {
            long len = link.length(b) - syncBits;
            if (len > 0) {
                counts.merge(len, 1, Integer::sum);
            }
        }
        // one sent length shows as several when its bursts hide tails of different lengths
        // (sent lengths differ by a word or more)
        long[] out = new long[counts.size()];
        long[] weight = new long[counts.size()];
        int m = 0;
        for (java.util.Map.Entry<Long, Integer> e : counts.descendingMap().entrySet()) {
            if (m == 0 || out[m - 1] - e.getKey() >= MIN_BITS) {
                out[m++] = e.getKey();
            }
            weight[m - 1] += e.getValue();
        }
        for (int i = 0; i < m; i++) {
            weight[i] = Math.min(MAX_WEIGHT, weight[i]);
        }
        return new long[][] {java.util.Arrays.copyOf(out, m), java.util.Arrays.copyOf(weight, m)};
    }

    private static long gcd(long a, long b) {
        return b == 0 ? a : gcd(b, a % b);
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
