package org.lanesift.data;

import java.util.Arrays;

/**
 * Collects the transition times (femtoseconds, ascending) and unknown spans of one edge list as it
 * is found, in primitive arrays that grow by doubling, then builds the {@link Edges} block with
 * arrays of exact length. Reusable after {@link #clear()}; not thread-safe. The one growable edge
 * list of the project: the logic-to-edges converter, the VCD reader and the plugins build their
 * edge lists with it.
 */
public final class EdgeListBuilder {
    private long[] times;
    private int timeCount;
    private long[] spans = new long[8];
    private int spanCount;

    /** Creates a builder with room for 16 transitions. */
    public EdgeListBuilder() {
        this(16);
    }

    /** @param capacity initial room for transitions, at least 1 */
    public EdgeListBuilder(int capacity) {
        times = new long[Math.max(1, capacity)];
    }

    /**
     * Makes room for further transitions at once.
     *
     * @param more how many transitions will follow
     */
    public void reserve(int more) {
        if (timeCount + more > times.length) {
            times = Arrays.copyOf(times, Math.max(times.length * 2, timeCount + more));
        }
    }

    /** @param timeFs the next transition time, femtoseconds, not before the previous one */
    public void addTime(long timeFs) {
        if (timeCount == times.length) {
            times = Arrays.copyOf(times, times.length * 2);
        }
        times[timeCount++] = timeFs;
    }

    /**
     * Appends an unknown span.
     *
     * @param startFs span start, femtoseconds
     * @param endFs   span end, femtoseconds
     */
    public void addSpan(long startFs, long endFs) {
        if (2 * spanCount + 2 > spans.length) {
            spans = Arrays.copyOf(spans, spans.length * 2);
        }
        spans[2 * spanCount] = startFs;
        spans[2 * spanCount + 1] = endFs;
        spanCount++;
    }

    /**
     * Appends an unknown span, or extends the last one when it ends exactly where this one starts;
     * an empty span ({@code endFs <= startFs}) is ignored.
     *
     * @param startFs span start, femtoseconds
     * @param endFs   span end, femtoseconds
     */
    public void addSpanJoined(long startFs, long endFs) {
        if (endFs <= startFs) {
            return;
        }
        if (spanCount > 0 && spans[2 * spanCount - 1] == startFs) {
            spans[2 * spanCount - 1] = endFs;
            return;
        }
        addSpan(startFs, endFs);
    }

    /** @return transitions collected */
    public int timeCount() {
        return timeCount;
    }

    /** @return unknown spans collected */
    public int spanCount() {
        return spanCount;
    }

    /**
     * A transition collected so far.
     *
     * @param i its number, from 0
     * @return transition {@code i}, femtoseconds
     */
    public long time(int i) {
        return times[i];
    }

    /** @return the last transition collected, femtoseconds; the builder must hold one */
    public long lastTime() {
        return times[timeCount - 1];
    }

    /**
     * Counts the leading transitions before a time.
     *
     * @param timeFs the time, femtoseconds
     * @return how many leading transitions lie before {@code timeFs}
     */
    public int timesBefore(long timeFs) {
        int n = 0;
        while (n < timeCount && times[n] < timeFs) {
            n++;
        }
        return n;
    }

    /**
     * Takes the first {@code n} transitions out, for a caller that hands edges on in pieces.
     *
     * @param n how many, at most {@link #timeCount()}
     * @return them, in an array of exact length
     */
    public long[] removeFirstTimes(int n) {
        long[] out = Arrays.copyOf(times, n);
        System.arraycopy(times, n, times, 0, timeCount - n);
        timeCount -= n;
        return out;
    }

    /**
     * Start of an unknown span.
     *
     * @param i its number, from 0
     * @return start of unknown span {@code i}, femtoseconds
     */
    public long spanStart(int i) {
        return spans[2 * i];
    }

    /**
     * End of an unknown span.
     *
     * @param i its number, from 0
     * @return end of unknown span {@code i}, femtoseconds
     */
    public long spanEnd(int i) {
        return spans[2 * i + 1];
    }

    /**
     * Keeps, in order, only the unknown spans that end after a time.
     *
     * @param timeFs the time, femtoseconds
     */
    public void keepSpansEndingAfter(long timeFs) {
        int keep = 0;
        for (int i = 0; i < spanCount; i++) {
            if (spans[2 * i + 1] > timeFs) {
                spans[2 * keep] = spans[2 * i];
                spans[2 * keep + 1] = spans[2 * i + 1];
                keep++;
            }
        }
        spanCount = keep;
    }

    /** Forgets everything collected, keeping the arrays. */
    public void clear() {
        timeCount = 0;
        spanCount = 0;
    }

    /**
     * Builds the edge list of what was collected (arrays copied to their exact length; the spans
     * are null when there are none). The builder is left as it was.
     *
     * @param channel      channel name
     * @param startFs      start of the list's time span
     * @param endFs        end of the list's time span
     * @param initialLevel level before the first transition
     * @return the edges
     */
    public Edges build(String channel, long startFs, long endFs, boolean initialLevel) {
        long[] t = Arrays.copyOf(times, timeCount);
        long[] s = spanCount == 0 ? null : Arrays.copyOf(spans, 2 * spanCount);
        return new Edges(channel, startFs, endFs, initialLevel, t, timeCount, s, spanCount);
    }
}
