package org.lanesift.chain;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.mockito.ArgumentMatchers.any;
import static org.mockito.ArgumentMatchers.eq;
import static org.mockito.Mockito.mock;
import static org.mockito.Mockito.times;
import static org.mockito.Mockito.verify;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;

class ChainTest {
    // Discovered through META-INF/services in src/test/resources: the ServiceLoader path hosts use.
    static final PluginRegistry REG = PluginRegistry.discover(ChainTest.class.getClassLoader());

    static AnalogBlock analog(long first, int n, double periodFs) {
        return new AnalogBlock("a", first, Math.round(first * periodFs), periodFs, new float[n], n, null);
    }

    @Test
    void serviceLoaderFindsTheTestPlugins() {
        List<String> ids = REG.all().stream().map(p -> p.descriptor().id()).toList();
        assertTrue(ids.containsAll(List.of("test.pass", "test.edges", "test.ramp")), ids.toString());
        assertEquals("Pass through", REG.find("test.pass").descriptor().displayName());
    }

    @Test
    void sourceThroughThreeStagesWithProgressAndTaps() {
        List<Block> out = new ArrayList<>();
        List<long[]> progress = new ArrayList<>();
        Chain c = Chain.builder(REG).add("src", "test.ramp", Map.of("blocks", 4, "size", 50))
                .add("a", "test.pass").add("b", "test.pass").add("c", "test.pass")
                .wire("src", "a").wire("a", "b").wire("b", "c")
                .outputs((id, port, blk) -> out.add(blk))
                .progress((d, t) -> progress.add(new long[] {d, t})).build();
        c.run();
        c.close();
        assertEquals(4, out.size());
        assertEquals(150f, ((AnalogBlock) out.get(3)).volts()[0]);
        assertEquals(200, progress.get(progress.size() - 1)[0]);
        assertEquals(200, progress.get(progress.size() - 1)[1]);
        assertEquals(List.of("src", "a", "b", "c"), c.instanceIds());
    }

    @Test
    void wrongWiringFailsBeforeAnySampleMovesNamingBothEnds() {
        ChainException e = assertThrows(ChainException.class, () -> Chain.builder(REG)
                .input("x", DataKind.LOGIC).add("p", "test.pass", Map.of("kind", "ANALOG")).wire("x", "p.in").build());
        assertTrue(e.getMessage().contains("x.out carries LOGIC") && e.getMessage().contains("p.in expects ANALOG"), e.getMessage());
        e = assertThrows(ChainException.class, () -> Chain.builder(REG).input("x", DataKind.ANALOG)
                .add("p", "test.pass").wire("x", "p.inn").build());
        assertTrue(e.getMessage().contains("no input 'inn'") && e.getMessage().contains("in (ANALOG)"), e.getMessage());
        e = assertThrows(ChainException.class, () -> Chain.builder(REG).add("p", "test.nope").build());
        assertTrue(e.getMessage().contains("unknown plugin 'test.nope'") && e.getMessage().contains("test.pass"), e.getMessage());
        e = assertThrows(ChainException.class, () -> Chain.builder(REG).add("p", "test.pass").build());
        assertTrue(e.getMessage().contains("required input 'in' is not wired"), e.getMessage());
        e = assertThrows(ChainException.class, () -> Chain.builder(REG).input("x", DataKind.ANALOG).input("y", DataKind.ANALOG)
                .add("p", "test.pass").wire("x", "p").wire("y", "p").build());
        assertTrue(e.getMessage().contains("already wired"), e.getMessage());
        e = assertThrows(ChainException.class, () -> Chain.builder(REG).add("p", "test.pass").add("q", "test.pass")
                .wire("p", "q").wire("q", "p").build());
        assertTrue(e.getMessage().contains("cycle through p, q"), e.getMessage());
        e = assertThrows(ChainException.class, () -> Chain.builder(REG).input("x", DataKind.ANALOG)
                .add("p", "test.pass", Map.of("failAt", -5)).wire("x", "p").build());
        assertTrue(e.getMessage().contains("failAt") && e.getMessage().contains("-1 to 1000000"), e.getMessage());
    }

    @Test
    void specErrorsCarryJsonPointers() {
        ChainSpec spec = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of()),
                new ChainSpec.Node("e", "test.edges", Map.of())), List.of(new ChainSpec.Wire("src.out", "e.in")));
        ChainException e = assertThrows(ChainException.class, () -> ChainBuilder.fromSpec(spec, REG).build());
        assertEquals("/wires/0", e.pointer());
        ChainSpec spec2 = new ChainSpec(List.of(new ChainSpec.Node("src", "test.ramp", Map.of("size", 0))), List.of());
        e = assertThrows(ChainException.class, () -> ChainBuilder.fromSpec(spec2, REG).build());
        assertEquals("/nodes/0/options/size", e.pointer());
    }

    @Test
    void blocksOutOfTimeOrderAreRefused() {
        Chain c = Chain.builder(REG).input("x", DataKind.ANALOG).add("p", "test.pass").wire("x", "p").build();
        c.push("x", analog(100, 10, 1e6));
        ChainException e = assertThrows(ChainException.class, () -> c.push("x", analog(0, 10, 1e6)));
        assertTrue(e.getMessage().contains("time order") && e.getMessage().contains("x.out -> p.in"), e.getMessage());
    }

    @Test
    void anOutputTheHostDoesNotWantIsUnconnectedAndNotDelivered() {
        List<Boolean> connected = new ArrayList<>();
        List<String> asked = new ArrayList<>();
        org.lanesift.plugin.PluginProvider two = new org.lanesift.plugin.PluginProvider() {
            public org.lanesift.plugin.PluginDescriptor descriptor() {
                return org.lanesift.plugin.PluginDescriptor.builder("test.two-out")
                        .input(org.lanesift.plugin.PortSpec.of("in", DataKind.ANALOG, ""))
                        .output(org.lanesift.plugin.PortSpec.of("kept", DataKind.ANALOG, ""))
                        .output(org.lanesift.plugin.PortSpec.of("dropped", DataKind.ANALOG, "")).build();
            }

            public org.lanesift.plugin.Stage open(org.lanesift.plugin.StageContext ctx) {
                return new org.lanesift.plugin.Stage() {
                    public void accept(int input, Block block) {
                        connected.add(ctx.isConnected(0));
                        connected.add(ctx.isConnected(1));
                        ctx.emit(0, block);
                        ctx.emit(1, block);
                    }
                };
            }
        };
        List<String> got = new ArrayList<>();
        Chain c = Chain.builder(new PluginRegistry().add(two)).input("x", DataKind.ANALOG).add("s", "test.two-out").wire("x", "s.in")
                .outputs(new BlockSink() {
                    public void accept(String id, String port, Block b) {
                        got.add(id + "." + port);
                    }

                    public boolean wants(String id, String port) {
                        asked.add(id + "." + port);
                        return !port.equals("dropped");
                    }
                }).build();
        c.push("x", analog(0, 10, 1e6));
        c.push("x", analog(10, 10, 1e6));
        c.finish();
        c.close();
        assertEquals(List.of(true, false, true, false), connected);
        assertEquals(List.of("s.kept", "s.kept"), got);
        assertEquals(List.of("s.kept", "s.dropped"), asked, "asked once per output");
    }

    @Test
    void mismatchedSampleRatesOnOneStageAreRefused() {
        org.lanesift.plugin.PluginProvider two = new org.lanesift.plugin.PluginProvider() {
            public org.lanesift.plugin.PluginDescriptor descriptor() {
                return org.lanesift.plugin.PluginDescriptor.builder("test.two")
                        .input(org.lanesift.plugin.PortSpec.of("p", DataKind.ANALOG, ""))
                        .input(org.lanesift.plugin.PortSpec.of("n", DataKind.ANALOG, "")).build();
            }

            public org.lanesift.plugin.Stage open(org.lanesift.plugin.StageContext ctx) {
                return new org.lanesift.plugin.Stage() {
                    public void accept(int input, Block block) {
                    }
                };
            }
        };
        Chain c = Chain.builder(new PluginRegistry().add(two)).input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
                .add("rx", "test.two").wire("p", "rx.p").wire("n", "rx.n").build();
        c.push("p", analog(0, 10, 1e6));
        ChainException e = assertThrows(ChainException.class, () -> c.push("n", analog(0, 10, 2e6)));
        assertTrue(e.getMessage().contains("input 'n'") && e.getMessage().contains("input 'p'"), e.getMessage());
    }

    @Test
    void aStageThatThrowsIsNamedAndTheChainStops() {
        Chain c = Chain.builder(REG).add("src", "test.ramp", Map.of("blocks", 5)).add("bad", "test.pass", Map.of("failAt", 2))
                .wire("src", "bad").build();
        StageFailure f = assertThrows(StageFailure.class, c::run);
        assertEquals("bad", f.instanceId());
        assertTrue(f.getMessage().contains("instance 'bad' (test.pass)") && f.getMessage().contains("deliberate failure"), f.getMessage());
        c.close();
    }

    @Test
    void cancelStopsDelivery() {
        List<Block> out = new ArrayList<>();
        Chain[] holder = new Chain[1];
        holder[0] = Chain.builder(REG).add("src", "test.ramp", Map.of("blocks", 100)).add("p", "test.pass").wire("src", "p")
                .tap("p.out", b -> {
                    out.add(b);
                    if (out.size() == 3) {
                        holder[0].cancel();
                    }
                }).build();
        holder[0].run();
        assertEquals(3, out.size());
        assertTrue(holder[0].isCancelled());
    }

    @Test
    void hostSinkReceivesEveryAnnotation() {
        AnnotationSink sink = mock(AnnotationSink.class);
        Chain c = Chain.builder(REG).input("x", DataKind.LOGIC).add("e", "test.edges").wire("x", "e").annotations(sink).build();
        c.push("x", new LogicBlock("d", 0, 0, 1e6, new long[] {0b0110L}, 4, null));
        c.push("x", new LogicBlock("d", 4, 4_000_000, 1e6, new long[] {0b1L}, 4, null));
        c.finish();
        verify(sink, times(2)).accept(eq("e"), any(Annotation.class));
    }

    @Test
    void pushingToAnUnknownInputOrAfterCloseFails() {
        Chain c = Chain.builder(REG).input("x", DataKind.LOGIC).add("e", "test.edges").wire("x", "e").build();
        assertThrows(ChainException.class, () -> c.push("y", analog(0, 1, 1)));
        assertThrows(ChainException.class, () -> c.push("x", analog(0, 1, 1)));
        c.close();
        assertThrows(ChainException.class, () -> c.push("x", new LogicBlock("d", 0, 0, 1e6, new long[1], 1, null)));
    }

    // Property: cutting a capture into blocks of any sizes gives the same chain output as one block.
    @Property(tries = 100)
    void blockSizesDoNotChangeTheOutput(@ForAll long seed, @ForAll @IntRange(min = 1, max = 300) int maxBlock) {
        int n = 2000;
        Random r = new Random(seed);
        long[] bits = new long[BitSets.words(n)];
        boolean level = false;
        for (int i = 0; i < n; i++) {
            if (r.nextInt(7) == 0) {
                level = !level;
            }
            BitSets.set(bits, i, level);
        }
        List<Long> whole = run(List.of(new LogicBlock("d", 0, 0, 1e6, bits, n, null)));
        List<LogicBlock> parts = new ArrayList<>();
        int pos = 0;
        while (pos < n) {
            int len = Math.min(n - pos, 1 + r.nextInt(maxBlock));
            long[] p = new long[BitSets.words(len)];
            for (int i = 0; i < len; i++) {
                BitSets.set(p, i, BitSets.get(bits, pos + i));
            }
            parts.add(new LogicBlock("d", pos, Math.round(pos * 1e6), 1e6, p, len, null));
            pos += len;
        }
        assertEquals(whole, run(parts));
    }

    private static List<Long> run(List<LogicBlock> blocks) {
        List<Long> times = new ArrayList<>();
        Chain c = Chain.builder(REG).input("x", DataKind.LOGIC).add("e", "test.edges").add("p", "test.pass", Map.of("kind", "EDGES"))
                .wire("x", "e").wire("e", "p").tap("p.out", b -> {
                    Edges e = (Edges) b;
                    for (int i = 0; i < e.count(); i++) {
                        times.add(e.timesFs()[i]);
                    }
                }).build();
        for (LogicBlock b : blocks) {
            c.push("x", b);
        }
        c.finish();
        c.close();
        return times;
    }
}
