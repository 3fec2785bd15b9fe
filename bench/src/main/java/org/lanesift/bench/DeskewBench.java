package org.lanesift.bench;

import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugins.deskew.DeskewPlugin;
import org.lanesift.plugins.deskew.SkewEstimatePlugin;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;

/**
 * Hot paths of the deskew module, each next to a plain sequential read of the same arrays in the
 * same run (the {@code read*} methods), all as time per whole workload:
 * <ul>
 * <li>{@code estimate*}: skew estimation over 10 M edges (a clock plus three DDR lanes, 2.5 M
 * edges each, in blocks of 250 k), a fresh chain each time, target under 1 s;</li>
 * <li>{@code delay}: fractional delay of one analog channel, 16 M samples in blocks of 64 k
 * ({@code interpolator} sinc or cubic), target at least 100 M samples/s;</li>
 * <li>{@code legs8}: the leg stage of {@code lanesift bench}: eight channels of 2 M samples in
 * blocks of 64 k, offsets 0, -30, 0, 40, 0, -55, 0, -25 ps at 2.5 GS/s (four plain copies with the
 * shared kernel margin, four 16-tap sinc delays); {@code read2MSamplesOf8Legs} reads the same arrays.
 * With {@code legOffsets=none} every offset is 0, so all eight legs take the pass-through path and
 * what is left is the finite-sample check of each block and the chain's bookkeeping: the most a
 * source's guarantee of finite samples could save;</li>
 * <li>{@code shift}: shifting 16 M edge times in blocks of 32 k, target memory speed.</li>
 * </ul>
 * All run through the real chain engine, so they include its checks and the allocation of each
 * output block.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class DeskewBench {
    static final double CLOCK_FS = 10_000_000;
    static final int EDGE_BLOCK = 250_000;
    static final int EDGES_PER_STREAM = 2_500_000;
    static final int ANALOG_BLOCK = 1 << 16;
    static final int ANALOG_TOTAL = 1 << 24;
    static final int SHIFT_BLOCK = 1 << 15;
    static final int SHIFT_TOTAL = 1 << 24;

    /** The analog delay chain, per interpolator. */
    @State(Scope.Benchmark)
    public static class DelayState {
        @Param({"sinc", "cubic"})
        String interpolator;
        Chain chain;
        long index;
        float[] analog;

        @Setup
        public void setup(Blackhole bh) {
            Random r = new Random(2);
            analog = new float[ANALOG_BLOCK];
            for (int i = 0; i < ANALOG_BLOCK; i++) {
                analog[i] = (float) (Math.sin(i * 0.37) + 0.3 * Math.sin(i * 1.91) + 0.01 * r.nextGaussian());
            }
            chain = Chain.builder(new PluginRegistry().add(new DeskewPlugin())).input("a", DataKind.ANALOG)
                    .add("fix", "deskew", Map.of("kind", "analog", "offsets", java.util.List.of(37.3), "interpolator", interpolator))
                    .wire("a", "fix.in0").tap("fix.out0", b -> {
                        AnalogBlock a = (AnalogBlock) b;
                        bh.consume(a.volts()[a.length() - 1]);
                    }).build();
        }
    }

    /** The leg stage of {@code lanesift bench}: eight analog channels, four of them not delayed. */
    @State(Scope.Benchmark)
    public static class LegsState {
        /** {@code bench}: the offsets of {@code lanesift bench}; {@code none}: all zero (pass-through only). */
        @Param({"bench", "none"})
        String legOffsets;
        static final int LEGS = 8;
        static final int BLOCKS = 32;
        static final double PERIOD_FS = 400_000;
        Chain chain;
        long index;
        float[][] legs = new float[LEGS][];
        String[] inputs = new String[LEGS];

        @Setup
        public void setup(Blackhole bh) {
            Random r = new Random(3);
            var b = Chain.builder(new PluginRegistry().add(new DeskewPlugin()));
            for (int c = 0; c < LEGS; c++) {
                legs[c] = new float[ANALOG_BLOCK];
                for (int i = 0; i < ANALOG_BLOCK; i++) {
                    // an LVDS leg around 1.2 V: 7 samples a bit, about one sample 20-80 %, 5 mV noise
                    double bit = ((i / 7 + c / 2) * 2654435761L >>> 7 & 1) == 0 ? -1 : 1;
                    legs[c][i] = (float) (1.2 + (c % 2 == 0 ? 0.175 : -0.175) * bit + 0.005 * r.nextGaussian());
                }
                inputs[c] = "in" + c;
                b.input(inputs[c], DataKind.ANALOG);
            }
            java.util.List<Integer> offsets = legOffsets.equals("none") ? java.util.List.of(0, 0, 0, 0, 0, 0, 0, 0)
                    : java.util.List.of(0, -30, 0, 40, 0, -55, 0, -25);
            b.add("legs", "deskew", Map.of("kind", "analog", "channels", LEGS, "offsets", offsets));
            for (int c = 0; c < LEGS; c++) {
                b.wire(inputs[c], "legs.in" + c).tap("legs.out" + c, blk -> {
                    AnalogBlock a = (AnalogBlock) blk;
                    bh.consume(a.volts()[a.length() - 1]);
                });
            }
            chain = b.build();
        }
    }

    Edges[][] streams;          // [stream][block]: clock, lane0..lane2
    Edges shiftBlock;
    PluginRegistry registry;
    Chain shiftChain;
    Blackhole hole;

    @Setup
    public void setup(Blackhole bh) {
        hole = bh;
        registry = new PluginRegistry().add(new DeskewPlugin()).add(new SkewEstimatePlugin());
        Random r = new Random(1);
        int blocks = EDGES_PER_STREAM / EDGE_BLOCK;
        streams = new Edges[4][blocks];
        double ui = CLOCK_FS / 2;
        for (int s = 0; s < 4; s++) {
            long skew = s == 0 ? 0 : 150_000L * s;
            for (int b = 0; b < blocks; b++) {
                long[] t = new long[EDGE_BLOCK];
                long base = (long) b * EDGE_BLOCK;
                for (int i = 0; i < EDGE_BLOCK; i++) {
                    // one transition per UI (a clock, or a lane toggling every bit) with Gaussian jitter
                    t[i] = 10_000_000L + Math.round((base + i) * ui) + skew + Math.round(r.nextGaussian() * 100_000);
                }
                java.util.Arrays.sort(t);
                long start = 10_000_000L + Math.round(base * ui) - 5_000_000L;
                long end = 10_000_000L + Math.round((base + EDGE_BLOCK) * ui) - 5_000_000L;
                for (int i = 0; i < EDGE_BLOCK; i++) {
                    t[i] = Math.max(start, Math.min(end - 1, t[i]));
                }
                streams[s][b] = Edges.of(s == 0 ? "clk" : "lane" + (s - 1), start, end, false, t);
            }
        }
        long[] st = new long[SHIFT_BLOCK];
        for (int i = 0; i < SHIFT_BLOCK; i++) {
            st[i] = 1000L * i + 17;
        }
        shiftBlock = Edges.of("lane0", 0, 1000L * SHIFT_BLOCK + 18, false, st);
        shiftChain = Chain.builder(registry).input("e", DataKind.EDGES)
                .add("fix", "deskew", Map.of("kind", "edges", "offsets", java.util.List.of(-123.456)))
                .wire("e", "fix.in0").tap("fix.out0", this::consume).build();
    }

    private void consume(Block b) {
        if (b instanceof Edges e) {
            hole.consume(e.count() > 0 ? e.timesFs()[e.count() - 1] : 0);
        }
        hole.consume(b);
    }

    /** Clock-mode estimation over 10 M edges (clock + 3 lanes). */
    @Benchmark
    public void estimateClock10MEdges(Blackhole bh) {
        Chain c = Chain.builder(registry).input("clk", DataKind.EDGES).input("l0", DataKind.EDGES)
                .input("l1", DataKind.EDGES).input("l2", DataKind.EDGES)
                .add("est", "skew-estimate", Map.of("mode", "clock", "lanes", 3, "ddr", true))
                .wire("clk", "est.clock").wire("l0", "est.lane0").wire("l1", "est.lane1").wire("l2", "est.lane2")
                .tap("est.table", bh::consume).build();
        String[] in = {"clk", "l0", "l1", "l2"};
        for (int b = 0; b < streams[0].length; b++) {
            for (int s = 0; s < 4; s++) {
                c.push(in[s], streams[s][b]);
            }
        }
        c.finish();
        c.close();
    }

    /** Lanes-mode estimation over 10 M edges (4 lanes, UI from the even clock on lane 0 at 2 bits per clock). */
    @Benchmark
    public void estimateLanes10MEdges(Blackhole bh) {
        Chain c = Chain.builder(registry).input("l0", DataKind.EDGES).input("l1", DataKind.EDGES)
                .input("l2", DataKind.EDGES).input("l3", DataKind.EDGES)
                .add("est", "skew-estimate", Map.of("mode", "lanes", "lanes", 4, "bitsPerClock", 2))
                .wire("l0", "est.lane0").wire("l1", "est.lane1").wire("l2", "est.lane2").wire("l3", "est.lane3")
                .tap("est.table", bh::consume).build();
        String[] in = {"l0", "l1", "l2", "l3"};
        for (int b = 0; b < streams[0].length; b++) {
            for (int s = 0; s < 4; s++) {
                c.push(in[s], streams[s][b]);
            }
        }
        c.finish();
        c.close();
    }

    /** Baseline: a plain sequential read of the same 10 M edge times. */
    @Benchmark
    public long read10MEdges() {
        long acc = 0;
        for (Edges[] s : streams) {
            for (Edges e : s) {
                long[] t = e.timesFs();
                for (int i = 0, n = e.count(); i < n; i++) {
                    acc += t[i];
                }
            }
        }
        return acc;
    }

    /** Fractional delay of 16 M samples of one channel. */
    @Benchmark
    public void delay16MSamples(DelayState d) {
        double p = 100_000.0;
        for (int k = 0; k < ANALOG_TOTAL / ANALOG_BLOCK; k++) {
            long idx = d.index;
            d.index += ANALOG_BLOCK;
            d.chain.push("a", new AnalogBlock("ch", idx, Math.round(idx * p), p, d.analog, ANALOG_BLOCK, null));
        }
    }

    /** Baseline: a plain sequential read of 16 M samples (the same array, as often). */
    @Benchmark
    public double read16MSamples(DelayState d) {
        double acc = 0;
        for (int k = 0; k < ANALOG_TOTAL / ANALOG_BLOCK; k++) {
            float[] a = d.analog;
            for (int i = 0; i < ANALOG_BLOCK; i++) {
                acc += a[i];
            }
        }
        return acc;
    }

    /** The leg stage of {@code lanesift bench}: 8 channels x 2 M samples. */
    @Benchmark
    public void legs8Channels2MSamples(LegsState d) {
        for (int k = 0; k < LegsState.BLOCKS; k++) {
            long idx = d.index;
            d.index += ANALOG_BLOCK;
            for (int c = 0; c < LegsState.LEGS; c++) {
                d.chain.push(d.inputs[c], new AnalogBlock("leg" + c, idx, Math.round(idx * LegsState.PERIOD_FS), LegsState.PERIOD_FS,
                        d.legs[c], ANALOG_BLOCK, null));
            }
        }
    }

    /** Baseline: a plain sequential read of the same 8 x 2 M samples. */
    @Benchmark
    public double read2MSamplesOf8Legs(LegsState d) {
        double acc = 0;
        for (int k = 0; k < LegsState.BLOCKS; k++) {
            for (float[] a : d.legs) {
                for (int i = 0; i < ANALOG_BLOCK; i++) {
                    acc += a[i];
                }
            }
        }
        return acc;
    }

    /** Shifting 16 M edge times. */
    @Benchmark
    public void shift16MEdges() {
        for (int k = 0; k < SHIFT_TOTAL / SHIFT_BLOCK; k++) {
            shiftChain.push("e", shiftBlock);
        }
    }

    /** Baseline: a plain sequential read of the same 16 M edge times. */
    @Benchmark
    public long read16MEdgeTimes() {
        long acc = 0;
        for (int k = 0; k < SHIFT_TOTAL / SHIFT_BLOCK; k++) {
            long[] t = shiftBlock.timesFs();
            for (int i = 0; i < SHIFT_BLOCK; i++) {
                acc += t[i];
            }
        }
        return acc;
    }
}
