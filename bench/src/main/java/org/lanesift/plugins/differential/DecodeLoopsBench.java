package org.lanesift.plugins.differential;

import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
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
 * The two per-sample loops of the differential stage on their own, on data shaped like the DDR
 * capture of bench/scripts/ddr-capture.py: two float legs around 1.2 V, 0.35 V differential swing,
 * 3 mV noise per leg, edges of about 1.25 samples; {@code clock}: an edge every 12.5 samples,
 * {@code random}: random bits of 12.5 samples (an edge every 25 on average). Four chunks of 64 Ki
 * samples, cache-resident as a chunk is after the raw reader's conversion.
 * <ul>
 * <li>{@link #comparator}: {@link Comparator} pair scan, crossing interpolation, time stamps and
 * edge list, threshold 0 V, hysteresis 35 mV; {@link #comparatorNoEdges}: the same scan over a
 * signal that never crosses (the per-sample part alone);</li>
 * <li>{@link #levelStatistics}: {@link LevelAcc#add} with the default stride 16 over the states the
 * comparator gave;</li>
 * <li>{@link #sequentialReadOfBothLegs}: the baseline in the same run.</li>
 * </ul>
 * Time per sample (ns/op, ops = samples of one pair).
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class DecodeLoopsBench {
    static final int N = 1 << 16;
    static final int CHUNKS = 4;
    static final double PERIOD_FS = 400_000; // 2.5 GS/s

    /** {@code clock} or {@code random}. */
    @Param({"clock", "random"})
    public String pattern;

    float[][] p = new float[CHUNKS][N];
    float[][] n = new float[CHUNKS][N];
    float[] flatP = new float[N];
    float[] flatN = new float[N];
    long[][] states = new long[CHUNKS][];
    long[] bits = new long[BitSets.words(N)];

    @Setup
    public void setup() {
        Random r = new Random(20261204);
        boolean clock = pattern.equals("clock");
        boolean bit = false;
        double prevTarget = -0.175;
        for (int c = 0; c < CHUNKS; c++) {
            for (int i = 0; i < N; i++) {
                long k = (long) c * N + i;
                double u = k / 12.5;
                long ui = (long) Math.floor(u);
                if (k == 0 || (long) Math.floor((k - 1) / 12.5) != ui) {
                    prevTarget = bit ? 0.175 : -0.175;
                    bit = clock ? !bit : r.nextBoolean();
                }
                double target = bit ? 0.175 : -0.175;
                double f = Math.min(1, (u - ui) * 12.5 / 1.25); // a 1.25-sample linear edge
                double d = prevTarget + (target - prevTarget) * f;
                p[c][i] = (float) (1.2 + d / 2 + 0.003 * r.nextGaussian());
                n[c][i] = (float) (1.2 - d / 2 + 0.003 * r.nextGaussian());
            }
        }
        for (int i = 0; i < N; i++) {
            flatP[i] = (float) (1.2 + 0.0875 + 0.003 * r.nextGaussian());
            flatN[i] = (float) (1.2 - 0.0875 + 0.003 * r.nextGaussian());
        }
        Comparator cmp = newComparator();
        for (int c = 0; c < CHUNKS; c++) {
            states[c] = new long[BitSets.words(N)];
            cmp.beginChunk(p[c], 0, n[c], 0, N, null, states[c]);
            cmp.runSegment(0, N);
            cmp.takeEdges("x", false);
        }
    }

    private static Comparator newComparator() {
        Comparator c = new Comparator(0, PERIOD_FS, false, null);
        c.setThreshold(0, 0.035, 0);
        return c;
    }

    /** Comparator pair scan with crossings, time stamps and edge lists. */
    @Benchmark
    @OperationsPerInvocation(N * CHUNKS)
    public int comparator() {
        Comparator c = newComparator();
        int edges = 0;
        for (int k = 0; k < CHUNKS; k++) {
            java.util.Arrays.fill(bits, 0);
            c.beginChunk(p[k], 0, n[k], 0, N, null, bits);
            c.runSegment(0, N);
            Edges e = c.takeEdges("x", false);
            edges += e == null ? 0 : e.count();
        }
        return edges;
    }

    /** The same scan over a signal that stays high: the per-sample part without any crossing. */
    @Benchmark
    @OperationsPerInvocation(N * CHUNKS)
    public long comparatorNoEdges() {
        Comparator c = newComparator();
        for (int k = 0; k < CHUNKS; k++) {
            java.util.Arrays.fill(bits, 0);
            c.beginChunk(flatP, 0, flatN, 0, N, null, bits);
            c.runSegment(0, N);
        }
        return bits[5];
    }

    /** Window statistics, one sample in 16, over the comparator's states. */
    @Benchmark
    @OperationsPerInvocation(N * CHUNKS)
    public long levelStatistics() {
        LevelAcc w = new LevelAcc(0);
        for (int k = 0; k < CHUNKS; k++) {
            w.add(p[k], 0, n[k], 0, (long) k * N, 0, N, states[k], null, 0f, 0.0175f, 0.1225f, 16, Float.POSITIVE_INFINITY);
        }
        return w.n[0] + w.n[1];
    }

    /** Baseline: a plain sequential read of the same two legs. */
    @Benchmark
    @OperationsPerInvocation(N * CHUNKS)
    public int sequentialReadOfBothLegs() {
        return org.lanesift.bench.PlainRead.foldLegs(p, n, N);
    }
}
