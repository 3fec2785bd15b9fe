package org.lanesift.chain;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The engine's answer to {@code StageContext.wantsBitMargins}: true when a tap, a wired input that
 * reads margins (the default) or a host sink that reads them (the default) receives the output;
 * false when every receiver declared that it does not, or nothing receives it. A producer that
 * follows the answer hands readers their margins, and a receiver that declared it does not read
 * them and still asks fails as a bug.
 */
class BitMarginsWiringTest {
    private static final int BITS = 70;

    /** One BITS output; on every block received, asks the engine and emits bits with or without margins. */
    private final List<Boolean> answers = new ArrayList<>();
    /** What each receiver got, as "receiver:hasMargins". */
    private final List<String> received = new ArrayList<>();

    private PluginProvider producer() {
        return new PluginProvider() {
            @Override
            public PluginDescriptor descriptor() {
                return PluginDescriptor.builder("test.sampler").input(PortSpec.of("in", DataKind.EDGES, ""))
                        .output(PortSpec.of("bits", DataKind.BITS, "")).build();
            }

            @Override
            public Stage open(StageContext ctx) {
                return onAccept(block -> {
                    boolean want = ctx.wantsBitMargins(0);
                    answers.add(want);
                    ctx.emit(0, bits(block.startFs(), want));
                });
            }
        };
    }

    /** A receiver of bits with a declared (or, with null, default) margin reading; it reads them when it declared so. */
    private PluginProvider receiver(String id, Boolean reads, DataKind kind) {
        return new PluginProvider() {
            @Override
            public PluginDescriptor descriptor() {
                PortSpec in = PortSpec.of("in", kind, "");
                return PluginDescriptor.builder(id).input(reads == null ? in : in.readingBitMargins(reads)).build();
            }

            @Override
            public Stage open(StageContext ctx) {
                return onAccept(block -> {
                    BitStream b = (BitStream) block;
                    received.add(id + ":" + b.hasMargins());
                    if (reads == null || reads) {
                        assertArrayEquals(margins(b.startFs(), 1), java.util.Arrays.copyOf(b.setupFs(), BITS));
                        assertArrayEquals(margins(b.startFs(), 2), java.util.Arrays.copyOf(b.holdFs(), BITS));
                    }
                });
            }
        };
    }

    private static Stage onAccept(java.util.function.Consumer<Block> f) {
        return new Stage() {
            @Override
            public void accept(int input, Block block) {
                f.accept(block);
            }
        };
    }

    static long[] margins(long startFs, int k) {
        long[] m = new long[BITS];
        for (int i = 0; i < BITS; i++) {
            m[i] = i % 7 == 0 ? BitStream.UNKNOWN_MARGIN : startFs + k * 1000L + i;
        }
        return m;
    }

    static BitStream bits(long startFs, boolean withMargins) {
        long[] t = new long[BITS];
        for (int i = 0; i < BITS; i++) {
            t[i] = startFs + i * 100L;
        }
        return new BitStream("d0", startFs, startFs + BITS * 100L, BITS, new long[] {0x5555L, 3}, t, new long[BITS], new long[2],
                null, withMargins ? margins(startFs, 1) : null, withMargins ? margins(startFs, 2) : null, new long[2], 100.0);
    }

    private PluginRegistry registry() {
        return new PluginRegistry().add(producer()).add(receiver("test.reads", true, DataKind.BITS))
                .add(receiver("test.skips", false, DataKind.BITS)).add(receiver("test.default", null, DataKind.BITS))
                .add(receiver("test.any", null, DataKind.ANY));
    }

    private ChainBuilder sampler() {
        return Chain.builder(registry()).input("x", DataKind.EDGES).add("s", "test.sampler").wire("x", "s.in");
    }

    private void run(ChainBuilder b) {
        try (Chain c = b.build()) {
            c.push("x", org.lanesift.data.Edges.of("c", 0, 1000, false));
            c.push("x", org.lanesift.data.Edges.of("c", 1000, 2000, false));
            c.finish();
        }
    }

    @Test
    void onlyReceiversThatDeclaredTheyDoNotReadThemGoWithout() {
        run(sampler().add("k", "test.skips").wire("s.bits", "k.in"));
        assertEquals(List.of(false, false), answers);
        assertEquals(List.of("test.skips:false", "test.skips:false"), received);
    }

    @Test
    void oneReaderAmongTheReceiversGetsThemAndSoDoTheOthers() {
        run(sampler().add("k", "test.skips").add("r", "test.reads").wire("s.bits", "k.in").wire("s.bits", "r.in"));
        assertEquals(List.of(true, true), answers);
        assertEquals(List.of("test.skips:true", "test.reads:true", "test.skips:true", "test.reads:true"), received);
    }

    @Test
    void anInputThatDeclaresNothingReadsThem() {
        run(sampler().add("d", "test.default").wire("s.bits", "d.in"));
        run(sampler().add("a", "test.any").wire("s.bits", "a.in"));
        assertEquals(List.of(true, true, true, true), answers);
        assertEquals(List.of("test.default:true", "test.default:true", "test.any:true", "test.any:true"), received);
    }

    @Test
    void aHostTapAlwaysGetsThem() {
        List<Boolean> tapped = new ArrayList<>();
        run(sampler().add("k", "test.skips").wire("s.bits", "k.in").tap("s.bits", b -> tapped.add(((BitStream) b).hasMargins())));
        assertEquals(List.of(true, true), answers);
        assertEquals(List.of(true, true), tapped);
    }

    @Test
    void theHostSinkGetsThemUnlessItSaysItDoesNotReadThem() {
        List<Boolean> sunk = new ArrayList<>();
        run(sampler().outputs((id, port, b) -> sunk.add(((BitStream) b).hasMargins())));
        run(sampler().outputs(new BlockSink() {
            @Override
            public void accept(String id, String port, Block b) {
                sunk.add(((BitStream) b).hasMargins());
            }

            @Override
            public boolean readsBitMargins(String id, String port) {
                assertEquals("s.bits", id + "." + port);
                return false;
            }
        }));
        assertEquals(List.of(true, true, false, false), answers);
        assertEquals(List.of(true, true, false, false), sunk);
    }

    @Test
    void nobodyReceivingMeansNoMargins() {
        run(sampler());
        run(sampler().outputs(new BlockSink() {
            @Override
            public void accept(String id, String port, Block b) {
                throw new AssertionError("not wanted, not delivered");
            }

            @Override
            public boolean wants(String id, String port) {
                return false;
            }
        }));
        assertEquals(List.of(false, false, false, false), answers);
    }

    @Test
    void aReceiverThatAsksForMarginsItDeclaredItDoesNotReadFailsAsABug() {
        PluginProvider liar = new PluginProvider() {
            @Override
            public PluginDescriptor descriptor() {
                return PluginDescriptor.builder("test.liar").input(PortSpec.of("in", DataKind.BITS, "").readingBitMargins(false)).build();
            }

            @Override
            public Stage open(StageContext ctx) {
                return onAccept(block -> received.add("first " + ((BitStream) block).setupFs()[0]));
            }
        };
        ChainBuilder b = Chain.builder(registry().add(liar)).input("x", DataKind.EDGES).add("s", "test.sampler").wire("x", "s.in")
                .add("l", "test.liar").wire("s.bits", "l.in");
        StageFailure f = assertThrows(StageFailure.class, () -> run(b));
        assertInstanceOf(IllegalStateException.class, f.getCause(), "a bug (exit 1), not bad input");
        assertTrue(f.getCause().getMessage().contains("'d0' carries no setup margins"), f.getCause().getMessage());
        assertTrue(received.isEmpty(), "nothing read as zeros: " + received);
        assertFalse(answers.get(0));
    }

    @Test
    void portsReadMarginsUnlessDeclaredOtherwise() {
        PortSpec p = PortSpec.of("in", DataKind.BITS, "h");
        assertTrue(p.readsBitMargins());
        assertTrue(PortSpec.optional("in", DataKind.BITS, "h").readsBitMargins());
        assertTrue(PortSpec.calibration("in", DataKind.ARTIFACT, "h").readsBitMargins());
        PortSpec skip = p.readingBitMargins(false);
        assertFalse(skip.readsBitMargins());
        assertEquals(new PortSpec("in", DataKind.BITS, true, "h", false, false), skip);
        assertTrue(skip.readingBitMargins(true).readsBitMargins());
    }
}
