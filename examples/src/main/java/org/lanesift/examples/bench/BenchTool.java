package org.lanesift.examples.bench;

import java.io.PrintStream;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.DataKind;
import org.lanesift.examples.demo.Impairments;
import org.lanesift.examples.demo.PixelLinkScene;
import org.lanesift.kit.SampleStats;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;

/**
 * {@code lanesift bench}: the whole analog chain of the demo's pixel link (leg deskew, four
 * differential receivers, lane deskew, 7:1 sampling, pixel decoding) over an in-memory capture of
 * eight channels, against a plain sequential read of the same arrays in the same run. Prefixes of
 * the chain are timed too, so the differences show where the time goes. The headline ratio comes
 * from rounds of the read followed by the whole chain, the ratio taken within each round and the
 * median of the rounds reported with their least and largest (a shared machine's speed drifts
 * between rounds; within one round it hits both sides alike). Each figure is measured
 * twice: wall-clock seconds (the headline) and the CPU seconds of the whole process over the same
 * span (every thread: the chain's, any second thread a stage uses, and also the JIT compiler and
 * the garbage collector), so the CPU figure shows what the run cost the machine rather than only
 * what the calling thread did, and no work moved to another thread is hidden from it.
 */
public final class BenchTool implements Tool {
    private static volatile double readSink;
    /** Shortest total wall time of one measurement, seconds ({@link #repeated}). */
    static final double MIN_SPAN_S = 0.2;
    /** The process CPU clock, looked up on first use: java.management would load with every tool command. */
    private static final class Process {
        static final java.lang.management.OperatingSystemMXBean MX = ManagementFactory.getOperatingSystemMXBean();
    }

    /** Creates the tool (ServiceLoader). */
    public BenchTool() {
    }

    /** One frame of the demo pixel link at 2.5 GS/s and 20 MHz: the smallest capture bench lays out. */
    static final int TILE_SAMPLES = PixelLinkScene.V_TOTAL * 11_000;

    /** The command line. */
    static final ToolSpec SPEC = ToolSpec.builder("bench")
            .summary("throughput of the whole analog chain on an in-memory capture, as a ratio to a plain sequential read")
            .description("Runs the demo's pixel-link chain (deskew -> differential -> deskew -> 7:1 sampling -> decoder)",
                    "over an in-memory capture of 8 channels and prints samples/s per channel, the ratio to a plain",
                    "sequential read of the same arrays measured in the same run, and the peak heap.")
            .option(OptionSpec.integer("samples", 50_000_000L, TILE_SAMPLES, 400_000_000L,
                    "samples per channel, rounded to whole frames"), "N")
            .option(OptionSpec.integer("rounds", 5L, 1, 99,
                    "rounds of the plain read followed by the whole chain; the headline ratio is the median of the rounds' ratios"), "N")
            .footer("Memory: 8 x N x 4 bytes for the capture (1.6 GB at the default); the launcher's JVM default heap suffices.")
            .build();

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        PrintStream out = console.out();
        PrintStream err = console.err();
        long samples = args.integer("samples", 50_000_000L);
        int rounds = (int) args.integer("rounds", 5L);
        int tileSamples = TILE_SAMPLES;
        long need = samples * 8 * 4;
        long max = Runtime.getRuntime().maxMemory();
        if (need > max * 0.8) {
            throw new OptionException("samples", String.format(Locale.ROOT, "bench: %d samples x 8 channels need %.1f GB of heap, "
                    + "the JVM has %.1f GB; use fewer --samples or a larger -Xmx", samples, need / 1e9, max / 1e9));
        }
        out.printf(Locale.ROOT, "lanesift bench: rendering one frame of the demo pixel link and laying %d samples per channel "
                + "in memory...%n", samples);
        PixelLinkScene.Capture tile = PixelLinkScene.render(Impairments.pixelLinkDefaults(), 0, PixelLinkScene.V_TOTAL, false);
        int frames = (int) Math.max(1, samples / tileSamples);
        long n = (long) frames * tileSamples;
        int block = 65536;
        double periodFs = 1e15 / tile.sampleRateHz();
        int blocks = (int) ((n + block - 1) / block);
        AnalogBlock[][] data = new AnalogBlock[8][blocks];
        for (int c = 0; c < 8; c++) {
            float[] src = tile.volts()[c];
            for (int b = 0; b < blocks; b++) {
                long first = (long) b * block;
                int len = (int) Math.min(block, n - first);
                float[] v = new float[len];
                int pos = (int) (first % tileSamples);
                int k = 0;
                while (k < len) {
                    int run = Math.min(len - k, tileSamples - pos);
                    System.arraycopy(src, pos, v, k, run);
                    k += run;
                    pos = 0;
                }
                data[c][b] = new AnalogBlock(tile.channels()[c], first, Math.round(first * periodFs), periodFs, v, len, null);
            }
        }
        PluginRegistry reg = PluginRegistry.discover(BenchTool.class.getClassLoader());
        for (String id : new String[] {"deskew", "differential", "dual-edge", "pixel-link"}) {
            if (reg.find(id) == null) {
                err.println("bench: plugin '" + id + "' is not on the class path");
                return 1;
            }
        }
        if (!cpuTimeAvailable()) {
            err.println("bench: this JVM does not measure process CPU time; only wall-clock figures follow");
        }
        // warm-up: the JIT compiles the chain's hot code during its first runs over the whole capture (measured: the
        // first run of the whole chain took 1.2 to 1.3 times a later one); untimed
        for (int i = 0; i < 2; i++) {
            run(reg, data, blocks, 4, new double[2]);
        }
        double[] t = new double[2];
        double read = Double.MAX_VALUE;
        double readCpu = Double.MAX_VALUE;
        for (int i = 0; i < 3; i++) {
            repeated(() -> sequentialRead(data, t), t); // best of three: the loop is JIT-compiled after the first
            read = Math.min(read, t[0]);
            readCpu = Math.min(readCpu, t[1]);
        }
        String[] names = {"leg deskew", "+ differential receivers", "+ lane deskew and 7:1 sampling", "+ pixel decoder (whole chain)"};
        double[] secs = new double[4];
        double[] cpuSecs = new double[4];
        long[] heap = new long[4];
        // two rounds over the prefixes, best of two each: the first round also finishes JIT compilation
        java.util.Arrays.fill(secs, Double.MAX_VALUE);
        java.util.Arrays.fill(cpuSecs, Double.MAX_VALUE);
        for (int round = 0; round < 2; round++) {
            for (int depth = 1; depth <= 4; depth++) {
                resetPeaks();
                final int d = depth;
                repeated(() -> run(reg, data, blocks, d, t), t);
                secs[depth - 1] = Math.min(secs[depth - 1], t[0]);
                cpuSecs[depth - 1] = Math.min(cpuSecs[depth - 1], t[1]);
                heap[depth - 1] = Math.max(heap[depth - 1], peakHeap());
            }
        }
        double readRate = n / read;
        out.printf(Locale.ROOT, "capture: 8 channels x %d samples (%d frames of the demo pixel link, %.1f ms at 2.5 GS/s), blocks of %d%n",
                n, frames, n * periodFs / 1e12, block);
        out.println("prefixes of the chain, the fastest of two runs each, against the fastest of three plain reads:");
        out.printf(Locale.ROOT, "  %-34s %8.3f s  %9.1f M samples/s per channel%n", "plain sequential read", read, readRate / 1e6);
        for (int i = 0; i < 4; i++) {
            double rate = n / secs[i];
            out.printf(Locale.ROOT, "  %-34s %8.3f s  %9.1f M samples/s per channel  ratio %.4f  peak heap %d MB%n", names[i], secs[i],
                    rate / 1e6, rate / readRate, heap[i] >> 20);
        }
        double share = 0;
        out.println("where the time goes (differences between the prefixes above):");
        for (int i = 0; i < 4; i++) {
            double d = secs[i] - (i == 0 ? 0 : secs[i - 1]);
            share = d / secs[3];
            out.printf(Locale.ROOT, "  %-34s %6.1f %%%s%n", names[i].replace("+ ", ""), 100 * share,
                    share < 0 ? "  (negative: within the run-to-run noise of this machine)" : "");
        }
        // the headline: the read and the whole chain one after the other in each round, the ratio taken within the
        // round, so that a change in the machine's speed between rounds hits both sides alike
        out.printf(Locale.ROOT, "%d rounds, each the plain read then the whole chain (the ratio is taken within the round):%n", rounds);
        SampleStats ratio = new SampleStats("", rounds);
        SampleStats cpuRatio = new SampleStats("", rounds);
        SampleStats chain = new SampleStats("s", rounds);
        SampleStats chainCpu = new SampleStats("s", rounds);
        for (int r = 1; r <= rounds; r++) {
            repeated(() -> sequentialRead(data, t), t);
            double rd = t[0];
            double rdCpu = t[1];
            repeated(() -> run(reg, data, blocks, 4, t), t);
            ratio.add(rd / t[0]);
            chain.add(t[0]);
            out.printf(Locale.ROOT, "  round %d: read %.3f s, whole chain %.3f s, ratio %.4f", r, rd, t[0], rd / t[0]);
            if (cpuTimeAvailable() && rdCpu > 0 && t[1] > 0) {
                cpuRatio.add(rdCpu / t[1]);
                chainCpu.add(t[1]);
                out.printf(Locale.ROOT, "; process CPU %.3f s and %.3f s, ratio %.4f", rdCpu, t[1], rdCpu / t[1]);
            }
            out.println();
        }
        out.printf(Locale.ROOT, "whole chain: %.1f M samples/s per channel, ratio to the sequential read %.4f (target 0.5), the median"
                + " of %d rounds (min %.4f, max %.4f); the capture itself holds %d MB of the heap%n", n / chain.percentile(50) / 1e6,
                ratio.percentile(50), rounds, ratio.min(), ratio.max(), need >> 20);
        if (cpuTimeAvailable()) {
            // CPU seconds of this process, every thread: what other processes on a shared machine take does not count
            double readCpuRate = n / readCpu;
            out.println("process CPU time, all threads (the same runs; includes worker threads, JIT and GC; waiting for a core"
                    + " on a loaded machine does not count):");
            out.printf(Locale.ROOT, "  %-34s %8.3f s  %9.1f M samples/s per channel%n", "plain sequential read", readCpu,
                    readCpuRate / 1e6);
            for (int i = 0; i < 4; i++) {
                double rate = n / cpuSecs[i];
                out.printf(Locale.ROOT, "  %-34s %8.3f s  %9.1f M samples/s per channel  ratio %.4f%n", names[i], cpuSecs[i],
                        rate / 1e6, rate / readCpuRate);
            }
            out.printf(Locale.ROOT, "whole chain (process CPU time, all threads): %.1f M samples/s per channel, ratio to the"
                    + " sequential read %.4f, the median of %d rounds (min %.4f, max %.4f); wall time / CPU time %.2f (above 1: the"
                    + " run waited for a core; below 1: it used more than one)%n", n / chainCpu.percentile(50) / 1e6,
                    cpuRatio.percentile(50), cpuRatio.count(), cpuRatio.min(), cpuRatio.max(), chain.percentile(50) / chainCpu.percentile(50));
        }
        return 0;
    }

    private static boolean cpuTimeAvailable() {
        return Process.MX instanceof com.sun.management.OperatingSystemMXBean os && os.getProcessCpuTime() >= 0;
    }

    /** CPU time of the whole process (every thread), nanoseconds, or 0 when the JVM does not measure it. */
    private static long cpuNanos() {
        return Process.MX instanceof com.sun.management.OperatingSystemMXBean os ? Math.max(0, os.getProcessCpuTime()) : 0;
    }

    /**
     * Repeats a measurement until it has taken {@value #MIN_SPAN_S} s of wall time in all (once for
     * the usual capture sizes) and leaves the mean of both figures in {@code secs}: the process CPU
     * clock ticks coarsely (10 ms on Linux), so a single short span could read 0.
     */
    private static void repeated(Runnable measure, double[] secs) {
        double wall = 0;
        double cpu = 0;
        int reps = 0;
        do {
            measure.run();
            wall += secs[0];
            cpu += secs[1];
            reps++;
        } while (wall < MIN_SPAN_S);
        secs[0] = wall / reps;
        secs[1] = cpu / reps;
    }

    /** Reads every sample once; {@code secs} receives wall-clock and process CPU seconds. */
    private static void sequentialRead(AnalogBlock[][] data, double[] secs) {
        long c0 = cpuNanos();
        long t0 = System.nanoTime();
        double s = 0;
        for (AnalogBlock[] ch : data) {
            for (AnalogBlock b : ch) {
                float[] v = b.volts();
                for (int i = 0, n = b.length(); i < n; i++) {
                    s += v[i];
                }
            }
        }
        secs[0] = (System.nanoTime() - t0) / 1e9;
        secs[1] = (cpuNanos() - c0) / 1e9;
        readSink = s; // a volatile write keeps the JIT from dropping the loop
    }

    /**
     * Runs the first {@code depth} stages of the chain over the first {@code blocks} blocks;
     * {@code secs} receives wall-clock and process CPU seconds.
     */
    private static void run(PluginRegistry reg, AnalogBlock[][] data, int blocks, int depth, double[] secs) {
        String[][] pairs = {{"CLK", "0", "1"}, {"D0", "2", "3"}, {"D1", "4", "5"}, {"D2", "6", "7"}};
        ChainBuilder b = Chain.builder(reg);
        List<String> inputs = new ArrayList<>();
        for (int c = 0; c < 8; c++) {
            b.input("in" + c, DataKind.ANALOG);
            inputs.add("in" + c);
        }
        b.add("legs", "deskew", Map.of("kind", "analog", "channels", 8, "offsets", List.of(0, -30, 0, 40, 0, -55, 0, -25)));
        for (int c = 0; c < 8; c++) {
            b.wire("in" + c, "legs.in" + c);
        }
        if (depth >= 2) {
            for (int k = 0; k < 4; k++) {
                String id = "rx-" + pairs[k][0];
                b.add(id, "differential", Map.of("mode", "pair", "name", pairs[k][0]));
                b.wire("legs.out" + (2 * k), id + ".p").wire("legs.out" + (2 * k + 1), id + ".n");
            }
        }
        if (depth >= 3) {
            b.add("lanes", "deskew", Map.of("kind", "edges", "channels", 4, "offsets", List.of(0, -120, 80, -250)));
            for (int k = 0; k < 4; k++) {
                b.wire("rx-" + pairs[k][0] + ".edges", "lanes.in" + k);
            }
            b.add("sampler", "dual-edge", Map.of("mode", "multiplied", "slots", 7, "lanes", 3));
            b.wire("lanes.out0", "sampler.clock");
            for (int k = 0; k < 3; k++) {
                b.wire("lanes.out" + (k + 1), "sampler.lane" + k);
            }
        }
        if (depth >= 4) {
            b.add("panel", "pixel-link", Map.of("mapping", "bits-18", "pictures", "none", "detail", "anomalies"));
            for (int k = 0; k < 3; k++) {
                b.wire("sampler.bits" + k, "panel.lane" + k);
            }
        }
        long[] sink = new long[1];
        b.outputs((id, port, blk) -> sink[0]++);
        Chain chain = b.build();
        long c0 = cpuNanos();
        long t0 = System.nanoTime();
        for (int i = 0; i < blocks; i++) {
            for (int c = 0; c < 8; c++) {
                chain.push(inputs.get(c), data[c][i]);
            }
        }
        chain.finish();
        secs[0] = (System.nanoTime() - t0) / 1e9;
        secs[1] = (cpuNanos() - c0) / 1e9;
        chain.close();
    }

    private static void resetPeaks() {
        System.gc();
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
            if (p.getType() == MemoryType.HEAP) {
                p.resetPeakUsage();
            }
        }
    }

    private static long peakHeap() {
        long s = 0;
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
            if (p.getType() == MemoryType.HEAP) {
                s += p.getPeakUsage().getUsed();
            }
        }
        return s;
    }
}
