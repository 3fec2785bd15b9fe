package org.lanesift.plugins.discovery;

import java.util.Arrays;

/**
 * Frames a streaming link (the clock never pauses and the lanes never idle) by its sync. The
 * {@link #CANDIDATES} {@link #WINDOW_BITS}-bit values that occur most often on lane 0 are each
 * extended right while at least {@link #AGREEMENT} of their occurrences agree bit by bit, and
 * left while nearly all do ({@link #LEFT_AGREEMENT}: the bits before a sync end the previous
 * burst and vary, so the extension stops at the sync's first bit); each pattern and its shorter
 * heads is a candidate, scored by the burst-length distribution its cut yields ({@link #score}:
 * pieces of whole words, and nearly all of the stream in pieces whose length recurs). Frequency
 * alone does not do, nor does the number of whole pieces: a picture repeats its bit patterns far
 * more often than bursts start (a flat area repeats its pixel every few bits) and cuts the stream
 * into many short pieces of whole words, but at spacings that follow the picture, not a frame. A
 * candidate that another one precedes at a header's distance in nearly every burst is a pattern
 * of the header, not the sync ({@link #insideHeader}); a head of the best that occurs in clearly
 * more places and cuts nearly as well is taken instead ({@link #widestHead}). The stream is cut at every exact
 * occurrence of the best candidate where the piece since the last cut is whole words; the piece
 * before the first occurrence (a capture that starts mid-burst) is dropped. A link with no
 * pattern of at least {@link #WINDOW_BITS} bits that recurs {@link #MIN_OCCURRENCES} times stays
 * one burst.
 */
final class StreamFramer {
    static final int WINDOW_BITS = 16;
    /** Occurrences needed. */
    static final int MIN_OCCURRENCES = 4;
    /** Share of occurrences that must agree for a bit to extend the pattern to the right (into the header most bursts share). */
    static final double AGREEMENT = 0.9;
    /**
     * Share of occurrences that must agree (or all but one) for a bit to extend the pattern to the
     * left: a sync bit differs only where a bit error hit it, while the bits before it end the
     * previous burst, and a picture whose components leave their low bits zero (loosely packed
     * colour) ends most bursts alike, 90 to 95 % of them, which would start the sync a bit or two early.
     */
    static final double LEFT_AGREEMENT = 0.97;
    /** Bits of lane 0 searched for the window. */
    static final int SEARCH_BITS = 1 << 20;

    private StreamFramer() {
    }

    /**
     * Share of a pattern's occurrences that another candidate's occurrence precedes within
     * {@link SyncFinder#MAX_BITS} bits for the pattern to count as inside a header ({@link #follows}).
     */
    static final double HEADER_SHARE = 0.9;
    /** Candidates (best first) checked as the sync that a header pattern follows. */
    static final int HEADER_RIVALS = 32;

    /**
     * Windows tried, most frequent first: a picture with flat areas has hundreds of frequent
     * 16-bit values (the rotations of each area's repeating pixel bits) and can push the sync's
     * windows below the first 64.
     */
    static final int CANDIDATES = 256;

    /** @return the link cut at its sync, or the same link when it is not streaming or no sync stands out */
    static SampledLink frame(SampledLink link) {
        if (!link.burstMode().equals("streaming") || link.bits() < 8 * WINDOW_BITS) {
            return link;
        }
        long[] lane = link.lanes()[0];
        int n = Math.min(link.bits(), SEARCH_BITS);
        int[] counts = new int[1 << WINDOW_BITS];
        int mask = (1 << WINDOW_BITS) - 1;
        int v = 0;
        for (int i = 0; i < n; i++) {
            v = (v << 1 | (int) (lane[i >>> 6] >>> i & 1L)) & mask;
            if (i >= WINDOW_BITS - 1) {
                counts[v]++;
            }
        }
        Candidate best = best(rank(lane, n, counts));
        if (best == null) {
            return link;
        }
        int[] starts = wholeCuts(occurrences(lane, link.bits(), best.pattern(), best.pattern().length), best.pattern().length, best.wordBits());
        int[] end = new int[starts.length];
        for (int b = 0; b < starts.length; b++) {
            end[b] = b + 1 < starts.length ? starts[b + 1] : link.bits();
        }
        return new SampledLink(link.lanes(), link.bits(), starts, end, starts.length, link.idleLevel(), "streaming", link.idleRunBits());
    }

    /** The best scoring candidate not inside a header ({@link #insideHeader}), or null; sorts {@code ranked}, best first. */
    static Candidate best(java.util.List<Candidate> ranked) {
        ranked.sort(java.util.Comparator.comparingDouble(Candidate::score).reversed());
        for (Candidate c : ranked) {
            if (!insideHeader(c, ranked)) {
                return widestHead(c, ranked);
            }
        }
        return null;
    }

    /** More occurrences a head needs, as a share of the longer pattern's, to be preferred ({@link #widestHead}). */
    static final double HEAD_MORE = 0.1;
    /** Share of the longer pattern's score a head preferred for its occurrences must reach. */
    static final double HEAD_SCORE_SHARE = 0.75;

    /**
     * The head of {@code c} (a shorter candidate that starts where it does) that occurs in the most
     * places, at least {@link #HEAD_MORE} more than {@code c}, with a score of at least
     * {@link #HEAD_SCORE_SHARE} of its score; else {@code c}. The pattern may run on into the
     * leading word the data bursts share, and the data bursts, all of one length, then frame most of
     * the stream alone; the sync begins the commands as well.
     */
    private static Candidate widestHead(Candidate c, java.util.List<Candidate> ranked) {
        Candidate best = c;
        for (Candidate h : ranked) {
            if (h.pattern().length < c.pattern().length && h.at().length >= (1 + HEAD_MORE) * c.at().length
                    && h.at().length > best.at().length && h.score() >= HEAD_SCORE_SHARE * c.score()
                    && Arrays.equals(h.pattern(), Arrays.copyOf(c.pattern(), h.pattern().length))) {
                best = h;
            }
        }
        return best;
    }

    /** A sync candidate: the pattern, its occurrences, its score and the word length its cut makes whole. */
    record Candidate(boolean[] pattern, int[] at, double score, int wordBits) {
    }

    /** Every candidate with {@link #MIN_OCCURRENCES} occurrences and a positive score, in the order tried ({@code counts} is used up). */
    static java.util.List<Candidate> rank(long[] lane, int n, int[] counts) {
        java.util.List<Candidate> out = new java.util.ArrayList<>();
        int[] tops = new int[CANDIDATES];
        int k = 0;
        for (; k < CANDIDATES; k++) {
            int top = 0;
            for (int x = 1; x < counts.length; x++) {
                if (counts[x] > counts[top]) {
                    top = x;
                }
            }
            if (counts[top] < MIN_OCCURRENCES) {
                break;
            }
            counts[top] = 0;
            tops[k] = top;
        }
        int[][] cores = windowOccurrences(lane, n, Arrays.copyOf(tops, k));
        for (int c = 0; c < k; c++) {
            int[] core = cores[c];
            int left = extend(lane, n, core, -1, 0, LEFT_AGREEMENT);
            boolean[] pattern = pattern(lane, n, core, left);
            // the extension may run on into the leading word most bursts share: shorter heads cut at every burst.
            // Every head still holds the window, so its occurrences are among the window's (no new scan)
            for (int len = pattern.length; len >= left + WINDOW_BITS; len--) {
                boolean[] p = Arrays.copyOf(pattern, len);
                int[] at = among(lane, n, core, left, p);
                // chance occurrences of the window in the data may have stopped the extension short of the
                // sync's first bits: extend again over the occurrences of the whole pattern
                int more = Math.min(SyncFinder.MAX_BITS - len, extend(lane, n, at, -1, 0, LEFT_AGREEMENT));
                if (more > 0) {
                    boolean[] q = new boolean[more + len];
                    for (int j = 0; j < more; j++) {
                        q[j] = majority(lane, n, at, j - more);
                    }
                    System.arraycopy(p, 0, q, more, len);
                    at = among(lane, n, at, more, q);
                    p = q;
                }
                double score = score(at, p.length, n);
                if (at.length >= MIN_OCCURRENCES && score > 0) {
                    out.add(new Candidate(p, at, score, wordBits(at, p.length, n)));
                }
            }
        }
        return out;
    }

    /** The majority bit at {@code offset} from the occurrences (a tie gives a zero, as in {@link #pattern}). */
    private static boolean majority(long[] lane, int n, int[] at, int offset) {
        int ones = 0;
        int seen = 0;
        for (int a : at) {
            int i = a + offset;
            if (i >= 0 && i < n) {
                seen++;
                ones += (int) (lane[i >>> 6] >>> i & 1L);
            }
        }
        return 2 * ones > seen;
    }

    /**
     * Whether the candidate sits inside a burst's header: one of the best {@link #HEADER_RIVALS}
     * candidates occurs within {@link SyncFinder#MAX_BITS} bits before nearly every occurrence of
     * it ({@link #HEADER_SHARE}), and not the other way round. A pattern of the header (a run of
     * zeros in a length field, say) recurs once a burst just as the sync does and cuts the stream
     * into the same lengths, a word or two late; before the real sync lies the end of the previous
     * burst, where no pattern recurs at a fixed distance.
     */
    private static boolean insideHeader(Candidate c, java.util.List<Candidate> ranked) {
        for (int r = 0; r < Math.min(HEADER_RIVALS, ranked.size()); r++) {
            Candidate a = ranked.get(r);
            if (a != c && follows(c.at(), a.at(), a.pattern().length) >= HEADER_SHARE
                    && follows(a.at(), c.at(), c.pattern().length) < HEADER_SHARE) {
                return true;
            }
        }
        return false;
    }

    /**
     * Share of the occurrences {@code at} that an occurrence of {@code before} (a pattern of
     * {@code beforeBits}) precedes, ending at or before it and starting at most
     * {@link SyncFinder#MAX_BITS} bits before it (an overlapping pattern is the same marker cut at
     * another bit, not a header's sync).
     */
    static double follows(int[] at, int[] before, int beforeBits) {
        int hit = 0;
        int j = -1;
        for (int a : at) {
            while (j + 1 < before.length && before[j + 1] + beforeBits <= a) {
                j++;
            }
            if (j >= 0 && a - before[j] <= SyncFinder.MAX_BITS) {
                hit++;
            }
        }
        return at.length == 0 ? 0 : hit / (double) at.length;
    }

    /**
     * Per window value, the starts of its non-overlapping occurrences in the first {@code n} bits,
     * all values found in one pass (each as {@link #occurrences} would find it alone).
     */
    private static int[][] windowOccurrences(long[] lane, int n, int[] values) {
        int[] slot = new int[1 << WINDOW_BITS];
        Arrays.fill(slot, -1);
        int[][] out = new int[values.length][];
        int[] m = new int[values.length];
        int[] next = new int[values.length];
        for (int c = 0; c < values.length; c++) {
            slot[values[c]] = c;
            out[c] = new int[16];
        }
        int mask = (1 << WINDOW_BITS) - 1;
        int v = 0;
        for (int i = 0; i < n; i++) {
            v = (v << 1 | (int) (lane[i >>> 6] >>> i & 1L)) & mask;
            int c = i >= WINDOW_BITS - 1 ? slot[v] : -1;
            int start = i - WINDOW_BITS + 1;
            if (c >= 0 && start >= next[c]) {
                if (m[c] == out[c].length) {
                    out[c] = Arrays.copyOf(out[c], 2 * m[c]);
                }
                out[c][m[c]++] = start;
                next[c] = start + WINDOW_BITS;
            }
        }
        for (int c = 0; c < values.length; c++) {
            out[c] = Arrays.copyOf(out[c], m[c]);
        }
        return out;
    }

    /** Starts of the non-overlapping occurrences of {@code p} among the window's occurrences moved {@code left} bits back. */
    private static int[] among(long[] lane, int n, int[] core, int left, boolean[] p) {
        int[] out = new int[core.length];
        int m = 0;
        for (int a : core) {
            int i = a - left;
            if (i < 0 || i + p.length > n || m > 0 && i < out[m - 1] + p.length) {
                continue;
            }
            int q = 0;
            while (q < p.length && ((lane[(i + q) >>> 6] >>> (i + q) & 1L) != 0) == p[q]) {
                q++;
            }
            if (q == p.length) {
                out[m++] = i;
            }
        }
        return Arrays.copyOf(out, m);
    }

    /** The window extended left and right while its occurrences {@code at} agree, each bit the majority. */
    private static boolean[] pattern(long[] lane, int n, int[] at, int left) {
        int right = extend(lane, n, at, +1, WINDOW_BITS - 1, AGREEMENT);
        int len = Math.min(SyncFinder.MAX_BITS, left + WINDOW_BITS + right);
        boolean[] pattern = new boolean[len];
        for (int p = 0; p < len; p++) {
            int ones = 0;
            int seen = 0;
            for (int a : at) {
                int i = a - left + p;
                if (i >= 0 && i < n) {
                    seen++;
                    ones += (int) (lane[i >>> 6] >>> i & 1L);
                }
            }
            pattern[p] = 2 * ones > seen;
        }
        return pattern;
    }

    /**
     * How well cutting at these occurrences frames the {@code n} bits searched: the product of two
     * shares, between 0 and 1, that do not grow with the number of pieces (a pattern of the
     * picture has far more pieces than there are bursts).
     * <ul>
     * <li>Whole words: the pieces between occurrences carry whole words after the pattern, so for
     * the right word length every piece length is whole, while a word length divides the lengths
     * of pieces cut at a pattern of the data only by chance ({@code 1/W}): the best (whole share
     * minus {@code 1/W}). The share counts distinct piece lengths, each weighted by how often it
     * occurs up to {@link #DISTINCT_WEIGHT_CAP}: the many data bursts of one length are one test of
     * divisibility, not many (weighted as in {@link WordLengthFinder}'s idle-run model), so a long
     * word that only divides the data bursts' length does not beat the one that divides them all.
     * <li>Recurring lengths: bursts repeat their lengths (the data bursts all carry the same
     * number of pixels, the commands a few parameter counts), so cut at the sync nearly every bit
     * lies in a piece whose length occurs again, while a pattern of the picture recurs at spacings
     * that follow the picture (a flat area: one pixel apart, then once in a long irregular gap):
     * the share of the {@code n} bits that lie in pieces whose length occurs at least
     * {@link #DISTINCT_WEIGHT_CAP} times (twice can be chance; a pattern with few occurrences
     * covers little of the stream), counted on the cut {@link #frame} would make: after
     * {@link #wholeCuts} has dropped the chance occurrences of the pattern inside data, which
     * would split data bursts into pieces of lengths that never recur.
     * </ul>
     * Together they are a test of the burst-length distribution the cut yields (common practice:
     * a frame marker recurs at the frame period; the whole-word test is the divisibility one of
     * {@link WordLengthFinder}).
     */
    private static double score(int[] at, int len, int n) {
        return pieceStats(at, len, n)[0];
    }

    /** Bits in the pieces between consecutive cuts whose length occurs at least {@link #DISTINCT_WEIGHT_CAP} times. */
    private static long recurringBits(int[] cuts) {
        int[] lengths = new int[Math.max(0, cuts.length - 1)];
        for (int b = 0; b + 1 < cuts.length; b++) {
            lengths[b] = cuts[b + 1] - cuts[b];
        }
        Arrays.sort(lengths);
        long bits = 0;
        for (int i = 0, j; i < lengths.length; i = j) {
            j = i;
            while (j < lengths.length && lengths[j] == lengths[i]) {
                j++;
            }
            bits += j - i >= DISTINCT_WEIGHT_CAP ? (long) (j - i) * lengths[i] : 0;
        }
        return bits;
    }

    /** Pieces of one length that count as separate tests of divisibility at most. */
    static final int DISTINCT_WEIGHT_CAP = 3;

    /** Share of the most pieces made whole that the cut filter's unit must make whole. */
    static final double UNIT_SHARE = 0.95;

    /** The shortest word length that makes nearly as many pieces whole as the best one. */
    private static int wordBits(int[] at, int len, int n) {
        return (int) pieceStats(at, len, n)[1];
    }

    /**
     * Drops an occurrence of the sync inside data (a chance match): a cut counts only where the
     * piece since the last cut kept is whole words of {@code wordBits} after the sync.
     */
    static int[] wholeCuts(int[] at, int len, int wordBits) {
        if (at.length == 0 || wordBits <= 0) {
            return at;
        }
        int[] out = new int[at.length];
        int m = 0;
        out[m++] = at[0];
        for (int b = 1; b < at.length; b++) {
            int payload = at[b] - out[m - 1] - len;
            if (payload > 0 && payload % wordBits == 0) {
                out[m++] = at[b];
            }
        }
        return Arrays.copyOf(out, m);
    }

    /** {score, word length}: see {@link #score}. */
    private static double[] pieceStats(int[] at, int len, int n) {
        int pieces = 0;
        int[] whole = new int[WordLengthFinder.MAX_BITS + 1];
        int[] payloads = new int[Math.max(0, at.length - 1)];
        for (int b = 0; b + 1 < at.length; b++) {
            int payload = at[b + 1] - at[b] - len;
            if (payload <= 0) {
                continue;
            }
            payloads[pieces++] = payload;
            for (int w = WordLengthFinder.MIN_BITS; w <= WordLengthFinder.MAX_BITS; w++) {
                if (payload % w == 0) {
                    whole[w]++;
                }
            }
        }
        Arrays.sort(payloads, 0, pieces);
        double weight = 0;
        double[] weightWhole = new double[WordLengthFinder.MAX_BITS + 1];
        for (int i = 0, j; i < pieces; i = j) {
            j = i;
            while (j < pieces && payloads[j] == payloads[i]) {
                j++;
            }
            int same = j - i;
            double wt = Math.min(same, DISTINCT_WEIGHT_CAP);
            weight += wt;
            for (int w = WordLengthFinder.MIN_BITS; w <= WordLengthFinder.MAX_BITS; w++) {
                if (payloads[i] % w == 0) {
                    weightWhole[w] += wt;
                }
            }
        }
        double best = 0;
        int most = 0;
        for (int w = WordLengthFinder.MIN_BITS; w <= WordLengthFinder.MAX_BITS && pieces > 0; w++) {
            best = Math.max(best, weightWhole[w] / weight - 1.0 / w);
            most = Math.max(most, whole[w]);
        }
        // the cut filter takes the shortest length that makes nearly as many pieces whole: a longer one may
        // make most, not all, pieces whole (a sync cut short by a word, pieces of an odd word count)
        int unit = 0;
        for (int w = WordLengthFinder.MIN_BITS; w <= WordLengthFinder.MAX_BITS && unit == 0 && pieces > 0; w++) {
            if (whole[w] >= UNIT_SHARE * most) {
                unit = w;
            }
        }
        return new double[] {unit == 0 ? 0 : best * recurringBits(wholeCuts(at, len, unit)) / (double) n, unit};
    }

    /** Starts of the non-overlapping exact occurrences of the pattern in the first {@code n} bits. */
    private static int[] occurrences(long[] lane, int n, boolean[] pattern, int len) {
        int[] out = new int[64];
        int m = 0;
        for (int i = 0; i + len <= n; i++) {
            int p = 0;
            while (p < len && ((lane[(i + p) >>> 6] >>> (i + p) & 1L) != 0) == pattern[p]) {
                p++;
            }
            if (p == len) {
                if (m == out.length) {
                    out = Arrays.copyOf(out, m * 2);
                }
                out[m++] = i;
                i += len - 1;
            }
        }
        return Arrays.copyOf(out, m);
    }

    /** Bits the pattern extends in direction {@code dir} from offset {@code edge} of each occurrence while they agree. */
    private static int extend(long[] lane, int n, int[] at, int dir, int edge, double agreement) {
        int d = 0;
        while (d < SyncFinder.MAX_BITS - WINDOW_BITS) {
            int ones = 0;
            int seen = 0;
            for (int a : at) {
                int i = a + edge + dir * (d + 1);
                if (i >= 0 && i < n) {
                    seen++;
                    ones += (int) (lane[i >>> 6] >>> i & 1L);
                }
            }
            int agree = Math.max(ones, seen - ones);
            if (seen < MIN_OCCURRENCES || agree < agreement * seen && (agreement == AGREEMENT || seen - agree > 1)) {
                break;
            }
            d++;
        }
        return d;
    }
}
