package org.lanesift.plugin;

import java.util.List;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Block;

/**
 * What the engine gives a stage: its instance id, validated options, resolved ports, and the
 * means to emit blocks and annotations and to report progress.
 */
public interface StageContext {
    /**
     * The instance id in the chain, such as {@code "diff0"}.
     *
     * @return the id
     */
    String instanceId();

    /**
     * The validated options.
     *
     * @return options
     */
    OptionValues options();

    /**
     * Input ports, as resolved for these options.
     *
     * @return ports
     */
    List<PortSpec> inputs();

    /**
     * Output ports, as resolved for these options.
     *
     * @return ports
     */
    List<PortSpec> outputs();

    /**
     * Whether an output is connected to anything (a wire, a tap or a host sink). A stage may skip
     * work for unconnected outputs.
     *
     * @param output output index
     * @return true if someone receives it
     */
    boolean isConnected(int output);

    /**
     * Whether a source may lend the blocks it emits on an output: reuse their arrays for a later
     * block instead of handing every block new ones. It may only when every receiver of the output
     * declared {@link PluginDescriptor#readsLentBlocks()} and no host tap or host sink receives it
     * (those may keep blocks). A lent block's arrays stay unchanged until the source's next
     * {@link Stage#produce()} call begins; see {@link org.lanesift.data.Block}, "Ownership".
     *
     * @param output output index
     * @return true when the output's blocks may be lent; false by default
     */
    default boolean mayLend(int output) {
        return false;
    }

    /**
     * Whether anything that receives an output reads the per-bit setup and hold margins of the bit
     * streams sent on it. When it answers false, the stage may send its
     * {@link org.lanesift.data.BitStream}s without the two margin arrays (and save their memory);
     * when true, it must send them. The answer is true when a host tap receives the output, when a
     * wired input reads them ({@link PortSpec#readsBitMargins()}, true unless the receiving plugin
     * declared otherwise), or when the output reaches the host sink and the sink reads them
     * ({@link org.lanesift.chain.BlockSink#readsBitMargins}, true unless the host declared
     * otherwise); false when nothing receives the output. Ask at the first block, not when the stage
     * opens: a host may decide what it writes only once the chain is built. Only the margins are in
     * question: everything else a bit stream carries is always sent.
     *
     * @param output output index
     * @return true when the output's bit streams must carry margins; true by default
     */
    default boolean wantsBitMargins(int output) {
        return true;
    }

    /**
     * Sends a block downstream. Downstream stages run before this call returns.
     *
     * @param output output index
     * @param block  block of the output's kind
     */
    void emit(int output, Block block);

    /**
     * Sends a block by output name.
     *
     * @param output output name
     * @param block  block
     */
    default void emit(String output, Block block) {
        List<PortSpec> outs = outputs();
        for (int i = 0; i < outs.size(); i++) {
            if (outs.get(i).name().equals(output)) {
                emit(i, block);
                return;
            }
        }
        throw new IllegalArgumentException("stage '" + instanceId() + "' has no output '" + output + "'");
    }

    /**
     * Publishes an annotation.
     *
     * @param a the annotation
     */
    void annotate(Annotation a);

    /**
     * For sources: reports progress in samples.
     *
     * @param done  samples produced so far
     * @param total total samples, or -1 when unknown (live)
     */
    void progress(long done, long total);

    /**
     * Whether the host asked the chain to stop; long loops should check it.
     *
     * @return true once cancelled
     */
    boolean isCancelled();
}
