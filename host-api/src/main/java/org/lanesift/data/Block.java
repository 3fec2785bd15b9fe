package org.lanesift.data;

/**
 * One piece of data travelling through a chain: a span of one channel's signal, edges, bits,
 * words, a picture or a file. Every block covers the time span {@code [startFs, endFs)} in
 * femtoseconds from the capture origin (see {@link org.lanesift.time.Femtos}); blocks on one wire
 * arrive in non-decreasing {@code startFs} order.
 *
 * <p><b>Ownership.</b> A block's arrays (such as {@link AnalogBlock#volts()} or
 * {@link LogicBlock#bits()}) are never changed by a receiver. By default the emitter gives them
 * up when it emits: it never changes them again, and any receiver may keep the block as long as it
 * likes. A source may instead <em>lend</em> the blocks of an output, reusing their arrays for later
 * blocks, but only where the engine allows it
 * ({@link org.lanesift.plugin.StageContext#mayLend(int)}): every receiver of that output declared
 * {@link org.lanesift.plugin.PluginDescriptor#readsLentBlocks()}, and no host tap or host sink
 * receives it. The rules for lent blocks:
 * <ul>
 * <li>who may keep one: nobody. A receiver reads it during {@code accept} and copies (for example
 * with {@code Arrays.copyOfRange}) whatever samples it needs after {@code accept} returns; it
 * never queues the block, keeps its arrays, or emits a block that shares them;</li>
 * <li>when it is recycled: when the source's next {@code produce()} call begins, its arrays may be
 * overwritten with a later span (the raw and packed-logic sources rotate two sets of arrays);</li>
 * <li>what a receiver must copy: every sample or mask word it uses after {@code accept} returns,
 * such as the tail of a block kept as filter history or a leg waiting for the other leg.</li>
 * </ul>
 * A lent block's arrays may be longer than its length only if its length says so; a source lends
 * full-length blocks only. Hosts and tests that collect blocks are safe: outputs they receive are
 * never lent.
 */
public interface Block {
    /**
     * Name of the channel, lane or product this block belongs to, as shown to the user.
     *
     * @return a short name, never null
     */
    String channel();

    /**
     * Start of the covered span.
     *
     * @return femtoseconds from the capture origin
     */
    long startFs();

    /**
     * End of the covered span (exclusive).
     *
     * @return femtoseconds from the capture origin, at least {@link #startFs()}
     */
    long endFs();

    /**
     * The kind of data, which decides which ports the block may travel between.
     *
     * @return the kind
     */
    DataKind kind();
}
