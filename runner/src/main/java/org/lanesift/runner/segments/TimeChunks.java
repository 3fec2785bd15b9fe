package org.lanesift.runner.segments;

import java.util.concurrent.ConcurrentLinkedQueue;

/**
 * A pool of {@code long} arrays (transition times, femtoseconds) shared by the segments of one run:
 * a segment's kept edge lists live in chunks taken from here and given back once the segment is
 * stitched, so the arrays that live as long as a segment are allocated a few times per run rather
 * than once per block (with a copying collector, every young collection copied the blocks of the
 * segments held at that moment). Safe from any thread.
 */
final class TimeChunks {
    /** Longs per pooled chunk (1 MiB). */
    static final int CHUNK_LONGS = 1 << 17;
    private final ConcurrentLinkedQueue<long[]> free = new ConcurrentLinkedQueue<>();

    /**
     * A chunk with room for at least {@code longs} values: a pooled one when that fits.
     *
     * @param longs values needed
     * @return a chunk, contents undefined
     */
    long[] take(int longs) {
        if (longs > CHUNK_LONGS) {
            return new long[longs];
        }
        long[] c = free.poll();
        return c != null ? c : new long[CHUNK_LONGS];
    }

    /**
     * Hands a chunk back; only pooled-size chunks are kept.
     *
     * @param chunk a chunk from {@link #take}, no longer read by anyone
     */
    void give(long[] chunk) {
        if (chunk.length == CHUNK_LONGS) {
            free.add(chunk);
        }
    }
}
