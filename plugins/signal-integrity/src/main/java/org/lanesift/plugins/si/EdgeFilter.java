package org.lanesift.plugins.si;

import org.lanesift.data.Edges;

/**
 * Applies the project's rule {@link Edges#levelOnly(long, long, long)} to a stream of edge blocks:
 * a transition inside an unknown span or at its end is no edge. Besides the block's own spans it
 * remembers the last unknown span of the previous block, because a span can end exactly where the
 * next block begins and the transition that restores the level then opens the next block. Times
 * are femtoseconds. One instance per input; not thread-safe.
 */
final class EdgeFilter {
    private long carriedStartFs = Long.MAX_VALUE;
    private long carriedEndFs = Long.MIN_VALUE;

    /**
     * Whether transition {@code i} of {@code e} is a true edge of the signal.
     *
     * @param e the current block
     * @param i transition index
     * @return false if it only restores the level after an unknown span
     */
    boolean isEdge(Edges e, int i) {
        return !e.levelOnly(i) && !Edges.levelOnly(e.timesFs()[i], carriedStartFs, carriedEndFs);
    }

    /**
     * Call after a block has been handled: remembers its last unknown span for the next block.
     *
     * @param e the block just handled
     */
    void done(Edges e) {
        if (e.invalidCount() > 0) {
            carriedStartFs = e.invalidSpans()[2 * e.invalidCount() - 2];
            carriedEndFs = e.invalidSpans()[2 * e.invalidCount() - 1];
        }
    }
}
