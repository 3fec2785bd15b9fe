package org.lanesift.bench;

import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Cost of the chain engine's plumbing: the same analog blocks are (a) read sequentially in a plain
 * loop and (b) pushed through a chain of three pass-through stages whose last output is read by
 * the same loop. The ratio (b)/(a) is the plumbing overhead; the target is under 1.05.
 * Reported as time per whole capture (16 M samples).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class EngineBench {
    @Param({"65536"})
    int blockSamples;

    static final int TOTAL = 1 << 24;
    AnalogBlock[] blocks;
    Chain chain;
    final double[] sink = new double[1];

    /** A stage that forwards every block unchanged. */
    static final class Pass implements PluginProvider {
        @Override
        public PluginDescriptor descriptor() {
            return PluginDescriptor.builder("bench.pass").input(PortSpec.of("in", DataKind.ANALOG, ""))
                    .output(PortSpec.of("out", DataKind.ANALOG, "")).build();
        }

        @Override
        public Stage open(StageContext ctx) {
            return new Stage() {
                @Override
                public void accept(int input, Block block) {
                    ctx.emit(0, block);
                }
            };
        }
    }

    @Setup(Level.Trial)
    public void setup() {
        int n = TOTAL / blockSamples;
        blocks = new AnalogBlock[n];
        java.util.Random r = new java.util.Random(1);
        for (int b = 0; b < n; b++) {
            float[] v = new float[blockSamples];
            for (int i = 0; i < v.length; i++) {
                v[i] = r.nextFloat();
            }
            long first = (long) b * blockSamples;
            blocks[b] = new AnalogBlock("ch", first, first * 1_000_000L, 1e6, v, blockSamples, null);
        }
    }

    @Setup(Level.Invocation)
    public void newChain() {
        chain = Chain.builder(new PluginRegistry().add(new Pass())).input("src", DataKind.ANALOG)
                .add("a", "bench.pass", Map.of()).add("b", "bench.pass", Map.of()).add("c", "bench.pass", Map.of())
                .wire("src", "a").wire("a", "b").wire("b", "c")
                .tap("c.out", blk -> sink[0] += sum((AnalogBlock) blk)).build();
    }

    static double sum(AnalogBlock a) {
        float[] v = a.volts();
        double s = 0;
        for (int i = 0, n = a.length(); i < n; i++) {
            s += v[i];
        }
        return s;
    }

    /** Baseline: a plain sequential read of the same arrays. */
    @Benchmark
    public double sequentialRead() {
        double s = 0;
        for (AnalogBlock b : blocks) {
            s += sum(b);
        }
        return s;
    }

    /** The same read behind three pass-through stages. */
    @Benchmark
    public double throughThreeStages() {
        sink[0] = 0;
        for (AnalogBlock b : blocks) {
            chain.push("src", b);
        }
        chain.finish();
        chain.close();
        return sink[0];
    }
}
