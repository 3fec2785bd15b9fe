package org.lanesift.plugins.serial;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.Stream;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugins.differential.LogicEdgesProvider;
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
 * Live capture from the device simulator over the in-process {@link Loopback} (the fastest local
 * transport) into a spool, three ways in one run:
 * <ul>
 * <li>{@code captureOnly}: simulator, link and spool writer with its indexer; no decoding;</li>
 * <li>{@code captureWithLiveDecode}: the same, with a chain following the spool on its own
 * thread while it is written: {@code spool} (follow) -> {@code logic-edges}, all 8 channels, every
 * edge counted;</li>
 * <li>{@code realTimeCaptureWithLiveDecode}: the same with the simulator sending at its configured
 * 50 MS/s (50.3 MB/s with the framing), as a device would; decoding keeps up if the lag stays
 * small;</li>
 * <li>{@code replayDecode}: the same chain over a finished spool (decoding alone).</li>
 * </ul>
 * Each invocation moves {@code megabytes} of samples; the score is the time for it. Each
 * invocation also prints the capture rate, the decode rate, the largest and the final decode lag
 * (spool bytes written but not yet decoded) and the peak heap (sum of the heap pools' peaks, an
 * upper bound; run with {@code -jvmArgsAppend -Xmx64m} to see that a small heap suffices). The
 * simulator runs in the same JVM and takes CPU a real device would not. Its samples make about 2
 * transitions per sample over the 8 channels (channel 0 toggles at nearly every sample), a worst
 * case for the edge decode. The CPU time of the capture and decode threads is printed too (with
 * the rate each would reach on a core of its own), since wall-clock rates on a shared machine say
 * more about the other users than about the code.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2)
@Measurement(iterations = 5)
@Fork(1)
public class LiveCaptureBench {
    @Param({"512"})
    int megabytes;

    /** The spool source's {@code blockSamples}: samples per block it emits (its default is 8192). */
    @Param({"8192"})
    int blockSamples;

    Path dir;
    Path replay;

    @Setup(Level.Trial)
    public void replaySpool() throws IOException {
        replay = Files.createTempDirectory("lanesift-bench-replay").resolve("spool");
        capture(replay, megabytes);
    }

    @TearDown(Level.Trial)
    public void removeReplay() throws IOException {
        delete(replay.getParent());
    }

    @Setup(Level.Invocation)
    public void freshDir() throws IOException {
        dir = Files.createTempDirectory("lanesift-bench-live").resolve("spool");
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
            p.resetPeakUsage();
        }
    }

    @TearDown(Level.Invocation)
    public void removeDir() throws IOException {
        delete(dir.getParent());
    }

    /** Capture alone. */
    @Benchmark
    public long captureOnly() throws Exception {
        long t0 = System.nanoTime();
        long cpu0 = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
        Capture.Result r = capture(dir, megabytes);
        long cpuNs = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() - cpu0;
        report("captureOnly", r.bytes(), System.nanoTime() - t0, -1, -1, -1);
        cpu("captureOnly", r.bytes(), cpuNs, -1);
        return r.bytes();
    }

    /** Capture with the 8-channel edge decode following the spool. */
    @Benchmark
    public long captureWithLiveDecode() throws Exception {
        return liveDecode("captureWithLiveDecode", false);
    }

    /** The same with the simulator sending in real time at 50 MS/s. */
    @Benchmark
    public long realTimeCaptureWithLiveDecode() throws Exception {
        return liveDecode("realTimeCaptureWithLiveDecode", true);
    }

    long liveDecode(String what, boolean realTime) throws Exception {
        long t0 = System.nanoTime();
        AtomicLong decodedSamples = new AtomicLong();
        AtomicLong edges = new AtomicLong();
        AtomicReference<Throwable> failed = new AtomicReference<>();
        Chain chain = decodeChain(dir, true, blockSamples, decodedSamples, edges);
        long[] decodeEnd = {0};
        long[] decodeCpuNs = {0};
        Thread decode = new Thread(() -> {
            try {
                chain.run();
            } catch (Throwable t) {
                failed.set(t);
            } finally {
                decodeEnd[0] = System.nanoTime();
                decodeCpuNs[0] = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
                chain.close();
            }
        }, "bench-decode");
        decode.start();
        long[] maxLag = {0};
        long[] lagAt = new long[1 << 16];
        long[] lagNs = new long[1 << 16];
        int[] lags = {0};
        Capture.Result[] res = {null};
        Capture c = new Capture(simulator(megabytes, realTime), dir, settings());
        Thread watch = new Thread(() -> {
            while (res[0] == null) {
                var w = c.writer();
                if (w != null) {
                    long lag = w.bytes() - spoolBytesOf(decodedSamples.get());
                    maxLag[0] = Math.max(maxLag[0], lag);
                    if (lags[0] < lagAt.length) {
                        lagAt[lags[0]] = lag;
                        lagNs[lags[0]++] = System.nanoTime();
                    }
                }
                try {
                    Thread.sleep(5);
                } catch (InterruptedException e) {
                    return;
                }
            }
        }, "bench-lag");
        watch.setDaemon(true);
        watch.start();
        long captureCpu0 = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
        res[0] = c.run();
        long captureEnd = System.nanoTime();
        long captureCpuNs = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() - captureCpu0;
        long lagAtEnd = res[0].bytes() - spoolBytesOf(decodedSamples.get());
        maxLag[0] = Math.max(maxLag[0], lagAtEnd);
        decode.join();
        if (failed.get() != null) {
            throw new IllegalStateException("decoding failed", failed.get());
        }
        long want = (long) megabytes * 1_000_000L;
        if (decodedSamples.get() != want) {
            throw new IllegalStateException("decoded " + decodedSamples.get() + " samples of " + want);
        }
        report(what, res[0].bytes(), captureEnd - t0, decodeEnd[0] - t0, maxLag[0], lagAtEnd);
        long half = t0 + (captureEnd - t0) / 2;
        long lateMax = 0;
        for (int i = 0; i < Math.min(lags[0], lagAt.length); i++) {
            if (lagNs[i] >= half && lagNs[i] <= captureEnd) {
                lateMax = Math.max(lateMax, lagAt[i]);
            }
        }
        System.out.printf(Locale.ROOT, "    edges %d (%.2f per sample), lag max in the second half of the capture %.1f MB,"
                + " decode finished %.0f ms after the capture%n", edges.get(), edges.get() / (double) want, lateMax / 1e6,
                (decodeEnd[0] - captureEnd) / 1e6);
        cpu(what, res[0].bytes(), captureCpuNs, decodeCpuNs[0]);
        return edges.get();
    }

    /** The same decode over a finished spool. */
    @Benchmark
    public long replayDecode() {
        long t0 = System.nanoTime();
        long cpu0 = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
        AtomicLong decodedSamples = new AtomicLong();
        AtomicLong edges = new AtomicLong();
        try (Chain chain = decodeChain(replay, false, blockSamples, decodedSamples, edges)) {
            chain.run();
        }
        long cpuNs = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() - cpu0;
        report("replayDecode", spoolBytesOf(decodedSamples.get()), -1, System.nanoTime() - t0, -1, -1);
        cpu("replayDecode", spoolBytesOf(decodedSamples.get()), -1, cpuNs);
        return edges.get();
    }

    /** Spool bytes that carry {@code samples} samples in frames of 4096 samples (the simulator's default). */
    static long spoolBytesOf(long samples) {
        int spf = new DeviceSimulator.Plan().samplesPerFrame;
        return Math.round(samples * (double) (Framing.HEADER + 8 + spf + Framing.TRAILER) / spf);
    }

    static Chain decodeChain(Path spool, boolean follow, int blockSamples, AtomicLong decodedSamples, AtomicLong edges) {
        PluginRegistry reg = new PluginRegistry().add(new SpoolSourceProvider()).add(new LogicEdgesProvider());
        Map<String, Object> src = new HashMap<>();
        src.put("dir", spool.toString());
        src.put("follow", follow);
        src.put("channels", 8);
        src.put("blockSamples", blockSamples);
        ChainBuilder b = Chain.builder(reg).add("dev", "spool", src).add("edges", "logic-edges", Map.of("channels", 8));
        for (int c = 0; c < 8; c++) {
            b.wire("dev.ch" + c, "edges.in" + c);
            b.tap("edges.out" + c, blk -> edges.addAndGet(((Edges) blk).count()));
        }
        b.annotations((id, a) -> { });
        b.progress((done, total) -> decodedSamples.set(done));
        return b.build();
    }

    static Capture.Settings settings() {
        Capture.Settings s = new Capture.Settings();
        s.rateHz = 50_000_000;
        s.reconnectMs = 0;
        return s;
    }

    static java.util.function.Supplier<SerialLink> simulator(int megabytes, boolean realTime) {
        boolean[] opened = {false};
        return () -> {
            if (opened[0]) {
                throw new org.lanesift.plugins.serial.DeviceException("simulator: no device");
            }
            opened[0] = true;
            DeviceSimulator.Plan p = new DeviceSimulator.Plan();
            p.totalSamples = (long) megabytes * 1_000_000L;
            p.realTime = realTime;
            Loopback lb = new Loopback(1 << 22);
            Thread t = new Thread(new DeviceSimulator(lb.device(), p), "bench-simulator");
            t.setDaemon(true);
            t.start();
            return lb.host();
        };
    }

    static Capture.Result capture(Path spool, int megabytes) throws IOException {
        return new Capture(simulator(megabytes, false), spool, settings()).run();
    }

    /**
     * CPU time of the capture thread and of the decode thread, and the rate each would reach on a
     * core of its own: figures that a busy machine changes far less than the wall-clock rates.
     */
    static void cpu(String what, long bytes, long captureCpuNs, long decodeCpuNs) {
        StringBuilder sb = new StringBuilder("    " + what + " cpu:");
        if (captureCpuNs >= 0) {
            sb.append(String.format(Locale.ROOT, " capture thread %.2f s (%.0f MB per CPU second)", captureCpuNs / 1e9,
                    bytes / 1e3 / (captureCpuNs / 1e6)));
        }
        if (decodeCpuNs > 0) {
            sb.append(String.format(Locale.ROOT, " decode thread %.2f s (%.0f MB per CPU second)", decodeCpuNs / 1e9,
                    bytes / 1e3 / (decodeCpuNs / 1e6)));
        }
        System.out.println(sb);
    }

    static void report(String what, long bytes, long captureNs, long decodeNs, long maxLag, long lagAtEnd) {
        long heap = 0;
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
            if (p.getType() == MemoryType.HEAP) {
                heap += p.getPeakUsage().getUsed();
            }
        }
        StringBuilder sb = new StringBuilder(String.format(Locale.ROOT, "%n    %s: %.1f MB", what, bytes / 1e6));
        if (captureNs > 0) {
            sb.append(String.format(Locale.ROOT, ", capture %.1f MB/s", bytes / 1e3 / (captureNs / 1e6)));
        }
        if (decodeNs > 0) {
            sb.append(String.format(Locale.ROOT, ", decode %.1f MB/s", bytes / 1e3 / (decodeNs / 1e6)));
        }
        if (maxLag >= 0) {
            sb.append(String.format(Locale.ROOT, ", lag max %.1f MB, at capture end %.1f MB", maxLag / 1e6, lagAtEnd / 1e6));
        }
        sb.append(String.format(Locale.ROOT, ", peak heap <= %.0f MB (max %.0f MB), load %.2f", heap / 1e6,
                Runtime.getRuntime().maxMemory() / 1e6, ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage()));
        System.out.println(sb);
    }

    static void delete(Path d) throws IOException {
        if (d == null || !Files.exists(d)) {
            return;
        }
        try (Stream<Path> s = Files.walk(d)) {
            for (Path p : (Iterable<Path>) s.sorted(Comparator.reverseOrder())::iterator) {
                Files.delete(p);
            }
        }
    }
}
