package org.lanesift.plugins.deskew;

import java.util.Arrays;
import java.util.function.Consumer;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitSets;

/**
 * Delays one analog channel by a fixed, possibly fractional and possibly negative, number of
 * samples, keeping the output on the input's sample grid: output sample {@code n} is taken at the
 * same time as input sample {@code n} and reads {@code x(t_n - delay)}.
 *
 * <p>State carries across blocks (the filter history), so any split of the input gives the same
 * output samples. Output is emitted as soon as the input it needs has arrived: a negative delay
 * (an advance) or the kernel's look-ahead holds back the last few samples until the next block or
 * {@link #finish}. Output samples whose kernel reaches before the first or after the last input
 * sample of a contiguous run (the kernel margins) are not produced: the output run starts and ends
 * a few samples inside the input run ({@link #margins}), so the stage can say so once instead of
 * handing on samples it made up. Output samples whose kernel
 * touches an invalid input sample are marked invalid (their value uses the nearest input sample).
 * A gap in the input (a block that does not start one period after the previous one) ends the run
 * and starts a new one.
 *
 * <p>Cost: a fractional delay is a tap-major FIR over L1-sized chunks (about 1 to 2 ns a sample
 * for 16 taps on the bench machine, {@code DeskewBench}); a zero delay hands each input block's own
 * array on once the run's front margin is behind, after one branch-free check that every sample
 * is finite ({@link SampleScan}).
 *
 * <p>Why the full kernel runs on every sample (measured 2026-12-04, {@code lanesift bench}, thread
 * CPU time, 3 interleaved runs): the JIT of Java 17 vectorises the tap-major form above only over
 * long runs (each call copies 16 shifted windows), and neither a sample-major loop with constant
 * tap offsets (4.6 ns a sample) nor one without the copies (2.9 ns) is vectorised. A variant that
 * interpolated linearly wherever a leg stayed within 30 mV over 32 outputs plus the kernel span and
 * an 8-sample guard (within 2.2 x 30 mV of the full kernel) took the leg stage from 0.17-0.19 s to
 * 0.26-0.27 s: on the bench's link only a third of the delayed legs' samples are that quiet, and
 * the short runs between them cost more to filter than they save. On edges slower than the quiet
 * span it also moved or added P-N crossings (174 of 300 seeded slow-edge pairs), so it was dropped.
 * What helps instead is the second core: {@link DeskewStage} runs the filter of a leg's block on
 * its worker thread (signal-kit {@code SideThread}) while the later stages take the leg's previous block.
 */
final class AnalogDelayLine {
    private static final int CHUNK = 1024;

    private final DelayKernel kernel;
    private final double delaySamples;
    private final Consumer<AnalogBlock> out;
    private final int fl;
    private final int lo;
    private final int hi;
    private final float[] taps;
    private final float[] tmp0 = new float[CHUNK];
    private final float[] tmp1 = new float[CHUNK];
    private final float[] tmp2 = new float[CHUNK];
    private final float[] tmp3 = new float[CHUNK];
    private final float[] acc = new float[CHUNK];
    /** Whole-sample delay of zero: output sample n is input sample n. */
    private final boolean identity;

    // current run
    private boolean open;
    private String channel;
    private long originFs;
    private long originIndex;
    private double periodFs;
    private long received;      // input samples of this run
    private long nextOut;       // next output index to produce
    private float[] buf = new float[0];
    private byte[] bad = new byte[0];
    private long bufStart;      // run index of buf[0]
    private int bufLen;
    private long lastBadIndex = Long.MIN_VALUE; // highest run index of an invalid entry in buf
    /** Whether any entry of {@code bad} was ever set in this run; while not, {@code bad} is all zeros and is not kept up. */
    private boolean anyBad;
    private final long frontMargin; // outputs left out at a run's start (its kernel reaches before the run, or a shared margin)
    private final long endMargin;   // outputs left out at a run's end

    /**
     * Creates a delay line.
     *
     * @param kernel       interpolation kernel
     * @param delaySamples delay in samples; positive delays, negative advances
     * @param out          receives output blocks
     */
    AnalogDelayLine(DelayKernel kernel, double delaySamples, Consumer<AnalogBlock> out) {
        this(kernel, delaySamples, 0, 0, out);
    }

    /**
     * Creates a delay line that leaves out at least the given margins at the run ends, so that
     * several channels delayed by different amounts still start and end on the same sample.
     *
     * @param kernel       interpolation kernel
     * @param delaySamples delay in samples; positive delays, negative advances
     * @param minFront     output samples left out at least at the start of a run
     * @param minEnd       output samples left out at least at the end of a run
     * @param out          receives output blocks
     */
    AnalogDelayLine(DelayKernel kernel, double delaySamples, long minFront, long minEnd, Consumer<AnalogBlock> out) {
        this.kernel = kernel;
        this.delaySamples = delaySamples;
        this.out = out;
        double a = -delaySamples;
        double f = Math.floor(a);
        double mu = a - f;
        if (mu > 1 - 1e-9) {
            f += 1;
            mu = 0;
        }
        this.fl = (int) f;
        this.lo = kernel.lo(mu);
        this.hi = kernel.hi(mu);
        this.taps = kernel.taps(mu);
        this.frontMargin = Math.max(minFront, Math.max(0, -((long) fl + lo)));
        this.endMargin = Math.max(minEnd, Math.max(0, (long) fl + hi));
        this.identity = taps.length == 1 && fl == 0 && lo == 0 && taps[0] == 1f;
    }

    /**
     * The kernel margins of a delay: {front, end}, the output samples at the start and at the end
     * of a run whose kernel reaches past the run's input.
     */
    static long[] margins(DelayKernel kernel, double delaySamples) {
        AnalogDelayLine l = new AnalogDelayLine(kernel, delaySamples, b -> { });
        return new long[] {l.frontMargin, l.endMargin};
    }

    double delaySamples() {
        return delaySamples;
    }

    /** Whether the line runs a filter (a fractional delay) rather than copying or handing on samples. */
    boolean filters() {
        return taps.length > 1;
    }

    /**
     * Takes the next input block.
     *
     * @param b the block
     */
    void accept(AnalogBlock b) {
        if (open) {
            long expect = originFs + Math.round(received * periodFs);
            if (Math.abs(b.startFs() - expect) > periodFs / 2 || Math.abs(b.periodFs() - periodFs) > 1e-9 * periodFs) {
                finish();
            }
        }
        if (b.length() == 0) {
            return;
        }
        if (!open) {
            start(b);
        }
        if (passThrough(b)) {
            return;
        }
        append(b);
        produce(received - endMargin);
    }

    /**
     * A plain whole-sample identity (no delay, no end margin) hands on the input's own sample
     * array once the run's front margin is behind: output sample {@code n} is input sample
     * {@code n}, so the block is the input block under the output's index and time. Blocks own
     * their arrays and no receiver may change them ({@link AnalogBlock}), so sharing is safe.
     * Falls back to the buffered path while anything is held back or when the block holds a value
     * that is not finite (which is replaced and marked invalid there).
     *
     * @return whether the block was handed on
     */
    private boolean passThrough(AnalogBlock b) {
        int n = b.length();
        if (!identity || bufLen != 0 || nextOut != received || endMargin != 0 || !SampleScan.allFinite(b.volts(), n)) {
            return false;
        }
        long[] inv = null;
        long[] src = b.invalid();
        if (src != null && BitSets.count(src, n) > 0) {
            inv = java.util.Arrays.copyOf(src, BitSets.words(n));
            if ((n & 63) != 0) {
                inv[inv.length - 1] &= (1L << n) - 1;
            }
        }
        long startFs = originFs + Math.round(nextOut * periodFs);
        received += n;
        bufStart = received;
        out.accept(new AnalogBlock(channel, originIndex + nextOut, startFs, periodFs, b.volts(), n, inv));
        nextOut = received;
        return true;
    }

    private void start(AnalogBlock b) {
        open = true;
        channel = b.channel();
        originFs = b.startFs();
        originIndex = b.firstIndex();
        periodFs = b.periodFs();
        received = 0;
        nextOut = frontMargin; // the outputs before it would read the front padding only partly real
        bufStart = 0;
        bufLen = 0;
        lastBadIndex = Long.MIN_VALUE;
    }

    private void append(AnalogBlock b) {
        int n = b.length();
        ensure(bufLen + n);
        boolean finite = SampleScan.copyAllFinite(b.volts(), buf, bufLen, n);
        long[] inv = b.invalid();
        if (inv != null && BitSets.count(inv, n) > 0) {
            anyBad = true;
            for (int i = 0; i < n; i++) {
                if ((inv[i >>> 6] & (1L << i)) != 0) {
                    bad[bufLen + i] = 1;
                    lastBadIndex = received + i;
                } else {
                    bad[bufLen + i] = 0;
                }
            }
        } else if (anyBad) {
            Arrays.fill(bad, bufLen, bufLen + n, (byte) 0);
        }
        if (!finite) {
            anyBad = true;
            // a NaN or infinity would spread through the kernel: hold the previous value and mark it invalid
            float prev = bufLen > 0 ? buf[bufLen - 1] : 0f;
            for (int i = 0; i < n; i++) {
                float v = buf[bufLen + i];
                if (Float.isFinite(v)) {
                    prev = v;
                } else {
                    buf[bufLen + i] = prev;
                    bad[bufLen + i] = 1;
                    lastBadIndex = Math.max(lastBadIndex, received + i);
                }
            }
        }
        bufLen += n;
        received += n;
    }

    private void ensure(int cap) {
        if (cap > buf.length) {
            int c = Math.max(cap, buf.length + (buf.length >> 1) + 16);
            buf = Arrays.copyOf(buf, c);
            bad = Arrays.copyOf(bad, c);
        }
    }

    /** Produces outputs {@code [nextOut, end)}; the buffer must hold every input they need. */
    private void produce(long end) {
        if (end <= nextOut) {
            return;
        }
        int cnt = (int) (end - nextOut);
        float[] y = new float[cnt];
        int base = (int) (nextOut + fl + lo - bufStart); // buffer position of tap lo for output nextOut
        final float[] x = buf;
        final float[] h = taps;
        final int nt = h.length;
        if (nt == 1) {
            System.arraycopy(x, base, y, 0, cnt);
        } else {
            // Tap-major over chunks that stay in L1. Every array in the inner loop is indexed by the
            // same i, which is what lets the JIT vectorise it (a load at i + variable offset is not
            // vectorised by C2 in Java 17), so each tap's input window is first copied into a scratch array.
            final float[] t0 = tmp0;
            final float[] t1 = tmp1;
            final float[] t2 = tmp2;
            final float[] t3 = tmp3;
            final float[] a = acc;
            for (int c0 = 0; c0 < cnt; c0 += CHUNK) {
                final int len = Math.min(CHUNK, cnt - c0);
                Arrays.fill(a, 0, len, 0f);
                int j = 0;
                // four taps a pass: fewer loads and stores of the accumulator
                for (; j + 3 < nt; j += 4) {
                    final int s0 = base + c0 + j;
                    System.arraycopy(x, s0, t0, 0, len);
                    System.arraycopy(x, s0 + 1, t1, 0, len);
                    System.arraycopy(x, s0 + 2, t2, 0, len);
                    System.arraycopy(x, s0 + 3, t3, 0, len);
                    final float h0 = h[j];
                    final float h1 = h[j + 1];
                    final float h2 = h[j + 2];
                    final float h3 = h[j + 3];
                    for (int i = 0; i < len; i++) {
                        a[i] += h0 * t0[i] + h1 * t1[i] + h2 * t2[i] + h3 * t3[i];
                    }
                }
                for (; j < nt; j++) {
                    System.arraycopy(x, base + c0 + j, t0, 0, len);
                    final float hj = h[j];
                    for (int i = 0; i < len; i++) {
                        a[i] += hj * t0[i];
                    }
                }
                System.arraycopy(a, 0, y, c0, len);
            }
        }
        long[] inv = null;
        long firstNeeded = nextOut + fl + lo;
        if (lastBadIndex >= firstNeeded) {
            inv = invalidMask(base, cnt, nt);
        }
        long startFs = originFs + Math.round(nextOut * periodFs);
        out.accept(new AnalogBlock(channel, originIndex + nextOut, startFs, periodFs, y, cnt, inv));
        nextOut = end;
        discard();
    }

    /** Output i is invalid if any of buffer entries base+i .. base+i+nt-1 is. */
    private long[] invalidMask(int base, int cnt, int nt) {
        long[] inv = new long[BitSets.words(cnt)];
        int window = 0;
        for (int k = 0; k < nt - 1; k++) {
            window += bad[base + k];
        }
        boolean any = false;
        for (int i = 0; i < cnt; i++) {
            window += bad[base + i + nt - 1];
            if (window > 0) {
                inv[i >>> 6] |= 1L << i;
                any = true;
            }
            window -= bad[base + i];
        }
        return any ? inv : null;
    }

    private void discard() {
        long keepFrom = nextOut + fl + lo;
        int drop = (int) Math.min(bufLen, Math.max(0, keepFrom - bufStart));
        if (drop > 0 && drop >= bufLen / 2) {
            System.arraycopy(buf, drop, buf, 0, bufLen - drop);
            if (anyBad) {
                System.arraycopy(bad, drop, bad, 0, bufLen - drop);
            }
            bufLen -= drop;
            bufStart += drop;
        }
    }

    /**
     * Ends the current run: emits every output whose kernel lies inside the run (the kernel
     * margins at both ends are left out).
     */
    void finish() {
        if (!open) {
            return;
        }
        produce(Math.max(0, received - endMargin));
        open = false;
        buf = new float[0];
        bad = new byte[0];
        anyBad = false;
        bufLen = 0;
    }
}
