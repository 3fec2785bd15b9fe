package org.lanesift.chain;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

class SmokeTest {
    static final class ToEdges implements PluginProvider {
        public PluginDescriptor descriptor() {
            return PluginDescriptor.builder("to-edges").input(PortSpec.of("in", DataKind.LOGIC, ""))
                    .output(PortSpec.of("out", DataKind.EDGES, "")).build();
        }

        public Stage open(StageContext ctx) {
            LogicEdges conv = new LogicEdges();
            return new Stage() {
                public void accept(int input, Block b) {
                    ctx.emit(0, conv.toEdges((LogicBlock) b));
                }
            };
        }
    }

    @Test
    void logicToEdgesThroughAChain() {
        List<Block> out = new ArrayList<>();
        Chain c = Chain.builder(new PluginRegistry().add(new ToEdges()))
                .input("src", DataKind.LOGIC).add("conv", "to-edges", Map.of())
                .wire("src", "conv.in").tap("conv.out", out::add).build();
        // samples 0 0 1 1 0 at 1 ns
        long[] bits = {0b01100L};
        c.push("src", new LogicBlock("d", 0, 0, 1e6, bits, 5, null));
        c.finish();
        Edges e = (Edges) out.get(0);
        assertEquals(2, e.count());
        assertEquals(1_500_000L, e.timesFs()[0]);
        assertEquals(3_500_000L, e.timesFs()[1]);
        LogicBlock back = LogicEdges.toLogic(e, 0, 1e6, 5);
        assertEquals(bits[0], back.bits()[0]);
    }
}
