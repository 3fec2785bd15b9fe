package org.lanesift.data;

import java.util.Objects;

/**
 * One logic signal over the span {@code [startFs, endFs)} as an initial level plus the sorted
 * times at which it toggles, in femtoseconds. This is the form timing-critical plugins work on:
 * an interpolated threshold crossing keeps its sub-sample time exactly.
 *
 * <p>The level at time {@code t} is {@code initialLevel} toggled once for every transition time
 * {@code <= t}. Transition times lie in {@code [startFs, endFs)} and never decrease. Spans where
 * the signal is unknown (clipped, missing, x/z) are listed in {@code invalidSpans} as pairs
 * {@code [start, end)}; no transition inside them is trustworthy and producers emit none there.
 * When the signal leaves an unknown span at a different level than it entered it, the producer
 * places one transition exactly at the span's end, so the level after the span is right.
 *
 * @param channel      channel name
 * @param startFs      start of the covered span
 * @param endFs        end of the covered span, exclusive
 * @param initialLevel level at {@code startFs}
 * @param timesFs      transition times; at least {@code count} long
 * @param count        number of transitions
 * @param invalidSpans pairs of start/end times of unknown spans, or null; at least {@code 2 * invalidCount} long
 * @param invalidCount number of unknown spans
 */
public record Edges(String channel, long startFs, long endFs, boolean initialLevel, long[] timesFs, int count,
                    long[] invalidSpans, int invalidCount) implements Block {

    private static final long[] NONE = new long[0];

    /**
     * Checks the invariants, naming the channel and the first offending index.
     *
     * @param channel channel name
     * @param startFs start of the covered span
     * @param endFs end of the covered span, exclusive
     * @param initialLevel level at {@code startFs}
     * @param timesFs transition times; at least {@code count} long
     * @param count number of transitions
     * @param invalidSpans pairs of start/end times of unknown spans, or null; at least {@code 2 * invalidCount} long
     * @param invalidCount number of unknown spans
     */
    public Edges {
        Objects.requireNonNull(channel, "channel");
        if (timesFs == null) {
            throw new IllegalArgumentException("edge list '" + channel + "': transition times missing (null)");
        }
        if (endFs < startFs) {
            throw new IllegalArgumentException("edge list '" + channel + "': end " + endFs + " fs before start " + startFs + " fs");
        }
        if (count < 0 || count > timesFs.length) {
            throw new IllegalArgumentException("edge list '" + channel + "': count " + count + " outside 0.." + timesFs.length);
        }
        long prev = startFs;
        for (int i = 0; i < count; i++) {
            long t = timesFs[i];
            if (t < prev) {
                throw new IllegalArgumentException("edge list '" + channel + "': transition " + i + " at " + t
                        + " fs is " + (i == 0 ? "before the start " : "earlier than the one before it, ") + prev + " fs (expected sorted times inside the span)");
            }
            prev = t;
        }
        if (count > 0 && timesFs[count - 1] >= endFs) {
            throw new IllegalArgumentException("edge list '" + channel + "': last transition at " + timesFs[count - 1]
                    + " fs is not before the end of the span " + endFs + " fs");
        }
        if (invalidSpans == null) {
            invalidSpans = NONE;
            if (invalidCount != 0) {
                throw new IllegalArgumentException("edge list '" + channel + "': invalid span count without spans");
            }
        }
        if (invalidCount < 0 || 2 * invalidCount > invalidSpans.length) {
            throw new IllegalArgumentException("edge list '" + channel + "': invalid span count " + invalidCount + " does not fit the array");
        }
        for (int i = 0; i < invalidCount; i++) {
            if (invalidSpans[2 * i + 1] < invalidSpans[2 * i]) {
                throw new IllegalArgumentException("edge list '" + channel + "': unknown span " + i + " ends before it starts");
            }
        }
    }

    /**
     * An edge list with no unknown spans.
     *
     * @param channel      channel name
     * @param startFs      span start
     * @param endFs        span end, exclusive
     * @param initialLevel level at the start
     * @param timesFs      sorted transition times, all used
     * @return the edge list
     */
    public static Edges of(String channel, long startFs, long endFs, boolean initialLevel, long... timesFs) {
        return new Edges(channel, startFs, endFs, initialLevel, timesFs, timesFs.length, null, 0);
    }

    /**
     * The level after all transitions of this block, i.e. at {@code endFs}.
     *
     * @return the final level
     */
    public boolean finalLevel() {
        return initialLevel ^ ((count & 1) != 0);
    }

    /**
     * The level just after transition {@code i} (0-based).
     *
     * @param i transition index
     * @return level after it
     */
    public boolean levelAfter(int i) {
        return initialLevel ^ ((i & 1) == 0);
    }

    /**
     * Whether time {@code t} falls in an unknown span.
     *
     * @param t femtoseconds
     * @return true if unknown
     */
    public boolean isUnknownAt(long t) {
        for (int i = 0; i < invalidCount; i++) {
            if (t >= invalidSpans[2 * i] && t < invalidSpans[2 * i + 1]) {
                return true;
            }
        }
        return false;
    }

    /**
     * The project's one rule for transitions at unknown spans: a transition at {@code tFs} inside the
     * unknown span {@code [spanStartFs, spanEndFs)} or exactly on one of its bounds only tells the
     * level after the span (producers place such a transition at the span's end, see the class
     * comment); it is not an edge of the signal. Consumers must not count it as an edge, a clock
     * edge, or the end of a dropout, and must not time anything from it. A consumer that receives
     * the signal in several blocks checks a transition at a block's start against the last span of
     * the previous block as well (a span can end exactly where the next block begins).
     *
     * @param tFs         transition time, femtoseconds
     * @param spanStartFs start of an unknown span, femtoseconds
     * @param spanEndFs   end of that span, femtoseconds
     * @return true if the transition only restores the level and is no edge
     */
    public static boolean levelOnly(long tFs, long spanStartFs, long spanEndFs) {
        return tFs >= spanStartFs && tFs <= spanEndFs;
    }

    /**
     * {@link #levelOnly(long, long, long)} for transition {@code i} of this block against every
     * unknown span of this block.
     *
     * @param i transition index, {@code 0 <= i < count}
     * @return true if transition {@code i} only restores the level and is no edge
     */
    public boolean levelOnly(int i) {
        long t = timesFs[i];
        for (int s = 0; s < invalidCount; s++) {
            if (levelOnly(t, invalidSpans[2 * s], invalidSpans[2 * s + 1])) {
                return true;
            }
        }
        return false;
    }

    /**
     * The part of this edge list inside {@code [fromFs, toFs)}, clipped to the covered span: the
     * level at the new start, the transitions inside, and the unknown spans cut to fit (empty ones
     * dropped). Concatenating the slices of consecutive ranges gives back the same signal.
     *
     * @param fromFs start of the range
     * @param toFs   end of the range, exclusive; at least {@code fromFs}
     * @return the slice; this block itself when the range covers it
     * @throws IllegalArgumentException if the range does not overlap the covered span
     */
    public Edges slice(long fromFs, long toFs) {
        long a = Math.max(startFs, fromFs);
        long b = Math.min(endFs, toFs);
        if (toFs < fromFs || b < a) {
            throw new IllegalArgumentException("edge list '" + channel + "': range [" + fromFs + ", " + toFs
                    + ") fs is outside the covered span [" + startFs + ", " + endFs + ") fs");
        }
        if (a == startFs && b == endFs) {
            return this;
        }
        int lo = 0;
        while (lo < count && timesFs[lo] < a) {
            lo++;
        }
        int hi = lo;
        while (hi < count && timesFs[hi] < b) {
            hi++;
        }
        boolean level = initialLevel ^ ((lo & 1) != 0);
        long[] t = java.util.Arrays.copyOfRange(timesFs, lo, hi);
        long[] spans = null;
        int n = 0;
        for (int i = 0; i < invalidCount; i++) {
            long s = Math.max(a, invalidSpans[2 * i]);
            long e = Math.min(b, invalidSpans[2 * i + 1]);
            if (e > s) {
                if (spans == null) {
                    spans = new long[2 * invalidCount];
                }
                spans[2 * n] = s;
                spans[2 * n + 1] = e;
                n++;
            }
        }
        return new Edges(channel, a, b, level, t, t.length, spans, n);
    }

    @Override
    public DataKind kind() {
        return DataKind.EDGES;
    }

    @Override
    public String toString() {
        return "Edges[" + channel + ", " + count + " transitions, " + invalidCount + " unknown spans]";
    }
}
