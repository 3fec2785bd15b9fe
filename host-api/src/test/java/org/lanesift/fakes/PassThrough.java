package org.lanesift.fakes;

import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** Test plugin: passes blocks of one kind through unchanged; can be told to fail on block N. */
public final class PassThrough implements PluginProvider {
    @Override
    public PluginDescriptor descriptor() {
        return PluginDescriptor.builder("test.pass").name("Pass through").version("1.0")
                .option(OptionSpec.choice("kind", "ANALOG", "kind of data", "ANALOG", "LOGIC", "EDGES"))
                .option(OptionSpec.integer("failAt", -1L, -1, 1_000_000, "fail on this block index"))
                .inputs(o -> java.util.List.of(PortSpec.of("in", DataKind.valueOf(o.getString("kind")), "input")))
                .outputs(o -> java.util.List.of(PortSpec.of("out", DataKind.valueOf(o.getString("kind")), "output")))
                .build();
    }

    @Override
    public Stage open(StageContext ctx) {
        long failAt = ctx.options().getLong("failAt");
        return new Stage() {
            long n;

            @Override
            public void accept(int input, Block block) {
                if (n++ == failAt) {
                    throw new IllegalStateException("deliberate failure at block " + failAt);
                }
                ctx.emit(0, block);
            }
        };
    }
}
