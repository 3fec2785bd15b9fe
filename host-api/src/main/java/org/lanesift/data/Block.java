package org.lanesift.data;

/**
 * One piece of data travelling through a chain: a span of one channel's signal, edges, bits,
 * words, a picture or a file. Every block covers the time span {@code [startFs, endFs)} in
 * femtoseconds from the capture origin (see {@link org.lanesift.time.Femtos}); blocks on one wire
 * arrive in non-decreasing {@code startFs} order.
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
