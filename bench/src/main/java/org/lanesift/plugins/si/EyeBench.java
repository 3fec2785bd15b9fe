package org.lanesift.plugins.si;

import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Eye-diagram accumulation speed: samples folded into the 640 x 400 histogram per microsecond
 * (= millions of samples per second) on one thread, against a plain sequential read of the same
 * float array measured in the same run. The signal is a noisy NRZ eye at 39.7 samples per UI.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class EyeBench {
    static final int N = 1 << 20;

    float[] volts;
    long[] invalid;
    EyeAccumulator acc;
    double step;

    /** Builds the samples. */
    @Setup(Level.Trial)
    public void setup() {
        Random r = new Random(1);
        volts = new float[N];
        double spu = 39.71234;
        boolean bit = false;
        boolean prev = false;
        long k = -1;
        for (int i = 0; i < N; i++) {
            double ph = (i / spu) % 1.0;
            if ((long) (i / spu) != k) {
                k = (long) (i / spu);
                prev = bit;
                bit = r.nextBoolean();
            }
            double a = prev ? 0.2 : -0.2;
            double b = bit ? 0.2 : -0.2;
            double f = Math.min(1, ph / 0.1);
            volts[i] = (float) (a + (b - a) * f + r.nextGaussian() * 0.01);
        }
        invalid = new long[(N + 63) / 64];
        invalid[100] = 1L << 5; // one clipped sample: exercises the masked path
        acc = new EyeAccumulator(640, 400, -0.3, 0.3);
        step = 320 / spu;
    }

    /** Baseline: a plain sequential read (sum) of the same array. */
    @Benchmark
    @OperationsPerInvocation(N)
    public double sequentialRead() {
        float[] v = volts;
        double s = 0;
        for (int i = 0; i < v.length; i++) {
            s += v[i];
        }
        return s;
    }

    /** Eye accumulation on a fixed bit rate (the plugin's hot loop). */
    @Benchmark
    @OperationsPerInvocation(N)
    public double accumulate() {
        return acc.accumulate(volts, 0, N, 0.0, step);
    }

    /** Eye accumulation with a validity mask present (per-sample mask test). */
    @Benchmark
    @OperationsPerInvocation(N)
    public double accumulateMasked() {
        return acc.accumulate(volts, invalid, 0, N, 0.0, step);
    }
}
