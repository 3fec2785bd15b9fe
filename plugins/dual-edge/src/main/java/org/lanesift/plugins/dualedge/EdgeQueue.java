package org.lanesift.plugins.dualedge;

import java.util.Arrays;
import org.lanesift.data.Edges;

/**
 * The not yet consumed transitions of one input, gathered across blocks. Transition number
 * {@code g} (counted from the start of the capture, the "global index") sits at
 * {@code t[g - base]}; the level after it is {@code initialLevel ^ ((g & 1) == 0)}. Unknown spans,
 * gaps between blocks, and level jumps between blocks are kept as unknown spans {@code [a, b)}.
 */
final class EdgeQueue {
    final String port;
    String channel;
    boolean started;
    boolean initialLevel;
    /** Start of the first block, femtoseconds. */
    long startFs;
    /** End of the latest block (exclusive): every transition before it is known. */
    long endFs;
    long[] t = new long[1024];
    int head;
    int tail;
    /** Global index of {@code t[0]}. */
    long base;
    long[] spans = new long[16];
    int spanHead;
    int spanTail;

    EdgeQueue(String port) {
        this.port = port;
    }

    /**
     * Adds the next block.
     *
     * @param e the block
     * @throws IllegalArgumentException if it overlaps the previous block
     */
    void append(Edges e) {
        if (!started) {
            started = true;
            channel = e.channel();
            initialLevel = e.initialLevel();
            startFs = e.startFs();
            endFs = e.startFs();
        } else {
            if (e.startFs() < endFs) {
                throw new org.lanesift.plugin.InputFormatException("input '" + port + "' (channel '" + e.channel() + "'): block starts at "
                        + e.startFs() + " fs, before the end " + endFs + " fs of the previous block; blocks on one input must"
                        + " follow each other without overlapping");
            }
            if (e.startFs() > endFs) {
                addSpan(endFs, e.startFs());
            }
            if (e.initialLevel() != levelAfterAll()) {
                // the level jumped between blocks: place a transition at the block start, its time unknown
                addSpan(Math.min(endFs, e.startFs()), e.startFs() + 1);
                push(e.startFs());
            }
        }
        int n = e.count();
        long[] src = e.timesFs();
        ensure(n);
        System.arraycopy(src, 0, t, tail, n);
        tail += n;
        t[tail] = Long.MAX_VALUE; // sentinel for branch-free scans
        for (int i = 0; i < e.invalidCount(); i++) {
            addSpan(e.invalidSpans()[2 * i], e.invalidSpans()[2 * i + 1]);
        }
        endFs = e.endFs();
    }

    private void push(long time) {
        ensure(1);
        t[tail++] = time;
        t[tail] = Long.MAX_VALUE;
    }

    /** Room for {@code n} more transitions plus the sentinel {@code t[tail] = Long.MAX_VALUE}. */
    private void ensure(int n) {
        n++;
        if (tail + n > t.length) {
            if (head > 0) {
                System.arraycopy(t, head, t, 0, tail - head + 1);
                base += head;
                tail -= head;
                head = 0;
            }
            if (tail + n > t.length) {
                t = Arrays.copyOf(t, Math.max(t.length * 2, tail + n));
            }
        }
    }

    boolean levelAfterAll() {
        return initialLevel ^ (((base + tail) & 1) != 0);
    }

    long globalEnd() {
        return base + tail;
    }

    long globalStart() {
        return base + head;
    }

    long time(long g) {
        return t[(int) (g - base)];
    }

    /**
     * Whether transition {@code g} goes from low to high.
     *
     * @param g global index
     * @return true for a rising transition
     */
    boolean rising(long g) {
        return initialLevel ^ ((g & 1) == 0);
    }

    /**
     * Drops transitions before global index {@code g}.
     *
     * @param g first index to keep
     */
    void discardBefore(long g) {
        int k = (int) Math.min(tail, Math.max(head, g - base));
        head = k;
        compactIfSparse();
    }

    /**
     * Drops transitions earlier than a time, and unknown spans that ended before it.
     *
     * @param timeFs keep transitions at or after this time
     */
    void discardBeforeTime(long timeFs) {
        while (head < tail && t[head] < timeFs) {
            head++;
        }
        compactIfSparse();
        discardSpansBefore(timeFs);
    }

    private void compactIfSparse() {
        if (head > 4096 && head > (tail >> 1)) {
            System.arraycopy(t, head, t, 0, tail - head + 1);
            base += head;
            tail -= head;
            head = 0;
        }
    }

    void addSpan(long a, long b) {
        if (b <= a) {
            return;
        }
        if (spanTail > spanHead && a <= spans[spanTail - 1]) {
            spans[spanTail - 1] = Math.max(spans[spanTail - 1], b);
            return;
        }
        if (spanTail + 2 > spans.length) {
            if (spanHead > 0) {
                System.arraycopy(spans, spanHead, spans, 0, spanTail - spanHead);
                spanTail -= spanHead;
                spanHead = 0;
            }
            if (spanTail + 2 > spans.length) {
                spans = Arrays.copyOf(spans, spans.length * 2);
            }
        }
        spans[spanTail++] = a;
        spans[spanTail++] = b;
    }

    void discardSpansBefore(long timeFs) {
        while (spanHead < spanTail && spans[spanHead + 1] <= timeFs) {
            spanHead += 2;
        }
    }

    boolean hasSpans() {
        return spanTail > spanHead;
    }

    /**
     * Whether an unknown span meets {@code [a, b]}.
     *
     * @param a start
     * @param b end (inclusive)
     * @return true if some span overlaps
     */
    boolean spanOverlaps(long a, long b) {
        for (int i = spanHead; i < spanTail; i += 2) {
            if (spans[i] > b) {
                return false;
            }
            if (spans[i + 1] > a) {
                return true;
            }
        }
        return false;
    }

    /**
     * Whether a transition at {@code t} lies in an unknown span or exactly at its end. Such a
     * transition only restores the level after the span (the producers' convention, see
     * {@link Edges}), or is the one {@link #append} places at a block start after a level jump; its
     * time is not the time of a signal edge.
     *
     * @param t transition time
     * @return true if it only tells the level
     */
    boolean levelOnly(long t) {
        for (int i = spanHead; i < spanTail && spans[i] <= t; i += 2) {
            if (Edges.levelOnly(t, spans[i], spans[i + 1])) {
                return true;
            }
        }
        return false;
    }

    /**
     * Number of transitions held.
     *
     * @return count
     */
    int size() {
        return tail - head;
    }
}
