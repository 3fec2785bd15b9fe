package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainException;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.StageHarness;

/**
 * Analog legs lag one block ({@link DeskewStage}): the same schedule, blocks and annotations with
 * the filter worker thread on and off, over a seeded corpus of several legs with random block
 * splits, NaN and invalid samples and gaps; a failure downstream reaches the engine as the same
 * exception either way, and no worker thread outlives the stage.
 */
class LegLagTest {
    static final double PERIOD_FS = 100_000; // 10 GS/s
    static final String THREAD = DeskewStage.THREAD_PREFIX + "dut";

    /** One seeded input: the options and the blocks in the order they are pushed (port, block). */
    record Corpus(Map<String, Object> options, List<String> ports, List<AnalogBlock> blocks) {
    }

    /** What one run made: the emission schedule, every output port's blocks, every annotation. */
    record Run(List<String> schedule, Map<String, List<Block>> outputs, List<org.lanesift.annotation.Annotation> annotations,
               boolean threadSeen) {
    }

    static Corpus corpus(long seed) {
        Random r = new Random(seed);
        int legs = 2 + r.nextInt(4);
        int n = 3000 + r.nextInt(6000);
        List<Double> offsets = new ArrayList<>();
        for (int k = 0; k < legs; k++) {
            int pick = k == 1 ? 2 : r.nextInt(3); // leg 1 always filters, so the worker has work
            offsets.add(switch (pick) {
                case 0 -> 0.0;
                case 1 -> 100.0 * (r.nextInt(9) - 4); // whole samples
                default -> Math.round((r.nextDouble() - 0.5) * 1000 * 1000) / 1000.0; // fractional, +-500 ps
            });
        }
        // a gap shared by every leg, and sometimes one of a single leg
        long gapFrom = r.nextBoolean() ? n / 3 + r.nextInt(n / 3) : Long.MAX_VALUE;
        long gapTo = gapFrom + 50 + r.nextInt(400);
        int ownGapLeg = r.nextInt(legs + 1);
        long ownFrom = n / 2 + r.nextInt(n / 4);
        long ownTo = ownFrom + 20 + r.nextInt(200);
        List<AnalogBlock> all = new ArrayList<>();
        List<Integer> legOf = new ArrayList<>();
        for (int k = 0; k < legs; k++) {
            double f1 = 0.01 + 0.3 * r.nextDouble();
            double f2 = 0.01 + 0.3 * r.nextDouble();
            int pos = 0;
            while (pos < n) {
                int len = Math.min(n - pos, 1 + r.nextInt(r.nextInt(8) == 0 ? 12 : 1500));
                boolean inGap = (pos >= gapFrom && pos < gapTo) || (k == ownGapLeg && pos >= ownFrom && pos < ownTo);
                if (!inGap) {
                    float[] v = new float[len];
                    long[] inv = null;
                    for (int i = 0; i < len; i++) {
                        long t = pos + i;
                        v[i] = (float) (0.2 * Math.sin(2 * Math.PI * f1 * t + k) + 0.1 * Math.sin(2 * Math.PI * f2 * t)
                                + 0.01 * r.nextGaussian());
                        int odd = r.nextInt(400);
                        if (odd == 0) {
                            v[i] = Float.NaN;
                        } else if (odd == 1) {
                            v[i] = r.nextBoolean() ? Float.POSITIVE_INFINITY : Float.NEGATIVE_INFINITY;
                        } else if (odd < 5) {
                            if (inv == null) {
                                inv = new long[BitSets.words(len)];
                            }
                            BitSets.set(inv, i, true);
                        }
                    }
                    all.add(new AnalogBlock("leg" + k, pos, Math.round(pos * PERIOD_FS), PERIOD_FS, v, len, inv));
                    legOf.add(k);
                }
                pos += len;
            }
        }
        // push in time order across legs (ties: leg order), each leg's blocks in its own order
        List<Integer> order = new ArrayList<>();
        for (int i = 0; i < all.size(); i++) {
            order.add(i);
        }
        order.sort(Comparator.<Integer>comparingLong(i -> all.get(i).startFs()).thenComparing(legOf::get));
        List<String> ports = new ArrayList<>();
        List<AnalogBlock> blocks = new ArrayList<>();
        for (int i : order) {
            ports.add("in" + legOf.get(i));
            blocks.add(all.get(i));
        }
        Map<String, Object> o = new java.util.HashMap<>(Map.of("kind", "analog", "channels", legs, "offsets", offsets,
                "interpolator", r.nextInt(4) == 0 ? "cubic" : "sinc"));
        return new Corpus(o, ports, blocks);
    }

    /** The live deskew worker threads of instance "dut" (the harness's instance id). */
    static java.util.Set<Thread> workers() {
        java.util.Set<Thread> s = new java.util.HashSet<>();
        for (Thread t : Thread.getAllStackTraces().keySet()) {
            if (t.getName().equals(THREAD) && t.isAlive()) {
                s.add(t);
            }
        }
        return s;
    }

    /** Whether a deskew worker thread is alive that was not alive before (other tests' idle threads may still be ending). */
    static boolean newThreadAlive(java.util.Set<Thread> before) {
        java.util.Set<Thread> now = workers();
        now.removeAll(before);
        return !now.isEmpty();
    }

    static Run run(Corpus c, boolean worker) {
        Map<String, Object> o = new java.util.HashMap<>(c.options());
        o.put(DeskewPlugin.STAGE_THREAD, worker);
        boolean seen = false;
        java.util.Set<Thread> before = workers();
        Run result;
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), o)) {
            for (int i = 0; i < c.blocks().size(); i++) {
                h.push(c.ports().get(i), c.blocks().get(i));
                seen |= newThreadAlive(before);
            }
            h.finish();
            Map<String, List<Block>> outs = new java.util.LinkedHashMap<>();
            for (int k = 0; k < (int) c.options().get("channels"); k++) {
                outs.put("out" + k, List.copyOf(h.outputs("out" + k)));
            }
            outs.put("table", List.copyOf(h.outputs("table")));
            result = new Run(List.copyOf(h.emittedPorts()), outs, List.copyOf(h.annotations()), seen);
        }
        assertFalse(newThreadAlive(before), "no deskew worker thread is left once the stage is closed");
        return result;
    }

    static void assertSameBlocks(List<Block> want, List<Block> got, String what) {
        assertEquals(want.size(), got.size(), what + ": block count");
        for (int i = 0; i < want.size(); i++) {
            String at = what + " block " + i;
            if (want.get(i) instanceof Artifact a) {
                Artifact b = (Artifact) got.get(i);
                assertEquals(a.fileName(), b.fileName(), at);
                assertArrayEquals(a.content(), b.content(), at);
                continue;
            }
            AnalogBlock a = (AnalogBlock) want.get(i);
            AnalogBlock b = (AnalogBlock) got.get(i);
            assertEquals(List.of(a.channel(), a.firstIndex(), a.startFs(), a.periodFs(), a.length()),
                    List.of(b.channel(), b.firstIndex(), b.startFs(), b.periodFs(), b.length()), at);
            for (int s = 0; s < a.length(); s++) {
                if (Float.floatToIntBits(a.volts()[s]) != Float.floatToIntBits(b.volts()[s]) || a.isValid(s) != b.isValid(s)) {
                    throw new AssertionError(at + " sample " + s + ": " + a.volts()[s] + (a.isValid(s) ? "" : " (invalid)")
                            + " without the worker, " + b.volts()[s] + (b.isValid(s) ? "" : " (invalid)") + " with it");
                }
            }
        }
    }

    @Test
    void theWorkerChangesNothingOverASeededCorpus() {
        boolean cores = Runtime.getRuntime().availableProcessors() > 1;
        for (long seed = 1; seed <= 16; seed++) {
            Corpus c = corpus(seed);
            Run off = run(c, false);
            Run on = run(c, true);
            String s = "seed " + seed + " " + c.options();
            assertFalse(off.threadSeen(), s + ": stageThread=false starts no thread");
            assertEquals(cores, on.threadSeen(), s + ": the worker runs when the JVM has more than one processor");
            assertEquals(off.schedule(), on.schedule(), s + ": emission order across outputs");
            for (String port : off.outputs().keySet()) {
                assertSameBlocks(off.outputs().get(port), on.outputs().get(port), s + " " + port);
            }
            assertEquals(off.annotations(), on.annotations(), s + ": annotations and their order");
            assertTrue(off.outputs().get("out1").size() > 1, s + ": the filtering leg made outputs");
        }
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void aLegsBlockIsHandedOnWhenItsNextBlockArrives(boolean worker) {
        AnalogBlock whole = org.lanesift.testkit.Synth.analog("a", DeskewAnalogTest.RATE, 3000, DeskewAnalogTest::signal);
        List<AnalogBlock> parts = org.lanesift.testkit.Synth.split(whole, 1000);
        try (StageHarness h = StageHarness.of(new DeskewPlugin(), Map.of("kind", "analog", "channels", 2,
                "offsets", List.of(0, 37.5), DeskewPlugin.STAGE_THREAD, worker))) {
            List<AnalogBlock> p = parts;
            h.push("in0", renamed(p.get(0), "a")).push("in1", renamed(p.get(0), "b"));
            assertEquals(List.of(), h.emittedPorts(), "nothing is handed on with the first block of each leg");
            h.push("in0", renamed(p.get(1), "a"));
            assertEquals(List.of("out0"), h.emittedPorts(), "leg a's first block goes on when its second arrives");
            h.push("in1", renamed(p.get(1), "b"));
            assertEquals(List.of("out0", "out1"), h.emittedPorts());
            long firstHandedOn = h.outputs("out1", AnalogBlock.class).get(0).firstIndex();
            assertTrue(firstHandedOn < 1000, "leg b's outputs from its first block: starts at " + firstHandedOn);
            h.push("in0", renamed(p.get(2), "a")).push("in1", renamed(p.get(2), "b"));
            int before = h.emittedPorts().size();
            h.finish();
            // at the end: every leg's last block, then every leg's held-back tail, then the applied-offset table
            List<String> end = h.emittedPorts().subList(before, h.emittedPorts().size());
            assertEquals("out0", end.get(0));
            assertEquals("table", end.get(end.size() - 1));
            long produced = 0;
            for (AnalogBlock b : h.outputs("out1", AnalogBlock.class)) {
                produced += b.length();
            }
            long[] m = AnalogDelayLine.margins(DelayKernel.of("sinc"), 37.5e3 / whole.periodFs());
            assertEquals(3000 - m[0] - m[1], produced, "every sample inside the kernel margins is handed on once");
        }
    }

    private static AnalogBlock renamed(AnalogBlock b, String channel) {
        return new AnalogBlock(channel, b.firstIndex(), b.startFs(), b.periodFs(), b.volts(), b.length(), b.invalid());
    }

    @ParameterizedTest
    @ValueSource(booleans = {false, true})
    void aFailureDownstreamReachesTheEngineAsItselfAndLeavesNoThread(boolean worker) {
        IllegalStateException boom = new IllegalStateException("the receiver failed");
        java.util.Set<Thread> before = workers();
        AnalogBlock whole = org.lanesift.testkit.Synth.analog("a", DeskewAnalogTest.RATE, 4000, DeskewAnalogTest::signal);
        List<AnalogBlock> parts = org.lanesift.testkit.Synth.split(whole, 2000);
        Chain chain = Chain.builder(new PluginRegistry().add(new DeskewPlugin()))
                .add("dut", "deskew", Map.of("kind", "analog", "channels", 1, "offsets", List.of(42.5),
                        DeskewPlugin.STAGE_THREAD, worker))
                .input("in", DataKind.ANALOG).wire("in", "dut.in0")
                .outputs((id, port, block) -> {
                    throw boom;
                })
                .build();
        try (chain) {
            chain.push("in", parts.get(0)); // held: nothing reaches the receiver yet
            ChainException e = assertThrows(ChainException.class, () -> chain.push("in", parts.get(1)));
            assertSame(boom, e.getCause(), "the receiver's own exception, wrapped once by the engine");
        }
        assertFalse(newThreadAlive(before), "the worker thread ended with close()");
    }
}
