package org.lanesift.runner.segments;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;

/**
 * One front output of one segment, held from its decoding until the segment is stitched. Edge
 * lists are kept as their span, level and unknown spans plus their transition times copied into
 * chunks of a {@link TimeChunks} pool (the emitted arrays die young); they are rebuilt when read.
 * Other blocks (logic samples, artifacts) are kept as they are. Filled by one thread, then read
 * by another after a hand-over that orders the two (a completed future); not thread-safe.
 */
final class KeptStream {
    /** An edge list whose times sit at {@code offset} in {@code chunk}. */
    private record KeptEdges(String channel, long startFs, long endFs, boolean initialLevel, long[] chunk, int offset,
                             int count, long[] invalidSpans, int invalidCount) {
        Edges rebuild() {
            return new Edges(channel, startFs, endFs, initialLevel, Arrays.copyOfRange(chunk, offset, offset + count), count,
                    invalidCount == 0 ? null : invalidSpans, invalidCount);
        }
    }

    private final TimeChunks pool;
    private final List<Object> entries = new ArrayList<>();
    private final List<long[]> chunks = new ArrayList<>();
    private long[] chunk;
    private int used;

    KeptStream(TimeChunks pool) {
        this.pool = pool;
    }

    /**
     * Keeps a block, in order.
     *
     * @param b the block as the front emitted it; an edge list's arrays are not kept
     */
    void add(Block b) {
        if (!(b instanceof Edges e)) {
            entries.add(b);
            return;
        }
        int n = e.count();
        if (chunk == null || chunk.length - used < n) {
            chunk = pool.take(n);
            chunks.add(chunk);
            used = 0;
        }
        System.arraycopy(e.timesFs(), 0, chunk, used, n);
        long[] spans = e.invalidCount() == 0 ? null : Arrays.copyOf(e.invalidSpans(), 2 * e.invalidCount());
        entries.add(new KeptEdges(e.channel(), e.startFs(), e.endFs(), e.initialLevel(), chunk, used, n, spans, e.invalidCount()));
        used += n;
    }

    /**
     * The kept blocks as emitted, in order (edge lists rebuilt).
     *
     * @return the blocks
     */
    List<Block> blocks() {
        List<Block> l = new ArrayList<>(entries.size());
        for (Object o : entries) {
            l.add(o instanceof KeptEdges k ? k.rebuild() : (Block) o);
        }
        return l;
    }

    /**
     * The parts of the kept blocks in {@code [fromFs, toFs)}, in order, as
     * {@link SegmentedRun.Streams#clip} cuts them; an edge list outside the range is not rebuilt.
     *
     * @param fromFs start, femtoseconds
     * @param toFs   end, femtoseconds, exclusive
     * @return the clipped blocks, none null
     */
    List<Block> clipped(long fromFs, long toFs) {
        List<Block> l = new ArrayList<>();
        Iterator<Block> i = clippedOneByOne(fromFs, toFs);
        while (i.hasNext()) {
            l.add(i.next());
        }
        return l;
    }

    /**
     * As {@link #clipped}, each edge list rebuilt only when it is reached, so a caller that hands
     * the blocks on one at a time never holds the whole segment rebuilt.
     *
     * @param fromFs start, femtoseconds
     * @param toFs   end, femtoseconds, exclusive
     * @return the clipped blocks, none null
     */
    Iterator<Block> clippedOneByOne(long fromFs, long toFs) {
        return new Iterator<>() {
            private int next;
            private Block ahead = advance();

            private Block advance() {
                while (next < entries.size()) {
                    Object o = entries.get(next++);
                    Block b;
                    if (o instanceof KeptEdges k) {
                        long a = Math.max(k.startFs(), fromFs);
                        long z = Math.min(k.endFs(), toFs);
                        if (z < a || (z == a && k.endFs() > k.startFs())) {
                            continue; // clip would drop it
                        }
                        b = k.rebuild();
                    } else {
                        b = (Block) o;
                    }
                    Block c = SegmentedRun.Streams.clip(b, fromFs, toFs);
                    if (c != null) {
                        return c;
                    }
                }
                return null;
            }

            @Override
            public boolean hasNext() {
                return ahead != null;
            }

            @Override
            public Block next() {
                if (ahead == null) {
                    throw new NoSuchElementException();
                }
                Block b = ahead;
                ahead = advance();
                return b;
            }
        };
    }

    /** Gives the chunks back to the pool and forgets every block. */
    void release() {
        for (long[] c : chunks) {
            pool.give(c);
        }
        chunks.clear();
        entries.clear();
        chunk = null;
        used = 0;
    }
}
