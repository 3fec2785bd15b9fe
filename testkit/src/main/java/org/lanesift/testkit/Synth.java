package org.lanesift.testkit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.function.DoubleUnaryOperator;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.time.Femtos;

/**
 * Builders of synthetic buffers for tests: analog channels from a function of time, logic
 * channels from levels, edge lists from times, random bits, noise, and splitting a block into
 * pieces of given sizes (for block-boundary tests).
 */
public final class Synth {
    private Synth() {
    }

    /**
     * Samples a function of time.
     *
     * @param channel channel name
     * @param rateHz  sample rate
     * @param n       sample count
     * @param voltsOfSeconds the signal: volts as a function of time in seconds
     * @return the block, starting at time 0
     */
    public static AnalogBlock analog(String channel, double rateHz, int n, DoubleUnaryOperator voltsOfSeconds) {
        float[] v = new float[n];
        double dt = 1.0 / rateHz;
        for (int i = 0; i < n; i++) {
            v[i] = (float) voltsOfSeconds.applyAsDouble(i * dt);
        }
        return new AnalogBlock(channel, 0, 0, Femtos.periodFs(rateHz), v, n, null);
    }

    /**
     * Adds Gaussian noise (returns a new block).
     *
     * @param b        the block
     * @param rmsVolts noise RMS
     * @param seed     random seed
     * @return the noisy block
     */
    public static AnalogBlock withNoise(AnalogBlock b, double rmsVolts, long seed) {
        Random r = new Random(seed);
        float[] v = Arrays.copyOf(b.volts(), b.length());
        for (int i = 0; i < v.length; i++) {
            v[i] += (float) (r.nextGaussian() * rmsVolts);
        }
        return new AnalogBlock(b.channel(), b.firstIndex(), b.startFs(), b.periodFs(), v, b.length(), b.invalid());
    }

    /**
     * A logic block from levels.
     *
     * @param channel channel name
     * @param rateHz  sample rate
     * @param levels  one level per sample
     * @return the block at time 0
     */
    public static LogicBlock logic(String channel, double rateHz, boolean[] levels) {
        long[] bits = new long[BitSets.words(levels.length)];
        for (int i = 0; i < levels.length; i++) {
            if (levels[i]) {
                bits[i >>> 6] |= 1L << i;
            }
        }
        return new LogicBlock(channel, 0, 0, Femtos.periodFs(rateHz), bits, levels.length, null);
    }

    /**
     * A random logic block.
     *
     * @param channel channel name
     * @param rateHz  sample rate
     * @param n       samples
     * @param seed    random seed
     * @return the block
     */
    public static LogicBlock randomLogic(String channel, double rateHz, int n, long seed) {
        Random r = new Random(seed);
        long[] bits = new long[BitSets.words(n)];
        for (int i = 0; i < bits.length; i++) {
            bits[i] = r.nextLong();
        }
        return new LogicBlock(channel, 0, 0, Femtos.periodFs(rateHz), bits, n, null);
    }

    /**
     * Random bits.
     *
     * @param n    count
     * @param seed random seed
     * @return the bits
     */
    public static boolean[] randomBits(int n, long seed) {
        Random r = new Random(seed);
        boolean[] b = new boolean[n];
        for (int i = 0; i < n; i++) {
            b[i] = r.nextBoolean();
        }
        return b;
    }

    /**
     * Edges of a clock with a given period and duty cycle, rising first at {@code firstRiseFs}.
     *
     * @param channel     name
     * @param periodFs    clock period
     * @param duty        high fraction, 0..1
     * @param firstRiseFs time of the first rising edge
     * @param cycles      number of cycles
     * @return edges over {@code [0, firstRise + cycles * period)}
     */
    public static Edges clock(String channel, double periodFs, double duty, long firstRiseFs, int cycles) {
        long[] t = new long[2 * cycles];
        for (int c = 0; c < cycles; c++) {
            t[2 * c] = firstRiseFs + Math.round(c * periodFs);
            t[2 * c + 1] = firstRiseFs + Math.round((c + duty) * periodFs);
        }
        return Edges.of(channel, 0, firstRiseFs + Math.round(cycles * periodFs), false, t);
    }

    /**
     * Edges of a non-return-to-zero bit sequence: bit {@code i} occupies
     * {@code [startFs + i * uiFs, startFs + (i + 1) * uiFs)}.
     *
     * @param channel name
     * @param bits    the bits
     * @param startFs time of bit 0
     * @param uiFs    unit interval
     * @param initial level before bit 0
     * @return edges over {@code [0, startFs + n * ui)}
     */
    public static Edges nrz(String channel, boolean[] bits, long startFs, double uiFs, boolean initial) {
        long[] t = new long[bits.length];
        int k = 0;
        boolean level = initial;
        for (int i = 0; i < bits.length; i++) {
            if (bits[i] != level) {
                t[k++] = startFs + Math.round(i * uiFs);
                level = bits[i];
            }
        }
        return new Edges(channel, 0, startFs + Math.round(bits.length * uiFs) + 1, initial, t, k, null, 0);
    }

    /**
     * Cuts an analog block into consecutive pieces of the given sizes (the last piece takes the rest).
     *
     * @param b     the block
     * @param sizes piece sizes, cycled
     * @return the pieces
     */
    public static List<AnalogBlock> split(AnalogBlock b, int... sizes) {
        List<AnalogBlock> out = new ArrayList<>();
        int pos = 0;
        int k = 0;
        while (pos < b.length()) {
            int n = Math.min(Math.max(1, sizes[k++ % sizes.length]), b.length() - pos);
            float[] v = Arrays.copyOfRange(b.volts(), pos, pos + n);
            long[] inv = b.invalid() == null ? null : sliceBits(b.invalid(), pos, n);
            out.add(new AnalogBlock(b.channel(), b.firstIndex() + pos, b.startFs() + Math.round(pos * b.periodFs()),
                    b.periodFs(), v, n, inv));
            pos += n;
        }
        return out;
    }

    /**
     * Cuts a logic block into consecutive pieces of the given sizes.
     *
     * @param b     the block
     * @param sizes piece sizes, cycled
     * @return the pieces
     */
    public static List<LogicBlock> split(LogicBlock b, int... sizes) {
        List<LogicBlock> out = new ArrayList<>();
        int pos = 0;
        int k = 0;
        while (pos < b.length()) {
            int n = Math.min(Math.max(1, sizes[k++ % sizes.length]), b.length() - pos);
            long[] inv = b.invalid() == null ? null : sliceBits(b.invalid(), pos, n);
            out.add(new LogicBlock(b.channel(), b.firstIndex() + pos, b.startFs() + Math.round(pos * b.periodFs()),
                    b.periodFs(), sliceBits(b.bits(), pos, n), n, inv));
            pos += n;
        }
        return out;
    }

    /**
     * Cuts an edge list at the given times into consecutive edge lists; unknown spans are clipped to each piece.
     *
     * @param e     the edges
     * @param cutsFs cut times, increasing, inside the span
     * @return the pieces
     */
    public static List<Edges> split(Edges e, long... cutsFs) {
        List<Edges> out = new ArrayList<>();
        long start = e.startFs();
        long[] bounds = Arrays.copyOf(cutsFs, cutsFs.length + 1);
        bounds[cutsFs.length] = e.endFs();
        for (long end : bounds) {
            Edges piece = e.slice(start, end);
            // a piece covering the whole block is still a copy of its own, as the callers expect
            out.add(piece == e ? new Edges(e.channel(), e.startFs(), e.endFs(), e.initialLevel(), Arrays.copyOf(e.timesFs(), e.count()),
                    e.count(), e.invalidSpans() == null ? null : Arrays.copyOf(e.invalidSpans(), 2 * e.invalidCount()), e.invalidCount())
                    : piece);
            start = end;
        }
        return out;
    }

    /**
     * Copies {@code n} bits starting at bit {@code from}.
     *
     * @param src  packed bits
     * @param from first bit
     * @param n    count
     * @return packed copy starting at bit 0
     */
    public static long[] sliceBits(long[] src, int from, int n) {
        return BitSets.slice(src, from, n);
    }
}
