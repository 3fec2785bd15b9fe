package org.lanesift.chain;

import org.lanesift.data.Block;

/**
 * Receives blocks a chain emits on outputs that no wire consumes, so a host can write, draw or
 * collect them. A host that keeps only some of them says so with {@link #wants}: an output it does
 * not want counts as unconnected ({@code StageContext.isConnected} is false), so a stage may skip
 * making it, and its blocks are not delivered.
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

    /**
     * Whether the host wants an unwired output's blocks. The chain asks once per output, when the
     * output is first emitted on or its connection first queried (after the chain is built, so a
     * host may decide once it knows the chain's outputs).
     *
     * @param instanceId emitting instance
     * @param output     output port name
     * @return true (the default) to receive its blocks
     */
    default boolean wants(String instanceId, String output) {
        return true;
    }

    /**
     * Whether the host reads the per-bit setup and hold margins of the bit streams it receives from
     * an unwired output ({@code BitStream.setupFs()}, {@code holdFs()}). A host that answers false
     * may receive them without margins ({@code BitStream.hasMargins()} false) and must then never
     * ask for them. Asked when the emitting stage asks the engine
     * ({@link org.lanesift.plugin.StageContext#wantsBitMargins(int)}), after the chain is built.
     *
     * @param instanceId emitting instance
     * @param output     output port name
     * @return true (the default) when the host reads the margins
     */
    default boolean readsBitMargins(String instanceId, String output) {
        return true;
    }
}
