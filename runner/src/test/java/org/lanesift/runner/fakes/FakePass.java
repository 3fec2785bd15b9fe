package org.lanesift.runner.fakes;

import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** Test-only plugin: passes edges through unchanged. */
public final class FakePass implements PluginProvider {
    static final PluginDescriptor D = PluginDescriptor.builder("fake-pass").name("Fake pass-through")
            .input(PortSpec.of("in", DataKind.EDGES, "edges"))
            .output(PortSpec.of("out", DataKind.EDGES, "the same edges"))
            .build();

    @Override
    public PluginDescriptor descriptor() {
        return D;
    }

    @Override
    public Stage open(StageContext ctx) {
        return new Stage() {
            @Override
            public void accept(int input, Block block) {
                ctx.emit(0, block);
            }
        };
    }
}
