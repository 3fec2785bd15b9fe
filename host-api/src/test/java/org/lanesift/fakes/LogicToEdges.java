package org.lanesift.fakes;

import org.lanesift.annotation.Annotation;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** Test plugin: converts logic to edges with a stateful converter and annotates every block. */
public final class LogicToEdges implements PluginProvider {
    @Override
    public PluginDescriptor descriptor() {
        return PluginDescriptor.builder("test.edges").name("Logic to edges")
                .input(PortSpec.of("in", DataKind.LOGIC, "logic"))
                .output(PortSpec.of("out", DataKind.EDGES, "edges")).build();
    }

    @Override
    public Stage open(StageContext ctx) {
        LogicEdges conv = new LogicEdges();
        return new Stage() {
            @Override
            public void accept(int input, Block block) {
                Edges e = conv.toEdges((LogicBlock) block);
                ctx.annotate(Annotation.on("test", "block").span(e.startFs(), e.endFs()).label(e.count() + " edges").build());
                ctx.emit(0, e);
            }
        };
    }
}
