package org.lanesift.testkit;

import org.lanesift.data.Block;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * A test plugin that only receives: the given descriptor, and stages that hand every block they
 * receive to {@link #take}. Every stage opened from one provider shares that provider's state.
 */
public abstract class SinkPlugin implements PluginProvider {
    private final PluginDescriptor descriptor;

    /**
     * Creates the plugin.
     *
     * @param descriptor its descriptor (ids, inputs and declarations)
     */
    protected SinkPlugin(PluginDescriptor descriptor) {
        this.descriptor = descriptor;
    }

    @Override
    public final PluginDescriptor descriptor() {
        return descriptor;
    }

    @Override
    public final Stage open(StageContext context) {
        return new Stage() {
            @Override
            public void accept(int input, Block block) {
                take(block);
            }
        };
    }

    /**
     * Receives one block, on the thread that runs the chain.
     *
     * @param block the block
     */
    protected abstract void take(Block block);
}
