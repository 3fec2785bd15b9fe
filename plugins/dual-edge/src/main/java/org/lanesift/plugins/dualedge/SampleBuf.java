package org.lanesift.plugins.dualedge;

import java.util.Arrays;

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
    private final double threshold;
    private double lastUi = Double.NaN;
    private long lastReach;
    private long lastThr;
    private long lastScale;

    SampleBuf(double threshold) {
        this.threshold = threshold;
    }

    void add(long nominalFs, long edgeIndex, double uiFs, boolean falling, boolean suspect, int slotIndex) {
        if (n == nominal.length) {
            int c = n * 2;
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
        applied = n;
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
