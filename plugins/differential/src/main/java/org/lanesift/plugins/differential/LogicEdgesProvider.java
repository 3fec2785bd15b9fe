package org.lanesift.plugins.differential;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The {@code logic-edges} stage: turns N logic channels (such as the {@code ch0}.. outputs of the
 * {@code spool} source) into edge lists, the form the timing plugins take, one output per channel.
 * Transitions sit half a sample before the first sample of the new level
 * ({@link org.lanesift.data.LogicEdges}). Where a channel's blocks do not follow each other (a gap
 * in the capture) the converter forgets the level, so no transition is invented across the gap.
 * At the end each channel gets a {@code logic-activity} annotation: transitions, shortest high
 * and low pulse seen between two transitions of one gap-free stretch, and the gaps. It lives here,
 * with the module's other conversions of signals to logic and edges; its id and options are those
 * it had in the serial-source module, so chain files keep working.
 */
public final class LogicEdgesProvider implements PluginProvider {
    /** Largest channel count. */
    static final int MAX_CHANNELS = 64;

    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("logic-edges")
            .name("Logic to edges")
            .description("Turns N logic channels into edge lists (transitions half a sample before the new level); "
                    + "a gap between blocks resets the channel, so no edge is made up across it.")
            .option(OptionSpec.integer("channels", 8L, 1, MAX_CHANNELS, "number of channels N: inputs in0..in<N-1>, outputs out0..out<N-1>"))
            .inputs(LogicEdgesProvider::inputs)
            .outputs(LogicEdgesProvider::outputs)
            .build();

    /** Creates the provider (ServiceLoader). */
    public LogicEdgesProvider() {
    }

    private static List<PortSpec> inputs(OptionValues o) {
        List<PortSpec> l = new ArrayList<>();
        for (int i = 0; i < o.getInt("channels"); i++) {
            l.add(PortSpec.of("in" + i, DataKind.LOGIC, "logic channel " + i));
        }
        return l;
    }

    private static List<PortSpec> outputs(OptionValues o) {
        List<PortSpec> l = new ArrayList<>();
        for (int i = 0; i < o.getInt("channels"); i++) {
            l.add(PortSpec.of("out" + i, DataKind.EDGES, "edges of channel " + i + ", same channel name"));
        }
        return l;
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext ctx) {
        return new LogicEdgesStage(ctx, ctx.options().getInt("channels"));
    }
}
