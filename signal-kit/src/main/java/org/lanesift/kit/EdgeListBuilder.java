package org.lanesift.kit;

import java.util.Arrays;
import org.lanesift.data.Edges;

/**
 * Collects the transition times (femtoseconds, ascending) and unknown spans of one edge list as it
 * is found, in primitive arrays that grow by doubling, then builds the {@link Edges} block with
 * arrays of exact length. Reusable after {@link #clear()}; not thread-safe.
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

    /** Makes room for {@code more} further transitions at once. */
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

    /** @return transitions collected */
    public int timeCount() {
        return timeCount;
    }

    /** @return unknown spans collected */
    public int spanCount() {
        return spanCount;
    }

    /** @return transition {@code i}, femtoseconds */
    public long time(int i) {
        return times[i];
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
