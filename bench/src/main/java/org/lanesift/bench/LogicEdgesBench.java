package org.lanesift.bench;

import java.util.concurrent.TimeUnit;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Logic to edges conversion on a 10 MHz square wave sampled at 1 GS/s (a transition every 50
 * samples), in blocks of 1 M samples; throughput in samples per second (ops = samples). The
 * baseline XORs the same words sequentially. {@link #toEdgesWithUnknowns} converts the same
 * blocks with unknown samples: a run of 1 to 40 samples every 3000 or so (seeded), as a capture
 * with dropouts has them. {@link #toEdgesDense} converts random logic with a transition every 4
 * samples on average in blocks of 64 K samples, as the live decode sees it (its simulator makes
 * about 2 transitions per sample over 8 channels).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class LogicEdgesBench {
    static final int N = 1 << 20;
    static final int BLOCKS = 16;
    /** Samples per block of the dense case: the spool source's default block. */
    static final int DENSE_N = 1 << 16;
    LogicBlock[] blocks;
    LogicBlock[] withUnknowns;
    LogicBlock[] dense;

    @Setup
    public void setup() {
        blocks = new LogicBlock[BLOCKS];
        for (int b = 0; b < BLOCKS; b++) {
            long[] bits = new long[BitSets.words(N)];
            for (int i = 0; i < N; i++) {
                long global = (long) b * N + i;
                if ((global / 50) % 2 == 1) {
                    bits[i >>> 6] |= 1L << i;
                }
            }
            long first = (long) b * N;
            blocks[b] = new LogicBlock("clk", first, first * 1_000_000L, 1e6, bits, N, null);
        }
        java.util.Random r = new java.util.Random(19);
        dense = new LogicBlock[BLOCKS * 16];
        boolean level = false;
        for (int b = 0; b < dense.length; b++) {
            long[] bits = new long[BitSets.words(DENSE_N)];
            for (int i = 0; i < DENSE_N; i++) {
                level ^= r.nextInt(4) == 0;
                bits[i >>> 6] |= level ? 1L << i : 0L;
            }
            long first = (long) b * DENSE_N;
            dense[b] = new LogicBlock("d", first, first * 20_000_000L, 2e7, bits, DENSE_N, null);
        }
        withUnknowns = new LogicBlock[BLOCKS];
        for (int b = 0; b < BLOCKS; b++) {
            long[] inv = new long[BitSets.words(N)];
            for (int i = r.nextInt(3000); i < N; i += 1 + r.nextInt(6000)) {
                BitSets.setRange(inv, i, Math.min(N, i + 1 + r.nextInt(40)));
            }
            LogicBlock k = blocks[b];
            withUnknowns[b] = new LogicBlock("clk", k.firstIndex(), k.startFs(), k.periodFs(), k.bits(), N, inv);
        }
    }

    /** Baseline: one XOR pass over the same words. */
    @Benchmark
    @OperationsPerInvocation(N * BLOCKS)
    public long sequentialRead() {
        long x = 0;
        for (LogicBlock b : blocks) {
            long[] w = b.bits();
            for (long v : w) {
                x ^= v;
            }
        }
        return x;
    }

    /** Stateful conversion of every block to edges. */
    @Benchmark
    @OperationsPerInvocation(N * BLOCKS)
    public long toEdges() {
        LogicEdges conv = new LogicEdges();
        long n = 0;
        for (LogicBlock b : blocks) {
            Edges e = conv.toEdges(b);
            n += e.count();
        }
        return n;
    }

    /** Stateful conversion of the blocks with unknown runs. */
    @Benchmark
    @OperationsPerInvocation(N * BLOCKS)
    public long toEdgesWithUnknowns() {
        LogicEdges conv = new LogicEdges();
        long n = 0;
        for (LogicBlock b : withUnknowns) {
            Edges e = conv.toEdges(b);
            n += e.count() + e.invalidCount();
        }
        return n;
    }

    /** Stateful conversion of dense random logic in spool-sized blocks. */
    @Benchmark
    @OperationsPerInvocation(DENSE_N * BLOCKS * 16)
    public long toEdgesDense() {
        LogicEdges conv = new LogicEdges();
        long n = 0;
        for (LogicBlock b : dense) {
            n += conv.toEdges(b).count();
        }
        return n;
    }
}
