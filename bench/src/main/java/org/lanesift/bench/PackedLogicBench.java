package org.lanesift.bench;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;
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
 * A logic analyser's capture of 8 channels and {@code samples} sample times (100 M by default)
 * turned into edge lists through the chain engine, two ways: {@link #packed} reads the packed
 * export (one byte per sample time, {@code packed-logic} source) into {@code logic-edges};
 * {@link #bytePerChannel} reads the same samples written one byte per channel per sample
 * ({@code raw} source, uint8, 8 bytes per sample time) into one {@code differential} stage in
 * mode single per channel (the path such a file had before the packed reader). One operation
 * converts the whole capture; both count the same transitions (checked). Baseline in the same
 * run: {@link #plainRead}, a sequential read of the packed file. Report the ratio
 * bytePerChannel / packed (time per operation) and packed / plainRead.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 1, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class PackedLogicBench {
    static final int CHANNELS = 8;
    @Param("100000000")
    long samples;
    Path dir;
    Path packedFile;
    Path byteFile;
    long transitions;
    PluginRegistry registry;

    /** Writes the two files: channel k toggles every 20 + 3k samples with a jump every 1000 samples. */
    @Setup(Level.Trial)
    public void setUp() throws IOException {
        registry = PluginRegistry.discover(PackedLogicBench.class.getClassLoader());
        if (registry.find("packed-logic") == null || registry.find("logic-edges") == null) {
            throw new IllegalStateException("packed-logic (runner) and logic-edges (differential) must be on the class path");
        }
        dir = Files.createTempDirectory("lanesift-packedbench");
        packedFile = dir.resolve("packed.bin");
        byteFile = dir.resolve("bytes.bin");
        byte[] packed = new byte[1 << 16];
        byte[] wide = new byte[CHANNELS << 16];
        try (OutputStream p = Files.newOutputStream(packedFile); OutputStream w = Files.newOutputStream(byteFile)) {
            for (long s0 = 0; s0 < samples; s0 += packed.length) {
                int n = (int) Math.min(packed.length, samples - s0);
                for (int i = 0; i < n; i++) {
                    long s = s0 + i;
                    int v = 0;
                    for (int k = 0; k < CHANNELS; k++) {
                        int bit = (int) ((s + s / 1000) / (20 + 3 * k) & 1);
                        v |= bit << k;
                        wide[CHANNELS * i + k] = (byte) (bit == 0 ? 10 : 240);
                    }
                    packed[i] = (byte) v;
                }
                p.write(packed, 0, n);
                w.write(wide, 0, CHANNELS * n);
            }
        }
        StringBuilder names = new StringBuilder();
        StringBuilder raw = new StringBuilder();
        for (int k = 0; k < CHANNELS; k++) {
            names.append(k == 0 ? "" : ",").append("{\"name\":\"c").append(k).append("\",\"bit\":").append(k).append('}');
            raw.append(k == 0 ? "" : ",").append("{\"name\":\"c").append(k).append("\",\"gain\":0.01}");
        }
        Files.writeString(Path.of(packedFile + ".json"), "{\"rateHz\":1e9,\"format\":\"logic8\",\"channels\":[" + names + "]}");
        Files.writeString(Path.of(byteFile + ".json"), "{\"rateHz\":1e9,\"format\":\"uint8\",\"markClipped\":false,\"channels\":["
                + raw + "]}");
        System.out.println("\n" + samples + " samples x " + CHANNELS + " channels: packed " + Files.size(packedFile)
                + " bytes, one byte per channel " + Files.size(byteFile) + " bytes");
    }

    /** Deletes the files. */
    @TearDown(Level.Trial)
    public void tearDown() throws IOException {
        Files.deleteIfExists(packedFile);
        Files.deleteIfExists(byteFile);
        Files.deleteIfExists(Path.of(packedFile + ".json"));
        Files.deleteIfExists(Path.of(byteFile + ".json"));
        Files.deleteIfExists(dir);
    }

    /**
     * The packed export through packed-logic and logic-edges.
     *
     * @return transitions
     */
    @Benchmark
    public long packed() {
        long[] edges = {0};
        ChainBuilder b = Chain.builder(registry).add("cap", "packed-logic", Map.of("file", packedFile.toString()))
                .add("edges", "logic-edges", Map.of("channels", CHANNELS));
        for (int k = 0; k < CHANNELS; k++) {
            b.wire("cap.c" + k, "edges.in" + k).tap("edges.out" + k, e -> edges[0] += ((Edges) e).count());
        }
        run(b);
        return check(edges[0]);
    }

    /**
     * The same samples one byte per channel through raw and one differential (single) per channel.
     *
     * @return transitions
     */
    @Benchmark
    public long bytePerChannel() {
        long[] edges = {0};
        ChainBuilder b = Chain.builder(registry).add("cap", "raw", Map.of("file", byteFile.toString()));
        for (int k = 0; k < CHANNELS; k++) {
            String id = "rx" + k;
            b.add(id, "differential", Map.of("mode", "single", "reference", "fixed", "referenceVolts", 1.25, "levelReport", false))
                    .wire("cap.c" + k, id + ".in").tap(id + ".edges", e -> edges[0] += ((Edges) e).count());
        }
        run(b);
        return check(edges[0]);
    }

    /**
     * Baseline: the packed file read sequentially, bytes XORed.
     *
     * @return the XOR
     * @throws IOException on read errors
     */
    @Benchmark
    public long plainRead() throws IOException {
        return PlainRead.xorAll(packedFile);
    }

    private static void run(ChainBuilder b) {
        try (Chain c = b.build()) {
            c.run();
        }
    }

    private synchronized long check(long edges) {
        if (transitions == 0) {
            transitions = edges;
        } else if (edges != transitions) {
            throw new IllegalStateException("the two paths disagree: " + edges + " transitions against " + transitions);
        }
        return edges;
    }
}
