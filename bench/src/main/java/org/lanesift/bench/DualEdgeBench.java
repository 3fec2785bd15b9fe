package org.lanesift.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.BlockSink;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugins.dualedge.DualEdgePlugin;
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
 * The clocked sampler from edge lists to bit streams, through the real chain engine (a fresh
 * chain per invocation, so clock acquisition, block bookkeeping and output allocation are all
 * included), next to a plain sequential read of the same edge arrays in the same run.
 *
 * <p>Workload: {@link #BITS} bits per lane of a 1 Gbit/s link with random data and a little
 * deterministic jitter, delivered in blocks of {@link #BLOCK_BITS} bits per input. {@code ddr}: one
 * bit per clock edge; {@code multiplied}: a 7:1 pixel link (7 bits per clock period). Time per
 * workload; bits per second per lane = BITS / time. Target: at least 100 M bits/s per lane.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class DualEdgeBench {
    static final int BITS = 1 << 20;
    static final int BLOCK_BITS = 1 << 16;
    static final double UI_FS = 1_000_000;

    @Param({"ddr", "multiplied"})
    String mode;

    @Param({"1", "4"})
    int lanes;

    /**
     * Whether the host sink reads the per-bit margins (host-api {@code BlockSink.readsBitMargins}):
     * true as a run writing the bits CSV, false as one writing only the packed binary bits, where the
     * sampler sends its bits without them.
     */
    @Param({"true", "false"})
    boolean margins;

    /** [input][block]: clock, lane0..lane{N-1}. */
    Edges[][] blocks;
    PluginRegistry registry;

    @Setup
    public void setup() {
        registry = new PluginRegistry().add(new DualEdgePlugin());
        boolean seven = mode.equals("multiplied");
        int nBlocks = BITS / BLOCK_BITS;
        long t0 = (long) (4 * UI_FS);
        long end = t0 + (long) ((BITS + 4) * UI_FS);
        blocks = new Edges[lanes + 1][];
        // clock
        long[] clock;
        boolean clockInitial;
        if (!seven) {
            clock = new long[BITS];
            for (int k = 0; k < BITS; k++) {
                clock[k] = t0 + Math.round(k * UI_FS + 20_000 * Math.sin(k * 0.013));
            }
            clockInitial = false;
        } else {
            int pixels = BITS / 7;
            clock = new long[2 * pixels];
            for (int p = 0; p < pixels; p++) {
                clock[2 * p] = t0 + Math.round((7 * p + 2) * UI_FS);
                clock[2 * p + 1] = t0 + Math.round((7 * p + 5) * UI_FS + 20_000 * Math.sin(p * 0.013));
            }
            clockInitial = true;
        }
        blocks[0] = cut("CLK", clock, clock.length, clockInitial, end, nBlocks);
        for (int l = 0; l < lanes; l++) {
            Random r = new Random(l + 1);
            long[] t = new long[BITS];
            int n = 0;
            boolean level = false;
            for (int k = 0; k < BITS; k++) {
                boolean b = r.nextBoolean();
                if (b != level) {
                    t[n++] = t0 + Math.round((seven ? k : k - 0.5) * UI_FS + 30_000 * Math.sin(k * 0.0071 + l));
                    level = b;
                }
            }
            blocks[l + 1] = cut("D" + l, t, n, false, end, nBlocks);
        }
    }

    private static Edges[] cut(String name, long[] t, int n, boolean initial, long end, int nBlocks) {
        List<Edges> out = new ArrayList<>();
        int k = 0;
        boolean level = initial;
        long start = 0;
        for (int b = 0; b < nBlocks; b++) {
            long stop = b == nBlocks - 1 ? end : (long) ((b + 1) * (double) BLOCK_BITS * UI_FS);
            int from = k;
            while (k < n && t[k] < stop) {
                k++;
            }
            long[] part = java.util.Arrays.copyOfRange(t, from, k);
            out.add(Edges.of(name, start, stop, level, part));
            if (((k - from) & 1) == 1) {
                level = !level;
            }
            start = stop;
        }
        return out.toArray(new Edges[0]);
    }

    /** Samples every lane of the whole workload through a fresh chain. */
    @Benchmark
    public long sample(Blackhole bh) {
        long[] count = new long[1];
        ChainBuilder b = Chain.builder(registry).add("s", "dual-edge", Map.of("lanes", lanes, "mode", mode));
        b.input("clk", DataKind.EDGES).wire("clk", "s.clock");
        for (int l = 0; l < lanes; l++) {
            b.input("d" + l, DataKind.EDGES).wire("d" + l, "s.lane" + l);
        }
        b.outputs(new BlockSink() {
            @Override
            public void accept(String id, String port, Block block) {
                if (block instanceof BitStream bs) {
                    count[0] += bs.count();
                    bh.consume(bs.values());
                } else {
                    bh.consume(block);
                }
            }

            @Override
            public boolean readsBitMargins(String id, String port) {
                return margins;
            }
        });
        try (Chain c = b.build()) {
            for (int k = 0; k < blocks[0].length; k++) {
                c.push("clk", blocks[0][k]);
                for (int l = 0; l < lanes; l++) {
                    c.push("d" + l, blocks[l + 1][k]);
                }
            }
            c.finish();
        }
        return count[0];
    }

    /** Baseline: a plain sequential read of every edge array of the workload. */
    @Benchmark
    public long sequentialRead() {
        long s = 0;
        for (Edges[] in : blocks) {
            for (Edges e : in) {
                long[] t = e.timesFs();
                for (int i = 0, n = e.count(); i < n; i++) {
                    s += t[i];
                }
            }
        }
        return s;
    }
}
