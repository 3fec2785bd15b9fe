package org.lanesift.plugins.dualedge;

import java.util.Arrays;
import org.lanesift.data.BitSets;

/**
 * Planned sample points, common to all lanes, not yet sampled: nominal time (phase 0), sample
 * time (once the phase is known), clock edge index, unit interval, flag threshold and flags.
 */
final class SampleBuf {
    static final byte FALLING = 1;
    static final byte SUSPECT = 2;

    long[] nominal = new long[4096];
    long[] s = new long[4096];
    long[] edge = new long[4096];
    double[] ui = new double[4096];
    /** Margin reach (one UI) in whole femtoseconds. */
    long[] reach = new long[4096];
    /** Flag threshold: a margin below this many femtoseconds is flagged. */
    long[] thr = new long[4096];
    /** Histogram scale: bin = (margin * scale) >>> 40 for bins of 1/BINS UI. */
    long[] scale = new long[4096];
    byte[] flags = new byte[4096];
    byte[] slot = new byte[4096];
    int n;
    /** Samples before this index have their sample time set. */
    int applied;
    /** Time of the last sample given its time, kept when the buffer's front is dropped. */
    private long lastApplied = Long.MIN_VALUE;
    private final double threshold;
    private double lastUi = Double.NaN;
    private long lastReach;
    private long lastThr;
    private long lastScale;

    SampleBuf(double threshold) {
        this.threshold = threshold;
    }

    /**
     * What a block of points spans: its earliest and latest sample time, its largest unit interval
     * and the sum of its unit intervals.
     */
    record Summary(long minS, long maxS, double maxUi, double uiSum) {
    }

    /** The {@link Summary} of the first {@code count} points. */
    Summary summarize(int count) {
        long lo = Long.MAX_VALUE;
        long hi = Long.MIN_VALUE;
        double uiMax = 0;
        double sum = 0;
        for (int i = 0; i < count; i++) {
            long t = s[i];
            lo = Math.min(lo, t);
            hi = Math.max(hi, t);
            uiMax = Math.max(uiMax, ui[i]);
            sum += ui[i];
        }
        return new Summary(lo, hi, uiMax, sum);
    }

    /** Packed bits, bit i set when point i samples on a falling clock edge, for the first {@code count} points. */
    long[] fallingBits(int count) {
        long[] falling = new long[BitSets.words(count)];
        for (int i = 0; i < count; i++) {
            if ((flags[i] & FALLING) != 0) {
                falling[i >>> 6] |= 1L << i;
            }
        }
        return falling;
    }

    /**
     * Adds one sample point. The bulk forms {@link #addEdges} and {@link #addPixel} give the same
     * contents; this one is their reference.
     */
    void add(long nominalFs, long edgeIndex, double uiFs, boolean falling, boolean suspect, int slotIndex) {
        ensure(1);
        nominal[n] = nominalFs;
        edge[n] = edgeIndex;
        if (uiFs != lastUi) {
            lastUi = uiFs;
            lastReach = (long) uiFs;
            lastThr = (long) Math.ceil(threshold * uiFs);
            lastScale = (long) (MarginStats.BINS * 1099511627776.0 / uiFs); // 2^40
        }
        ui[n] = uiFs;
        reach[n] = lastReach;
        thr[n] = lastThr;
        scale[n] = lastScale;
        flags[n] = (byte) ((falling ? FALLING : 0) | (suspect ? SUSPECT : 0));
        slot[n] = (byte) slotIndex;
        n++;
    }

    /** Room for {@code extra} more samples. */
    private void ensure(int extra) {
        if (n + extra > nominal.length) {
            int c = Math.max(nominal.length * 2, n + extra);
            nominal = Arrays.copyOf(nominal, c);
            s = Arrays.copyOf(s, c);
            edge = Arrays.copyOf(edge, c);
            ui = Arrays.copyOf(ui, c);
            reach = Arrays.copyOf(reach, c);
            thr = Arrays.copyOf(thr, c);
            scale = Arrays.copyOf(scale, c);
            flags = Arrays.copyOf(flags, c);
            slot = Arrays.copyOf(slot, c);
        }
    }

    /**
     * Adds one sample point per accepted clock edge of the wanted directions (modes ddr, rising,
     * falling): what {@link #add} would give for each, in one loop over primitive arrays.
     *
     * @param accT        edge times
     * @param accP        tracked period at each edge
     * @param accFlags    {@link AcceptedEdges} flags
     * @param accIndex    edge numbers
     * @param count       edges to take
     * @param wantRising  take rising edges
     * @param wantFalling take falling edges
     * @param uiFactor    unit interval per period (0.5 for ddr, else 1)
     * @param align       sample point after the edge, in UI (0 or 0.5)
     */
    void addEdges(long[] accT, double[] accP, byte[] accFlags, long[] accIndex, int count, boolean wantRising,
                  boolean wantFalling, double uiFactor, double align) {
        ensure(count);
        final long[] nom = nominal;
        final long[] ed = edge;
        final double[] u = ui;
        final long[] re = reach;
        final long[] th = thr;
        final long[] sc = scale;
        final byte[] fl = flags;
        final byte[] sl = slot;
        final double thresholdUi = threshold;
        double cUi = lastUi;
        long cReach = lastReach;
        long cThr = lastThr;
        long cScale = lastScale;
        int k = n;
        for (int i = 0; i < count; i++) {
            final byte f = accFlags[i];
            final boolean rising = (f & AcceptedEdges.RISING) != 0;
            if (rising ? !wantRising : !wantFalling) {
                continue;
            }
            final double uiFs = uiFactor == 0.5 ? accP[i] * 0.5 : accP[i];
            nom[k] = align == 0 ? accT[i] : accT[i] + Math.round(align * uiFs);
            ed[k] = accIndex[i];
            if (uiFs != cUi) {
                cUi = uiFs;
                cReach = (long) uiFs;
                cThr = (long) Math.ceil(thresholdUi * uiFs);
                cScale = (long) (MarginStats.BINS * 1099511627776.0 / uiFs); // 2^40
            }
            u[k] = uiFs;
            re[k] = cReach;
            th[k] = cThr;
            sc[k] = cScale;
            fl[k] = (byte) ((rising ? 0 : FALLING) | ((f & AcceptedEdges.SUSPECT) != 0 ? SUSPECT : 0));
            sl[k] = 0;
            k++;
        }
        n = k;
        lastUi = cUi;
        lastReach = cReach;
        lastThr = cThr;
        lastScale = cScale;
    }

    /**
     * Adds the slots of one pixel (multiplied mode): slot {@code j} at {@code r0 + round(f[j] * p)}
     * when {@code f[j] < 1}, else at {@code r1 + round(fm1[j] * p)}, with {@code p = r1 - r0}; what
     * {@link #add} would give for each slot.
     *
     * @param r0       reference edge before the pixel
     * @param r1       next reference edge
     * @param f        slot centres as fractions of the period after {@code r0}
     * @param fm1      {@code f[j] - 1}
     * @param edgeIndex the pixel's clock edge number
     * @param falling  reference edges are falling
     * @param suspect  next to an unknown span of the clock
     */
    void addPixel(long r0, long r1, double[] f, double[] fm1, long edgeIndex, boolean falling, boolean suspect) {
        final int slots = f.length;
        ensure(slots);
        final long p = r1 - r0;
        final double uiFs = p / (double) slots;
        if (uiFs != lastUi) {
            lastUi = uiFs;
            lastReach = (long) uiFs;
            lastThr = (long) Math.ceil(threshold * uiFs);
            lastScale = (long) (MarginStats.BINS * 1099511627776.0 / uiFs); // 2^40
        }
        final byte fb = (byte) ((falling ? FALLING : 0) | (suspect ? SUSPECT : 0));
        int k = n;
        for (int j = 0; j < slots; j++, k++) {
            final double fj = f[j];
            nominal[k] = fj < 1 ? r0 + Math.round(fj * p) : r1 + Math.round(fm1[j] * p);
            edge[k] = edgeIndex;
            ui[k] = uiFs;
            reach[k] = lastReach;
            thr[k] = lastThr;
            scale[k] = lastScale;
            flags[k] = fb;
            slot[k] = (byte) j;
        }
        n = k;
    }

    /**
     * Sets the sample times of the samples planned since the last call.
     *
     * @param isUi    phase is in UI
     * @param phaseUi phase in UI
     * @param phaseFs phase in femtoseconds
     */
    void applyPhase(boolean isUi, double phaseUi, double phaseFs) {
        if (isUi ? phaseUi == 0 : phaseFs == 0) {
            System.arraycopy(nominal, applied, s, applied, n - applied);
        } else if (isUi) {
            for (int i = applied; i < n; i++) {
                s[i] = nominal[i] + Math.round(phaseUi * ui[i]);
            }
        } else {
            long p = Math.round(phaseFs);
            for (int i = applied; i < n; i++) {
                s[i] = nominal[i] + p;
            }
        }
        // Sample times never go backwards. They could: in multiplied mode the slots after the next
        // reference edge are placed with the period before it, so when the clock period shortens
        // abruptly (legal in a capture: a glitchy or restarting clock) they land after the next
        // period's first slots; and a phase in UI moves samples by different amounts where the UI
        // changes. Such a sample is held at the time of the one before and marked suspect, so its
        // bit is flagged rather than sampled out of order (and no annotation ends before it starts).
        for (int i = applied; i < n; i++) {
            long before = i > 0 ? s[i - 1] : lastApplied;
            if (s[i] < before) {
                s[i] = before;
                flags[i] |= SUSPECT;
            }
        }
        applied = n;
        if (n > 0) {
            lastApplied = s[n - 1];
        }
    }

    /** Drops the first {@code k} samples. */
    void removePrefix(int k) {
        if (k == 0) {
            return;
        }
        int r = n - k;
        System.arraycopy(nominal, k, nominal, 0, r);
        System.arraycopy(s, k, s, 0, r);
        System.arraycopy(edge, k, edge, 0, r);
        System.arraycopy(ui, k, ui, 0, r);
        System.arraycopy(reach, k, reach, 0, r);
        System.arraycopy(thr, k, thr, 0, r);
        System.arraycopy(scale, k, scale, 0, r);
        System.arraycopy(flags, k, flags, 0, r);
        System.arraycopy(slot, k, slot, 0, r);
        n = r;
        applied = Math.max(0, applied - k);
    }
}
