package org.lanesift.plugins.discovery;

import java.util.Arrays;

/**
 * Frames a streaming link (the clock never pauses and the lanes never idle) by its sync. The
 * {@link #CANDIDATES} {@link #WINDOW_BITS}-bit values that occur most often on lane 0 are each
 * extended left and right while at least {@link #AGREEMENT} of their occurrences agree bit by bit
 * (the bits before a sync are the end of the previous burst and vary, so the extension stops at
 * the sync's first bit); the pattern whose occurrences cut the stream into pieces of whole words
 * ({@link #score}) is the sync, and the stream is cut at every exact occurrence of it. Frequency
 * alone does not do: a smooth picture repeats its bit patterns more often than bursts start. The
 * piece before the first occurrence (a capture that starts mid-burst) is dropped. A link whose
 * sync is shorter than the window, or has none, stays one burst.
 */
final class StreamFramer {
    static final int WINDOW_BITS = 16;
    /** Occurrences needed. */
    static final int MIN_OCCURRENCES = 4;
    /** Share of occurrences that must agree for a bit to extend the pattern. */
    static final double AGREEMENT = 0.9;
    /** Bits of lane 0 searched for the window. */
    static final int SEARCH_BITS = 1 << 20;

    private StreamFramer() {
    }

    /** Windows tried, most frequent first. */
    static final int CANDIDATES = 64;

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
        boolean[] best = null;
        int bestWord = 0;
        double bestScore = MIN_OCCURRENCES;
        for (int c = 0; c < CANDIDATES; c++) {
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
            int[] core = occurrences(lane, n, windowBits(top), WINDOW_BITS);
            int left = extend(lane, n, core, -1, 0);
            boolean[] pattern = pattern(lane, n, core, left);
            // the extension may run on into the leading word most bursts share: shorter heads cut at every burst.
            // Every head still holds the window, so its occurrences are among the window's (no new scan)
            for (int len = pattern.length; len >= left + WINDOW_BITS; len--) {
                boolean[] p = Arrays.copyOf(pattern, len);
                int[] at = among(lane, n, core, left, p);
                double score = score(at, len);
                if (score > bestScore) {
                    bestScore = score;
                    best = p;
                    bestWord = wordBits(at, len);
                }
            }
        }
        if (best == null) {
            return link;
        }
        int[] starts = wholeCuts(occurrences(lane, link.bits(), best, best.length), best.length, bestWord);
        int[] end = new int[starts.length];
        for (int b = 0; b < starts.length; b++) {
            end[b] = b + 1 < starts.length ? starts[b + 1] : link.bits();
        }
        return new SampledLink(link.lanes(), link.bits(), starts, end, starts.length, link.idleLevel(), "streaming", link.idleRunBits());
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
        int right = extend(lane, n, at, +1, WINDOW_BITS - 1);
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
     * How well cutting at these occurrences frames the stream: the pieces between them carry whole
     * words after the pattern, so for the right word length nearly every piece is whole, while
     * pieces cut at a pattern of the data have lengths that a word length divides only by chance
     * ({@code 1/W}): the piece count times the best (whole share minus {@code 1/W}).
     */
    private static double score(int[] at, int len) {
        return pieceStats(at, len)[0];
    }

    /** Share of the most pieces made whole that the cut filter's unit must make whole. */
    static final double UNIT_SHARE = 0.95;

    /** The shortest word length that makes nearly as many pieces whole as the best one. */
    private static int wordBits(int[] at, int len) {
        return (int) pieceStats(at, len)[1];
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
    private static double[] pieceStats(int[] at, int len) {
        int pieces = 0;
        int[] whole = new int[WordLengthFinder.MAX_BITS + 1];
        for (int b = 0; b + 1 < at.length; b++) {
            int payload = at[b + 1] - at[b] - len;
            if (payload <= 0) {
                continue;
            }
            pieces++;
            for (int w = WordLengthFinder.MIN_BITS; w <= WordLengthFinder.MAX_BITS; w++) {
                if (payload % w == 0) {
                    whole[w]++;
                }
            }
        }
        double best = 0;
        int most = 0;
        for (int w = WordLengthFinder.MIN_BITS; w <= WordLengthFinder.MAX_BITS && pieces > 0; w++) {
            best = Math.max(best, whole[w] / (double) pieces - 1.0 / w);
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
        return new double[] {pieces * best, unit};
    }

    private static boolean[] windowBits(int value) {
        boolean[] p = new boolean[WINDOW_BITS];
        for (int j = 0; j < WINDOW_BITS; j++) {
            p[j] = (value >>> (WINDOW_BITS - 1 - j) & 1) != 0;
        }
        return p;
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
    private static int extend(long[] lane, int n, int[] at, int dir, int edge) {
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
            if (seen < MIN_OCCURRENCES || Math.max(ones, seen - ones) < AGREEMENT * seen) {
                break;
            }
            d++;
        }
        return d;
    }
}
