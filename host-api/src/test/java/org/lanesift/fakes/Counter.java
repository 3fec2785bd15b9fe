package org.lanesift.fakes;

import org.lanesift.data.AnalogBlock;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** Test source: emits {@code blocks} analog blocks of {@code size} samples of a ramp. */
public final class Counter implements PluginProvider {
    @Override
    public PluginDescriptor descriptor() {
        return PluginDescriptor.builder("test.ramp").option(OptionSpec.integer("blocks", 3L, 0, 1000, "block count"))
                .option(OptionSpec.integer("size", 100L, 1, 1 << 20, "samples per block"))
                .output(PortSpec.of("out", DataKind.ANALOG, "ramp")).build();
    }

    @Override
    public Stage open(StageContext ctx) {
        int blocks = ctx.options().getInt("blocks");
        int size = ctx.options().getInt("size");
        return new Stage() {
            int k;

            @Override
            public boolean produce() {
                if (k >= blocks) {
                    return false;
                }
                float[] v = new float[size];
                for (int i = 0; i < size; i++) {
                    v[i] = k * size + i;
                }
                ctx.emit(0, new AnalogBlock("ramp", (long) k * size, Math.round(k * size * 1e6), 1e6, v, size, null));
                k++;
                ctx.progress((long) k * size, (long) blocks * size);
                return k < blocks;
            }
        };
    }
}
