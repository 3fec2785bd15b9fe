package org.lanesift.testkit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PortSpec;

/**
 * A sink plugin for tests of the lent-block rule (host-api {@code Block}, "Ownership"): it keeps
 * every analog or logic block it receives together with a copy of its sample array as it arrived.
 * Declared with {@code readsLentBlocks} it breaks the rule on purpose, so the blocks it keeps are
 * recycled under it (and poisoned in the test mode); {@link #changed()} counts them. Without the
 * declaration it is an honest receiver that may keep what it gets.
 */
public final class BlockKeeper extends SinkPlugin {
    private final List<Block> kept = new ArrayList<>();
    private final List<Object> copies = new ArrayList<>();

    /**
     * Creates the keeper.
     *
     * @param id       plugin id
     * @param kind     {@link DataKind#ANALOG} or {@link DataKind#LOGIC}: what its one input {@code in} takes
     * @param declares whether it declares {@code readsLentBlocks}
     */
    public BlockKeeper(String id, DataKind kind, boolean declares) {
        super(descriptor(id, kind, declares));
    }

    private static PluginDescriptor descriptor(String id, DataKind kind, boolean declares) {
        PluginDescriptor.Builder b = PluginDescriptor.builder(id).input(PortSpec.of("in", kind, "anything"));
        return (declares ? b.readsLentBlocks() : b).build();
    }

    @Override
    protected void take(Block block) {
        kept.add(block);
        copies.add(block instanceof AnalogBlock a ? a.volts().clone() : ((LogicBlock) block).bits().clone());
    }

    /**
     * The blocks received, in order.
     *
     * @return the kept blocks (their arrays may have changed since, if they were lent)
     */
    public List<Block> kept() {
        return kept;
    }

    /**
     * How many kept blocks no longer read as they did when they arrived.
     *
     * @return a count
     */
    public int changed() {
        int n = 0;
        for (int i = 0; i < kept.size(); i++) {
            boolean same = kept.get(i) instanceof AnalogBlock a
                    ? Arrays.equals(a.volts(), (float[]) copies.get(i))
                    : Arrays.equals(((LogicBlock) kept.get(i)).bits(), (long[]) copies.get(i));
            n += same ? 0 : 1;
        }
        return n;
    }
}
