package org.lanesift.bench;

import java.io.BufferedReader;
import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.Chain;
import org.lanesift.data.AnalogBlock;
import org.lanesift.plugin.PluginRegistry;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;

/**
 * The CSV capture source ({@code csv} plugin of the runner module, found through ServiceLoader)
 * reading a scope-style export of 200,000 rows: a time column and four channels printed as
 * {@code %.6e} (about 14 MB), pushed through the chain engine in blocks of 64 Ki rows. One
 * operation reads the whole file; MB/s = file size / time per operation (the size is printed at
 * set-up). Baselines in the same run: {@link #plainRead} reads the same bytes sequentially and
 * counts line ends (the least any parser does); {@link #splitAndParseDouble} is the naive parser,
 * {@code BufferedReader.readLine}, {@code String.split} and {@code Double.parseDouble}.
 *
 * <p>Needs the runner module on the class path (bench/pom.xml dependency
 * {@code org.lanesift:runner}); without it set-up fails with a message saying so.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class CsvReadBench {
    static final int ROWS = 200_000;
    Path file;
    long bytes;
    PluginRegistry registry;

    /** Writes the capture into a temporary file. */
    @Setup(Level.Trial)
    public void setUp() throws IOException {
        registry = PluginRegistry.discover(CsvReadBench.class.getClassLoader());
        if (registry.find("csv") == null) {
            throw new IllegalStateException("the csv source (module runner) is not on the benchmark class path;"
                    + " add org.lanesift:runner to bench/pom.xml");
        }
        file = Files.createTempFile("lanesift-csvbench", ".csv");
        Random r = new Random(1);
        try (BufferedWriter w = Files.newBufferedWriter(file)) {
            w.write("Source,bench (invented)\nTime (s),P (V),N (V),CLK (V),D (mV)\n");
            for (int i = 0; i < ROWS; i++) {
                double s = r.nextBoolean() ? 0.175 : -0.175;
                w.write(String.format(Locale.ROOT, "%.6e,%.6e,%.6e,%.6e,%.6e%n", (i - 10_000) * 4e-10,
                        1.2 + s + r.nextGaussian() * 0.003, 1.2 - s + r.nextGaussian() * 0.003,
                        (i % 20) < 10 ? 0.0 : 3.3, 1650 + r.nextGaussian() * 20));
            }
        }
        bytes = Files.size(file);
        System.out.println("\nCSV file: " + bytes + " bytes, " + ROWS + " rows; MB/s = " + (bytes / 1e6) + " / (ms per op / 1000)");
    }

    /** Deletes the file. */
    @TearDown(Level.Trial)
    public void tearDown() throws IOException {
        Files.deleteIfExists(file);
    }

    /**
     * The csv source plugin through the chain engine.
     *
     * @param bh sink for the blocks
     */
    @Benchmark
    public void csvSource(Blackhole bh) {
        long[] samples = {0};
        try (Chain c = Chain.builder(registry).add("src", "csv", Map.of("file", file.toString()))
                .outputs((id, port, b) -> {
                    samples[0] += ((AnalogBlock) b).length();
                    bh.consume(b);
                }).build()) {
            c.run();
        }
        if (samples[0] != 4L * ROWS) {
            throw new IllegalStateException("read " + samples[0] + " samples, expected " + 4L * ROWS);
        }
    }

    /**
     * Baseline: the same bytes read sequentially, line ends counted.
     *
     * @return line count
     * @throws IOException on read errors
     */
    @Benchmark
    public long plainRead() throws IOException {
        long lines = 0;
        byte[] a = new byte[1 << 20];
        ByteBuffer bb = ByteBuffer.wrap(a);
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ)) {
            int n;
            while ((n = ch.read(bb.clear())) > 0) {
                for (int i = 0; i < n; i++) {
                    if (a[i] == '\n') {
                        lines++;
                    }
                }
            }
        }
        return lines;
    }

    /**
     * Baseline: the naive parser.
     *
     * @return sum of all values
     * @throws IOException on read errors
     */
    @Benchmark
    public double splitAndParseDouble() throws IOException {
        double sum = 0;
        try (BufferedReader r = Files.newBufferedReader(file)) {
            r.readLine();
            r.readLine();
            String ln;
            while ((ln = r.readLine()) != null) {
                for (String f : ln.split(",")) {
                    sum += Double.parseDouble(f);
                }
            }
        }
        return sum;
    }
}
