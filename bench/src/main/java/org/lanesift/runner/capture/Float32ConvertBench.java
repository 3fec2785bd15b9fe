package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import java.util.concurrent.TimeUnit;
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
 * The float32 de-interleave of the raw reader on its own, without the file: {@link #convert} runs
 * {@link RawConverter.Float32} over a direct buffer of {@link #FRAMES} interleaved frames of
 * {@link #CHANNELS} float32le legs (the reader's 1 MiB read chunk for 8 channels), into one
 * block array per channel, as the read-ahead thread does for every chunk of a capture such as
 * bench/scripts/ddr-capture.py's (8 legs, gain 1, offset 0: {@code gain=1}) or one with a gain
 * per channel ({@code gain=0.001}). {@link #bulkCopy} is the yardstick in the same run: the same
 * bytes copied out of the direct buffer into one heap array (a memory copy, no de-interleave).
 * Time per value (ns/op, ops = frames x channels).
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class Float32ConvertBench {
    static final int FRAMES = 32768;
    /** Legs per frame, as in the DDR capture. */
    static final int CHANNELS = 8;
    static final int VALUES = FRAMES * CHANNELS;

    /** Gain of every channel (1: the identity path). */
    @Param({"1", "0.001"})
    public double gain;

    ByteBuffer frames;
    RawConverter conv;
    float[][] volts;
    float[] flat;
    long[][] masks;

    @Setup
    public void setup() throws IOException {
        Random r = new Random(20261204);
        frames = ByteBuffer.allocateDirect(FRAMES * CHANNELS * 4).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < FRAMES * CHANNELS; i++) {
            frames.putFloat((float) (1.2 + 0.175 * Math.sin(i * 0.01) + 0.003 * r.nextGaussian()));
        }
        StringBuilder json = new StringBuilder("{\"rateHz\": 2.5e9, \"format\": \"float32le\", \"channels\": [");
        for (int k = 0; k < CHANNELS; k++) {
            json.append(k == 0 ? "" : ", ").append("{\"name\": \"c").append(k).append("\", \"gain\": ").append(gain).append('}');
        }
        Path side = Files.createTempFile("lanesift-convert", ".json");
        try {
            Files.writeString(side, json + "]}");
            conv = RawConverter.of(RawSidecar.read(side));
        } finally {
            Files.deleteIfExists(side);
        }
        volts = new float[CHANNELS][FRAMES];
        flat = new float[FRAMES * CHANNELS];
        masks = new long[CHANNELS][];
    }

    /**
     * The converter over the whole buffer.
     *
     * @return a converted value
     */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public float convert() {
        frames.clear();
        conv.convert(frames, FRAMES, volts, 0, k -> masks[k] != null ? masks[k] : (masks[k] = new long[FRAMES / 64]));
        return volts[CHANNELS - 1][FRAMES - 1];
    }

    /**
     * Baseline: the same bytes copied into one float array.
     *
     * @return a copied value
     */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public float bulkCopy() {
        frames.clear();
        frames.asFloatBuffer().get(flat);
        return flat[flat.length - 1];
    }
}
