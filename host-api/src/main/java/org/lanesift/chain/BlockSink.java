package org.lanesift.chain;

import org.lanesift.data.Block;

/**
 * Receives blocks a chain emits on outputs that no wire consumes, so a host can write, draw or
 * collect them.
 */
@FunctionalInterface
public interface BlockSink {
    /**
     * Takes one block.
     *
     * @param instanceId emitting instance
     * @param output     output port name
     * @param block      the block
     */
    void accept(String instanceId, String output, Block block);
}
