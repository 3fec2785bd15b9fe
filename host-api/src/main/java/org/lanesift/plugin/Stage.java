package org.lanesift.plugin;

import org.lanesift.data.Block;

/**
 * A running plugin instance: it receives blocks in time order on its inputs, keeps whatever state
 * it needs across block boundaries, and emits blocks and annotations through its
 * {@link StageContext} at any time. A source stage has no inputs and produces blocks when the
 * engine calls {@link #produce()}.
 *
 * <p>The engine calls a stage from one thread at a time. A stage never learns whether it runs on a
 * whole file, on a live device or inside a GUI.
 */
public interface Stage {
    /**
     * Receives the next block on an input. Blocks on one input arrive in non-decreasing start
     * time; blocks from different inputs for the same span of the capture arrive one after the
     * other, so a stage with several inputs buffers until all of them cover a span.
     *
     * @param input index of the input port in the descriptor's input list
     * @param block the block; its kind matches the port
     * @throws Exception any failure; the engine stops the chain and reports it with this stage's name
     */
    default void accept(int input, Block block) throws Exception {
        throw new IllegalStateException("stage has no inputs");
    }

    /**
     * For sources: produces the next blocks (normally one per output, covering the same span).
     *
     * @return false when the source is exhausted
     * @throws Exception any failure
     */
    default boolean produce() throws Exception {
        return false;
    }

    /**
     * Called once after the last input block: flush what is buffered.
     *
     * @throws Exception any failure
     */
    default void finish() throws Exception {
    }

    /** Releases resources; called once, also after a failure or cancellation. */
    default void close() {
    }
}
