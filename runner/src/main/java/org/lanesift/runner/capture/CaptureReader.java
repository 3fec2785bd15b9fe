package org.lanesift.runner.capture;

import java.io.Closeable;
import java.io.IOException;
import java.util.List;
import org.lanesift.data.Block;
import org.lanesift.plugin.PortSpec;

/**
 * A streaming reader of one capture file: it knows its channels from the header and hands out
 * one block per channel per {@link #next} call, all covering the same span. Shared by the source
 * stages and {@link Inspector}.
 */
interface CaptureReader extends Closeable {

    /** Receives the blocks of one span. */
    @FunctionalInterface
    interface Out {
        void emit(int channel, Block block);
    }

    /** One port per channel, in channel order. */
    List<PortSpec> ports();

    /** Unit of each channel's values ("V", "mV" as read, "" for logic). */
    List<String> units();

    /**
     * Reads the next span and emits one block per channel.
     *
     * @return false when the file is exhausted (nothing emitted)
     */
    boolean next(Out out) throws IOException;

    /**
     * Lets the reader lend the blocks of some channels (reuse their arrays for a later span, see
     * {@code org.lanesift.data.Block}, "Ownership"); before the first {@link #next}. Readers that
     * cannot lend ignore it.
     *
     * @param perChannel one flag per channel
     */
    default void lend(boolean[] perChannel) {
    }

    /** Work done so far, in samples (CSV rows, raw frames) or value changes (VCD). */
    long done();

    /** Total work, or -1 when not known (an estimate from the file size for CSV). */
    long total();

    @Override
    void close() throws IOException;
}
