package org.lanesift.plugins.discovery;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.util.Arrays;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.TimeUnit;
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

/**
 * Discovery over 10 M sampled bits: one double-edge lane (5 M clock periods), bursts of a sync
 * and 16-bit words sent MSB first; {@code link=clock-pauses}: an 8-bit sync, the clock pausing
 * between bursts; {@code link=streaming}: a 24-bit sync, bursts back to back on a clock that
 * never pauses (framed by the sync alone, the slowest framing path). The data bursts carry
 * a smooth 16-bit picture, the command bursts short random words. Time for one whole discovery
 * (single shot, milliseconds); the baseline reads the same edge arrays once. Each discovery also
 * prints the CPU time of its thread (the figure to read on a shared machine, where wall time
 * includes waiting for a core) and the word and sync length found. Lives in the plugin's
 * package to reach the engine without widening its API (DEVELOPERS.md, Benchmarks).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 1)
@Measurement(iterations = 3)
@Fork(value = 1, jvmArgs = {"-Xmx2g"})
public class DiscoveryBench {
    static final int BITS = 10_000_000;
    LinkEdgesInput input;

    /** How the bursts are separated. */
    @Param({"clock-pauses", "streaming"})
    public String link;

    @Setup
    public void setup() {
        Random r = new Random(10);
        boolean[] bits = new boolean[BITS + 4096];
        int[] burstEnd = new int[BITS / 64];
        int bursts = 0;
        int n = 0;
        int pixel = 0;
        boolean streaming = link.equals("streaming");
        int sync = streaming ? 0xA7C35E : 0xA7;
        int syncBits = streaming ? 24 : 8;
        while (n < BITS) {
            int start = n;
            for (int j = syncBits - 1; j >= 0; j--) {
                bits[n++] = (sync >> j & 1) != 0;
            }
            boolean data = r.nextInt(3) > 0;
            int words = data ? 257 : 2 + 2 * r.nextInt(4);
            for (int q = 0; q < words && n < BITS + 4000; q++) {
                int v;
                if (q == 0) {
                    v = data ? 0x2C2C : 0x0100 * (1 + r.nextInt(5));
                } else if (data) {
                    int x = pixel % 320;
                    int y = pixel / 320;
                    pixel++;
                    // no component is zero: six black pixels in a row would be 96 bits at the idle level
                    v = ((x / 10) & 31 | 1) << 11 | ((y / 4) & 63 | 1) << 5 | ((x + y) / 20 & 31 | 1);
                } else {
                    v = r.nextInt(1 << 16);
                }
                for (int j = 15; j >= 0; j--) {
                    bits[n++] = (v >> j & 1) != 0;
                }
            }
            if ((n - start) % 2 == 1) {
                bits[n++] = false;
            }
            burstEnd[bursts++] = n;
        }
        long period = 4_000_000L; // 4 ns: 500 Mbit/s double-edge
        int periods = n / 2;
        long[] rise = new long[periods];
        long[] fall = new long[periods];
        long[] edges = new long[n];
        int m = 0;
        long t = 1_000_000L;
        int b = 0;
        boolean level = false;
        for (int p = 0; p < periods; p++) {
            rise[p] = t;
            fall[p] = t + period / 2;
            for (int j = 0; j < 2; j++) {
                int i = 2 * p + j;
                if (bits[i] != level) {
                    edges[m++] = t + (j == 0 ? -period / 4 : period / 4);
                    level = bits[i];
                }
            }
            t += period;
            if (b < bursts && 2 * p + 2 >= burstEnd[b]) {
                t += streaming ? 0 : 20 * period;
                b++;
            }
        }
        input = new LinkEdgesInput("CLK", rise, periods, fall, periods, new String[] {"D0"}, new boolean[] {false},
                new long[][] {Arrays.copyOf(edges, m)}, new int[] {m});
    }

    /** One discovery of the whole 10 M bits. */
    @Benchmark
    public int discover() {
        long cpu0 = THREADS.getCurrentThreadCpuTime();
        Hypotheses h = new DiscoveryEngine(DiscoveryEngine.DEFAULT_MAX_BITS).discover(input);
        long cpuNs = THREADS.getCurrentThreadCpuTime() - cpu0;
        System.out.printf(Locale.ROOT, "%ndiscover: %.2f s thread CPU for %d sampled bits; found %d-bit words, %d-bit sync%n",
                cpuNs / 1e9, h.link().bits(), h.best().wordBits(), h.syncBits());
        return h.best().wordBits() + h.syncBits();
    }

    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();

    /** Baseline: one sequential read of the clock and lane edge arrays. */
    @Benchmark
    public long baselineRead() {
        long s = 0;
        for (int i = 0; i < input.nRising(); i++) {
            s += input.risingFs()[i] ^ input.fallingFs()[i];
        }
        long[] e = input.laneEdgesFs()[0];
        for (int i = 0; i < input.laneCounts()[0]; i++) {
            s += e[i];
        }
        return s;
    }
}
