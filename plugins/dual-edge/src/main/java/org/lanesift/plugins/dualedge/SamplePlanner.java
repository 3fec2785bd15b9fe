package org.lanesift.plugins.dualedge;

/**
 * Turns accepted clock edges into nominal sample points: one per edge (DDR), one per rising or
 * falling edge, or {@code slots} per clock period (multiplied mode, see {@link DualEdgePlugin}).
 */
final class SamplePlanner {
    private final SamplerConfig cfg;
    private boolean haveRef;
    private long refT;
    private long refIdx;
    private boolean refSuspect;
    private boolean pendingPixel;
    private long pxR0;
    private long pxR1;
    private long pxIdx;
    private boolean pxSuspect;
    private boolean pxFalling;
    long pixels;
    long pixelsDropped;

    private final double[] slotF;
    private final double[] slotFm1;

    SamplePlanner(SamplerConfig cfg) {
        this.cfg = cfg;
        double[][] f = slotFractions(cfg.slots(), cfg.slot0AfterRef());
        slotF = f[0];
        slotFm1 = f[1];
    }

    /**
     * Plans the samples of every edge the clock recovery accepted since the last call.
     *
     * @param cr           clock recovery
     * @param sb           where samples go
     * @param clockHorizon every clock transition before this time is known
     * @param clockEndFs   end of the clock input's coverage
     */
    void consume(ClockRecovery cr, SampleBuf sb, long clockHorizon, long clockEndFs) {
        AcceptedEdges acc = cr.edges();
        int n = acc.count();
        if (cfg.mode() != SamplerConfig.Mode.MULTIPLIED) {
            boolean ddr = cfg.mode() == SamplerConfig.Mode.DDR;
            boolean wantRising = cfg.mode() != SamplerConfig.Mode.FALLING;
            boolean wantFalling = cfg.mode() != SamplerConfig.Mode.RISING;
            double align = cfg.edgeAligned() ? 0.5 : 0;
            sb.addEdges(acc.timesFs(), acc.periodsFs(), acc.flags(), acc.indices(), n, wantRising, wantFalling, ddr ? 0.5 : 1, align);
            acc.consumed(n);
            return;
        }
        for (int i = 0; i < n; i++) {
            byte f = acc.flags()[i];
            boolean restart = (f & AcceptedEdges.RESTART) != 0;
            boolean suspect = (f & AcceptedEdges.SUSPECT) != 0;
            if (pendingPixel) {
                if (restart) {
                    pixelsDropped++;
                } else {
                    emitPixel(sb);
                }
                pendingPixel = false;
            }
            if (restart) {
                haveRef = false;
            }
            if ((f & AcceptedEdges.REFERENCE) != 0) {
                long t = acc.timesFs()[i];
                if (haveRef) {
                    pendingPixel = true;
                    pxR0 = refT;
                    pxR1 = t;
                    pxIdx = refIdx;
                    pxSuspect = refSuspect || suspect;
                    pxFalling = (f & AcceptedEdges.RISING) == 0;
                }
                haveRef = true;
                refT = t;
                refIdx = acc.indices()[i];
                refSuspect = suspect;
            }
        }
        acc.consumed(n);
        if (pendingPixel) {
            ClockRecovery.Gap g = cr.gapAfterLast(clockHorizon);
            if (g == ClockRecovery.Gap.YES) {
                pixelsDropped++;
                pendingPixel = false;
            } else if (g == ClockRecovery.Gap.NO) {
                long p = pxR1 - pxR0;
                double endF = (cfg.slot0AfterRef() + cfg.slots()) / (double) cfg.slots();
                long lastEnd = endF <= 1 ? pxR0 + Math.round(endF * p) : pxR1 + Math.round((endF - 1) * p);
                if (clockEndFs >= lastEnd) {
                    emitPixel(sb);
                } else {
                    pixelsDropped++;
                }
                pendingPixel = false;
            }
        }
    }

    private void emitPixel(SampleBuf sb) {
        sb.addPixel(pxR0, pxR1, slotF, slotFm1, pxIdx, pxFalling, pxSuspect);
        pixels++;
    }

    /**
     * Slot centres of multiplied mode as fractions of the period after the reference edge:
     * slot {@code j} at {@code (slot0AfterRef + j + 0.5) / slots}; and the same minus one, for
     * slots placed from the next reference edge.
     */
    static double[][] slotFractions(int slots, int slot0AfterRef) {
        double[] f = new double[slots];
        double[] fm1 = new double[slots];
        for (int j = 0; j < slots; j++) {
            f[j] = (slot0AfterRef + j + 0.5) / slots;
            fm1[j] = f[j] - 1;
        }
        return new double[][] {f, fm1};
    }

    /**
     * The earliest time a sample not yet planned can have (before the phase).
     *
     * @return femtoseconds, or {@code Long.MAX_VALUE} when nothing is held
     */
    long frontierFs() {
        if (pendingPixel) {
            return pxR0;
        }
        return haveRef ? refT : Long.MAX_VALUE;
    }
}
