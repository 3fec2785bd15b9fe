package org.lanesift.runner.fakes;

import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/** Test-only plugin: analog in, logic out (sample above the threshold is 1). */
public final class FakeThreshold implements PluginProvider {
    static final PluginDescriptor D = PluginDescriptor.builder("fake-threshold").name("Fake threshold")
            .option(OptionSpec.number("thresholdVolts", "V", 0.5, -10.0, 10.0, "decision level"))
            .input(PortSpec.of("in", DataKind.ANALOG, "voltage"))
            .output(PortSpec.of("out", DataKind.LOGIC, "levels"))
            .build();

    @Override
    public PluginDescriptor descriptor() {
        return D;
    }

    @Override
    public Stage open(StageContext ctx) {
        double th = ctx.options().getDouble("thresholdVolts");
        return new Stage() {
            @Override
            public void accept(int input, Block block) {
                AnalogBlock a = (AnalogBlock) block;
                long[] bits = new long[BitSets.words(a.length())];
                for (int i = 0; i < a.length(); i++) {
                    BitSets.set(bits, i, a.volts()[i] > th);
                }
                ctx.emit(0, new LogicBlock(a.channel(), a.firstIndex(), a.startFs(), a.periodFs(), bits, a.length(), a.invalid()));
            }
        };
    }
}
