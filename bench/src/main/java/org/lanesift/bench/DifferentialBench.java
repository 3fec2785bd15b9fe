package org.lanesift.bench;

import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.plugins.differential.DifferentialPlugin;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * The differential stage, pair mode: two float legs in memory to logic + edges (+ level statistics
 * every {@code statsStride} samples and report bookkeeping). The capture is a random NRZ pair, 8 samples per
 * bit (a transition every 16 samples on average), tanh edges, 10 mV noise, around 1.2 V; blocks of
 * 64 Ki samples per leg; with {@code analogOutputs} the stage also emits P-N and (P+N)/2.
 * Throughput in samples per second per pair (ops = samples). The baseline
 * reads the same two float arrays sequentially in the same run.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class DifferentialBench {
    static final int N = 1 << 16;
    static final int BLOCKS = 16;
    static final double PERIOD_FS = 200_000;

    /** Samples per bit of the synthetic link: 8 (busy) or 64 (few edges). */
    @Param({"8", "64"})
    public int samplesPerBit;

    /** Option statsStride: 16 (the default) or 1024 (level statistics nearly off, the comparator alone). */
    @Param({"16", "1024"})
    public int statsStride;

    /**
     * Options diffOutput and commonOutput: false (the default, logic and edges only) or true (also
     * the analog outputs P-N and (P+N)/2, one new float array per block and output).
     */
    @Param({"false", "true"})
    public boolean analogOutputs;

    /**
     * {@code random}: each bit random (a data lane); {@code clock}: the bit toggles every
     * {@code samplesPerBit} samples (a clock pair: with 12, nearly the DDR capture's clock edge every
     * 12.5 samples of bench/scripts/ddr-capture.py).
     */
    @Param({"random"})
    public String pattern;

    /**
     * {@code on}: the default options (window statistics every {@code statsStride} samples, learned
     * hysteresis, level report); {@code off}: levelReport=false, a given threshold (0 V) and hysteresis, so no window
     * statistics are taken and the comparator runs alone (the difference is the statistics' cost).
     */
    @Param({"on"})
    public String statistics;

    float[][] p = new float[BLOCKS][];
    float[][] n = new float[BLOCKS][];
    Stage stage;
    CountingContext ctx;
    long nextStartFs;
    long index;

    @Setup(Level.Trial)
    public void setup() throws Exception {
        Random r = new Random(7);
        boolean bit = false;
        double level = -0.175;
        for (int b = 0; b < BLOCKS; b++) {
            p[b] = new float[N];
            n[b] = new float[N];
            for (int i = 0; i < N; i++) {
                if (((long) b * N + i) % samplesPerBit == 0) {
                    bit = pattern.equals("clock") ? !bit : r.nextBoolean();
                }
                double target = bit ? 0.175 : -0.175;
                level += (target - level) * 0.45; // first-order edge, about 4 samples 10-90 %
                double d = level + 0.01 * r.nextGaussian();
                p[b][i] = (float) (1.2 + d / 2);
                n[b][i] = (float) (1.2 - d / 2);
            }
        }
        Map<String, Object> o = new java.util.HashMap<>(Map.of("statsStride", statsStride, "diffOutput", analogOutputs,
                "commonOutput", analogOutputs));
        if (statistics.equals("off")) {
            o.put("levelReport", false);
            o.put("thresholdVolts", 0.0);
            o.put("hysteresisVolts", 0.035);
        }
        open(o);
    }

    void open(Map<String, ?> options) throws Exception {
        ctx = new CountingContext("rx", new DifferentialPlugin(), options);
        stage = new DifferentialPlugin().open(ctx);
        nextStartFs = 0;
        index = 0;
    }

    /** Baseline: a plain sequential read of the same two float arrays. */
    @Benchmark
    @OperationsPerInvocation(N * BLOCKS)
    public int sequentialReadOfBothLegs() {
        return PlainRead.foldLegs(p, n, N);
    }

    /** Pair to logic + edges with default options (learned threshold, linear interpolation, level statistics). */
    @Benchmark
    @OperationsPerInvocation(N * BLOCKS)
    public long pairToLogicAndEdges() throws Exception {
        for (int b = 0; b < BLOCKS; b++) {
            stage.accept(0, new AnalogBlock("p", index, nextStartFs, PERIOD_FS, p[b], N, null));
            stage.accept(1, new AnalogBlock("n", index, nextStartFs, PERIOD_FS, n[b], N, null));
            index += N;
            nextStartFs += Math.round(N * PERIOD_FS);
        }
        return ctx.transitions + ctx.blocks;
    }
}
