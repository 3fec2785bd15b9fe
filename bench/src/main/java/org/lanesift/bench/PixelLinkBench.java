package org.lanesift.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.plugins.pixellink.PixelLinkPlugin;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;

/**
 * Pixel link decoding, bit streams to frames, in pixels per second on one core. One invocation is
 * one frame of an invented 640 x 14 picture (800 x 20 total, 24-bit VESA, 4 lanes, pixel clock
 * 25.175 MHz) pushed as one block per lane and line. Before each invocation (outside the measured
 * time) the blocks' clock indices and times are moved on by one frame, so the decoder sees one
 * continuous link. {@link #sequentialRead} is a plain read of the same arrays (values, flags,
 * slots, clock indices, times of every lane), for the ratio.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
@Fork(1)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class PixelLinkBench {
    static final int H_ACT = 640;
    static final int H_FP = 16;
    static final int H_SYNC = 96;
    static final int H_BP = 48;
    static final int H_TOT = H_ACT + H_FP + H_SYNC + H_BP;
    static final int V_ACT = 14;
    static final int V_FP = 2;
    static final int V_SYNC = 2;
    static final int V_BP = 2;
    static final int V_TOT = V_ACT + V_FP + V_SYNC + V_BP;
    static final int PIXELS_PER_FRAME = H_TOT * V_TOT;
    static final double PERIOD_FS = 1e15 / 25.175e6;
    // VESA 24-bit slots 0..6 (docs/reference-facts.md#pixel-link-clock-and-slot-mappings)
    static final String[][] VESA24 = {
        {"G0", "R5", "R4", "R3", "R2", "R1", "R0"},
        {"B1", "B0", "G5", "G4", "G3", "G2", "G1"},
        {"DE", "VS", "HS", "B5", "B4", "B3", "B2"},
        {"0", "B7", "B6", "G7", "G6", "R7", "R6"}};

    /** Annotation detail: every line and sync pulse, or anomalies only. */
    @Param({"lines", "anomalies"})
    public String detail;

    /** [line][lane]: one frame of blocks. */
    BitStream[][] lines;
    /** Clock index the blocks currently start at. */
    long frameClock;
    Stage stage;
    CountingContext ctx;

    @Setup(Level.Trial)
    public void setup() throws Exception {
        lines = new BitStream[V_TOT][];
        for (int line = 0; line < V_TOT; line++) {
            int k = templateOf(line);
            int[] words = new int[H_TOT];
            for (int h = 0; h < H_TOT; h++) {
                boolean hs = h < H_SYNC;
                int ax = h - H_SYNC - H_BP;
                boolean de = k == 0 && ax >= 0 && ax < H_ACT;
                int w = de ? ((ax * 5 + line) & 0xFF) << 16 | ((ax ^ 0x3C) & 0xFF) << 8 | ((ax * 3 + 7) & 0xFF) : 0;
                w |= de ? 1 << 24 : 0;
                w |= hs ? 0 : 1 << 25;          // negative HS
                w |= k == 2 ? 0 : 1 << 26;      // negative VS
                words[h] = w;
            }
            lines[line] = serialise(words, (long) line * H_TOT);
        }
        PixelLinkPlugin p = new PixelLinkPlugin();
        ctx = new CountingContext("bench", p, Map.of("pictures", "none", "detail", detail));
        stage = p.open(ctx);
        frameClock = -1;
    }

    /** Moves every block on by one frame (not measured). */
    @Setup(Level.Invocation)
    public void nextFrame() {
        if (frameClock < 0) {
            frameClock = 0;
            return;
        }
        long d = PIXELS_PER_FRAME;
        long dt = Math.round((frameClock + d) * PERIOD_FS) - Math.round(frameClock * PERIOD_FS);
        frameClock += d;
        for (BitStream[] l : lines) {
            for (int lane = 0; lane < 4; lane++) {
                BitStream b = l[lane];
                long[] e = b.clockEdge();
                long[] ts = b.timesFs();
                for (int i = 0, n = b.count(); i < n; i++) {
                    e[i] += d;
                    ts[i] += dt;
                }
            }
        }
    }

    static BitStream[] serialise(int[] words, long firstClock) {
        BitStream[] out = new BitStream[4];
        int n = words.length * 7;
        for (int lane = 0; lane < 4; lane++) {
            long[] values = new long[BitSets.words(n)];
            long[] times = new long[n];
            long[] edges = new long[n];
            byte[] slot = new byte[n];
            for (int c = 0; c < words.length; c++) {
                for (int s = 0; s < 7; s++) {
                    int i = c * 7 + s;
                    if (bit(words[c], VESA24[lane][s])) {
                        values[i >>> 6] |= 1L << i;
                    }
                    times[i] = Math.round((firstClock + c + (s + 0.5) / 7) * PERIOD_FS);
                    edges[i] = firstClock + c;
                    slot[i] = (byte) s;
                }
            }
            long half = Math.round(PERIOD_FS / 14);
            long[] setup = new long[n];
            long[] hold = new long[n];
            java.util.Arrays.fill(setup, half);
            java.util.Arrays.fill(hold, half);
            out[lane] = new BitStream("lane" + lane, times[0], times[n - 1] + 1, n, values, times, edges,
                    new long[BitSets.words(n)], slot, setup, hold, new long[BitSets.words(n)], PERIOD_FS / 7);
        }
        return out;
    }

    static boolean bit(int w, String name) {
        switch (name) {
            case "0":
                return false;
            case "DE":
                return (w & 1 << 24) != 0;
            case "HS":
                return (w & 1 << 25) != 0;
            case "VS":
                return (w & 1 << 26) != 0;
            default:
                int shift = name.charAt(0) == 'R' ? 16 : name.charAt(0) == 'G' ? 8 : 0;
                return ((w >>> (shift + name.charAt(1) - '0')) & 1) != 0;
        }
    }

    static int templateOf(int line) {
        if (line < V_SYNC) {
            return 2;
        }
        int a = line - V_SYNC - V_BP;
        return a >= 0 && a < V_ACT ? 0 : 1;
    }

    /** Decodes one frame: 20 line blocks per lane. */
    @Benchmark
    @OperationsPerInvocation(PIXELS_PER_FRAME)
    public void decodeFrame(Blackhole bh) throws Exception {
        for (int line = 0; line < V_TOT; line++) {
            BitStream[] t = lines[line];
            for (int lane = 0; lane < 4; lane++) {
                stage.accept(lane, t[lane]);
            }
        }
        bh.consume(ctx.blocks);
    }

    /** Baseline: a plain sequential read of the arrays the decoder reads (values, slots, clock indices, times, flags). */
    @Benchmark
    @OperationsPerInvocation(PIXELS_PER_FRAME)
    public long sequentialRead() {
        long acc = 0;
        for (int line = 0; line < V_TOT; line++) {
            BitStream[] t = lines[line];
            for (int lane = 0; lane < 4; lane++) {
                BitStream b = t[lane];
                long[] v = b.values();
                long[] f = b.flagged();
                for (int i = 0; i < v.length; i++) {
                    acc += v[i] ^ f[i];
                }
                byte[] s = b.slot();
                long[] e = b.clockEdge();
                long[] ts = b.timesFs();
                for (int i = 0, n = b.count(); i < n; i++) {
                    acc += s[i] + e[i] + ts[i];
                }
            }
        }
        return acc;
    }
}
