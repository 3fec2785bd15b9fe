package org.lanesift.runner.fakes;

import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Test-only plugin: analog in, edges out, transitions midway between samples either side of
 * 0.5 V; one annotation per rising edge. It declares segment support; with {@code lie=true} it
 * still does, but shifts every edge by the number of blocks it has seen, a state that never
 * settles, for the seam check to catch.
 */
public final class FakeEdges implements PluginProvider {
    static final PluginDescriptor D = PluginDescriptor.builder("fake-edges").name("Fake edges")
            .option(OptionSpec.bool("lie", false, "keep state longer than declared"))
            .input(PortSpec.of("in", DataKind.ANALOG, "voltage"))
            .output(PortSpec.of("out", DataKind.EDGES, "crossings of 0.5 V"))
            .segments(o -> SegmentSupport.after(1, 0))
            .build();

    @Override
    public PluginDescriptor descriptor() {
        return D;
    }

    @Override
    public Stage open(StageContext ctx) {
        boolean lie = ctx.options().getBoolean("lie");
        return new Stage() {
            long blocks;
            Boolean level;
            long endFs = Long.MIN_VALUE;

            @Override
            public void accept(int input, Block block) {
                AnalogBlock a = (AnalogBlock) block;
                long[] t = new long[a.length()];
                int n = 0;
                boolean initial = level == null ? a.volts()[0] > 0.5 : level;
                boolean l = initial;
                long start = endFs == Long.MIN_VALUE ? a.startFs() : endFs;
                for (int i = 0; i < a.length(); i++) {
                    boolean v = a.volts()[i] > 0.5;
                    if (v != l) {
                        long at = a.timeFs(i) - Math.round(a.periodFs() / 2) + (lie ? blocks : 0);
                        t[n++] = Math.max(start, at);
                        l = v;
                        if (v) {
                            ctx.annotate(Annotation.on(a.channel(), "rise").span(at, at).label("rising edge").build());
                        }
                    }
                }
                blocks++;
                level = l;
                long end = a.timeFs(a.length() - 1) + Math.round(a.periodFs() / 2);
                ctx.emit(0, new Edges(a.channel(), start, end, initial, t, n, null, 0));
                endFs = end;
            }
        };
    }
}
