package org.lanesift.runner.output;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.data.BitStream;
import org.lanesift.data.LogicBlock;
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
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

/**
 * The run's text writers on a DDR-like workload (issue 19 item 1), file on /tmp included.
 *
 * <ul>
 * <li>{@code bitsCsv}: {@link #BITS} sampled bits of one lane, in blocks of {@link #BLOCK} bits, 5 ns
 * apart with margins, through {@link BitsCsvWriter}; rows per second = BITS / time.</li>
 * <li>{@code vcd}: four comparator levels at 2.5 GS/s ({@link #SAMPLES} samples each, a change
 * every 12 samples on average), in blocks of {@link #BLOCK} samples interleaved as the engine
 * delivers them, through {@link VcdWriter}; {@code declared} lays the file out as the signals
 * arrive (as {@code run} does), otherwise everything is merged at close.</li>
 * </ul>
 * Time per workload.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 2)
@Measurement(iterations = 3, time = 2)
@Fork(1)
public class WriterBench {
    static final int BITS = 1 << 21;
    static final int SAMPLES = 1 << 23;
    static final int BLOCK = 1 << 16;

    @Param({"true", "false"})
    boolean declared;

    BitStream[] bitBlocks;
    LogicBlock[][] logic;
    Path dir;

    @Setup
    public void setup() throws IOException {
        Random r = new Random(19);
        dir = Files.createTempDirectory("writer-bench");
        bitBlocks = new BitStream[BITS / BLOCK];
        for (int k = 0; k < bitBlocks.length; k++) {
            long[] t = new long[BLOCK];
            long[] edge = new long[BLOCK];
            long[] setup = new long[BLOCK];
            long[] hold = new long[BLOCK];
            long[] v = new long[BLOCK / 64];
            for (int i = 0; i < BLOCK; i++) {
                long n = (long) k * BLOCK + i;
                t[i] = 1_000_000L + n * 4_807_692L + r.nextInt(20_000);
                edge[i] = n;
                setup[i] = 2_000_000L + r.nextInt(100_000);
                hold[i] = r.nextInt(10) == 0 ? BitStream.UNKNOWN_MARGIN : 2_300_000L + r.nextInt(100_000);
                v[i >> 6] = r.nextLong();
            }
            bitBlocks[k] = new BitStream("d0", t[0], t[BLOCK - 1] + 1, BLOCK, v, t, edge, new long[BLOCK / 64], null, setup,
                    hold, new long[BLOCK / 64], 4_807_692.0);
        }
        logic = new LogicBlock[SAMPLES / BLOCK][4];
        double p = 400_000;
        boolean[] level = new boolean[4];
        for (int k = 0; k < logic.length; k++) {
            for (int s = 0; s < 4; s++) {
                long[] bits = new long[BLOCK / 64];
                for (int i = 0; i < BLOCK; i++) {
                    if (r.nextInt(12) == 0) {
                        level[s] = !level[s];
                    }
                    if (level[s]) {
                        bits[i >> 6] |= 1L << i;
                    }
                }
                long first = (long) k * BLOCK;
                logic[k][s] = new LogicBlock("l" + s, first, Math.round(first * p), p, bits, BLOCK, null);
            }
        }
    }

    @TearDown(Level.Iteration)
    public void clean() throws IOException {
        try (var l = Files.list(dir)) {
            for (Path f : l.toList()) {
                Files.deleteIfExists(f);
            }
        }
    }

    @Benchmark
    public long bitsCsv() throws IOException {
        Path f = dir.resolve("bits.csv");
        try (BitsCsvWriter w = new BitsCsvWriter(f)) {
            for (BitStream b : bitBlocks) {
                w.write(b);
            }
        }
        return Files.size(f);
    }

    @Benchmark
    public long vcd() throws IOException {
        Path f = dir.resolve("signals.vcd");
        VcdWriter w = new VcdWriter(f, dir.resolve("spool"), "bench");
        if (declared) {
            for (int s = 0; s < 4; s++) {
                w.declare("rx", "l" + s);
            }
        }
        for (LogicBlock[] step : logic) {
            for (int s = 0; s < 4; s++) {
                w.logic("rx", "l" + s, step[s]);
            }
        }
        w.close();
        return Files.size(f);
    }
}
