package org.lanesift.bench;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
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
 * The capture readers against a plain sequential read of the same file. A file of
 * {@code megabytes} MB (in the page cache after the first pass) holds 8 interleaved channels in
 * {@code format}: {@link #reader} runs the {@code raw} source (or {@code packed-logic} for
 * {@code logic8}, 8 channels in one byte) through the chain engine into one sink per channel that
 * reads one value per block; with {@code lend} the sinks declare {@code readsLentBlocks}, so the
 * source reuses two sets of block arrays instead of new ones per block. {@link #plainRead} reads the
 * same file through a 1 MiB buffer and XORs its longs. Report plainRead / reader (time per
 * operation): the reader's speed as a fraction of a plain read (the target is at least 0.5).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(value = 1, jvmArgs = {"-Xmx1g"})
public class RawReadBench {
    static final int CHANNELS = 8;
    @Param({"float32le", "int16le", "int16be", "uint8", "int8", "logic8"})
    String format;
    @Param({"true", "false"})
    boolean lend;
    @Param("256")
    int megabytes;
    Path dir;
    Path file;
    PluginRegistry registry;
    long sum;

    /** Writes the file: a sine per channel plus noise, within the format's range (no clipped codes). */
    @Setup(Level.Trial)
    public void setUp() throws IOException {
        dir = Files.createTempDirectory("lanesift-rawread");
        file = dir.resolve("cap.bin");
        int bytesPerValue = switch (format) {
            case "float32le" -> 4;
            case "int16le", "int16be" -> 2;
            default -> 1;
        };
        boolean logic = format.equals("logic8");
        long values = (long) megabytes << 20;
        ByteBuffer bb = ByteBuffer.allocate(1 << 20).order(format.equals("int16be") ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN);
        Random rnd = new Random(19);
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE, StandardOpenOption.TRUNCATE_EXISTING)) {
            for (long i = 0; i < values / bytesPerValue; i++) {
                int k = (int) (i % CHANNELS);
                double x = Math.sin((i / CHANNELS) * 0.07 + k) * 0.8 + rnd.nextGaussian() * 0.02;
                switch (bytesPerValue) {
                    case 4 -> bb.putFloat((float) x);
                    case 2 -> bb.putShort((short) (x * 30000));
                    default -> bb.put(logic ? (byte) rnd.nextInt(256) : (byte) (format.equals("uint8") ? 128 + x * 120 : x * 120));
                }
                if (!bb.hasRemaining()) {
                    ch.write(bb.flip());
                    bb.clear();
                }
            }
            ch.write(bb.flip());
        }
        StringBuilder chans = new StringBuilder();
        for (int k = 0; k < CHANNELS; k++) {
            chans.append(k == 0 ? "" : ",").append("{\"name\":\"c").append(k).append(logic ? "\",\"bit\":" + k + "}" : "\",\"gain\":1e-3}");
        }
        Files.writeString(Path.of(file + ".json"), "{\"rateHz\":1e9,\"format\":\"" + format + "\",\"channels\":[" + chans + "]}");
        registry = PluginRegistry.discover(RawReadBench.class.getClassLoader()).add(new Sink("bench-sink-lent", DataKind.ANALOG, true))
                .add(new Sink("bench-sink", DataKind.ANALOG, false)).add(new Sink("bench-logic-sink-lent", DataKind.LOGIC, true))
                .add(new Sink("bench-logic-sink", DataKind.LOGIC, false));
    }

    /** Deletes the file. */
    @TearDown(Level.Trial)
    public void tearDown() throws IOException {
        Files.deleteIfExists(file);
        Files.deleteIfExists(Path.of(file + ".json"));
        Files.deleteIfExists(dir);
    }

    /**
     * The whole file through the source and the sinks.
     *
     * @return a value read from every block
     */
    @Benchmark
    public long reader() {
        boolean logic = format.equals("logic8");
        ChainBuilder b = Chain.builder(registry).add("cap", logic ? "packed-logic" : "raw", Map.of("file", file.toString()));
        String sink = (logic ? "bench-logic-sink" : "bench-sink") + (lend ? "-lent" : "");
        for (int k = 0; k < CHANNELS; k++) {
            b.add("s" + k, sink).wire("cap.c" + k, "s" + k);
        }
        sum = 0;
        try (Chain c = b.build()) {
            c.run();
        }
        return sum;
    }

    /**
     * Baseline: the same file read sequentially, longs XORed.
     *
     * @return the XOR
     * @throws IOException on read errors
     */
    @Benchmark
    public long plainRead() throws IOException {
        return PlainRead.xorAll(file);
    }

    /** A sink reading one value of every block (the last sample), optionally declaring that it keeps no block. */
    final class Sink implements PluginProvider {
        private final PluginDescriptor d;

        Sink(String id, DataKind kind, boolean readsLent) {
            PluginDescriptor.Builder b = PluginDescriptor.builder(id).input(PortSpec.of("in", kind, "a channel"));
            d = (readsLent ? b.readsLentBlocks() : b).build();
        }

        @Override
        public PluginDescriptor descriptor() {
            return d;
        }

        @Override
        public Stage open(StageContext context) {
            return new Stage() {
                @Override
                public void accept(int input, Block block) {
                    if (block instanceof AnalogBlock a) {
                        sum += Float.floatToRawIntBits(a.volts()[a.length() - 1]);
                    } else {
                        LogicBlock l = (LogicBlock) block;
                        sum += l.bits()[0];
                    }
                }
            };
        }
    }
}
