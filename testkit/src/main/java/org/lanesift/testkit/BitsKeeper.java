package org.lanesift.testkit;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PortSpec;

/**
 * A sink plugin for tests of per-bit margins on demand (host-api {@code BitStream}, "Margins only
 * for those who read them"): one input {@code in} of bit streams, declared as reading their margins
 * or not ({@code PortSpec.readingBitMargins}), that keeps every block it receives. One that declares
 * it reads them reads them on arrival (so a stream without them fails the chain); one that declares
 * it does not never touches them, so wiring it beside other receivers changes nothing and it can
 * watch what a producer sent.
 */
public final class BitsKeeper extends SinkPlugin {
    private final List<BitStream> kept = new ArrayList<>();
    private final boolean reads;

    /**
     * Creates the keeper.
     *
     * @param id    plugin id
     * @param reads whether its input declares that it reads the margins
     */
    public BitsKeeper(String id, boolean reads) {
        super(PluginDescriptor.builder(id).input(PortSpec.of("in", DataKind.BITS, "bit streams").readingBitMargins(reads)).build());
        this.reads = reads;
    }

    @Override
    protected void take(Block block) {
        BitStream b = (BitStream) block;
        if (reads) {
            b.setupFs();
            b.holdFs();
        }
        kept.add(b);
    }

    /**
     * The blocks received, in order, by every stage opened from this provider.
     *
     * @return the kept blocks
     */
    public List<BitStream> kept() {
        return kept;
    }

    /**
     * How many of the kept blocks carried their margins.
     *
     * @return a count
     */
    public int withMargins() {
        int n = 0;
        for (BitStream b : kept) {
            n += b.hasMargins() ? 1 : 0;
        }
        return n;
    }
}
