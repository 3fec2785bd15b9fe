package org.lanesift.data;

/**
 * The types a port can carry. A wire joins an output to an input of the same kind; an input of
 * kind {@link #ANY} accepts every kind.
 */
public enum DataKind {
    /** Sampled voltages, {@link AnalogBlock}. */
    ANALOG(AnalogBlock.class),
    /** Bit-packed logic samples, {@link LogicBlock}. */
    LOGIC(LogicBlock.class),
    /** Initial level plus sorted transition times, {@link Edges}. */
    EDGES(Edges.class),
    /** Sampled bits with times and margins, {@link BitStream}. */
    BITS(BitStream.class),
    /** Words with times and lanes, {@link WordStream}. */
    WORDS(WordStream.class),
    /** A decoded picture, {@link Frame}. */
    FRAME(Frame.class),
    /** A named file a plugin produced (report, table, image), {@link Artifact}. */
    ARTIFACT(Artifact.class),
    /** Any block; only valid on inputs (sinks, taps). */
    ANY(Block.class);

    private final Class<? extends Block> type;

    DataKind(Class<? extends Block> type) {
        this.type = type;
    }

    /**
     * The Java type of blocks of this kind.
     *
     * @return the block class
     */
    public Class<? extends Block> type() {
        return type;
    }

    /**
     * Whether an output of kind {@code from} may feed an input of this kind.
     *
     * @param from the output's kind
     * @return true if the wire is type-correct
     */
    public boolean accepts(DataKind from) {
        return this == ANY || this == from;
    }
}
