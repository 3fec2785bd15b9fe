package org.lanesift.kit;

import java.util.ArrayDeque;
import org.lanesift.data.AnalogBlock;

/**
 * Pairs the samples of a lane's two single-ended legs by time: blocks of each leg are queued
 * until the other leg covers the same span, samples of one leg with no partner within half a
 * sample period are skipped, and each run of paired samples goes to the {@link Sink}. Both legs
 * are expected at one sample rate (one capture).
 */
public final class LegPairs {
    /** Receives runs of paired samples. */
    public interface Sink {
        /**
         * @param p        positive leg samples, volts
         * @param pOff     first positive sample
         * @param pInvalid validity mask of the positive block, or null
         * @param n        negative leg samples, volts
         * @param nOff     first negative sample
         * @param nInvalid validity mask of the negative block, or null
         * @param count    pairs
         * @param t0Fs     time of the first pair, femtoseconds
         * @param periodFs sample period, femtoseconds
         */
        void pairs(float[] p, int pOff, long[] pInvalid, float[] n, int nOff, long[] nInvalid, int count, long t0Fs, double periodFs);
    }

    private final Sink sink;
    private final ArrayDeque<AnalogBlock> legP = new ArrayDeque<>();
    private final ArrayDeque<AnalogBlock> legN = new ArrayDeque<>();
    private int posP;
    private int posN;

    /**
     * @param sink where the paired runs go
     */
    public LegPairs(Sink sink) {
        this.sink = sink;
    }

    /**
     * Takes a block of one leg and hands on every pair both legs now cover.
     *
     * @param positive true for the P leg
     * @param b        the block (kept until paired; not changed)
     */
    public void accept(boolean positive, AnalogBlock b) {
        if (b.length() == 0) {
            return;
        }
        (positive ? legP : legN).add(b);
        while (!legP.isEmpty() && !legN.isEmpty()) {
            AnalogBlock p = legP.peek();
            AnalogBlock n = legN.peek();
            double period = p.periodFs();
            long tp = p.startFs() + Math.round(posP * period);
            long tn = n.startFs() + Math.round(posN * n.periodFs());
            if (tp < tn - period / 2) {
                posP += Math.max(1, (int) Math.min(p.length() - posP, Math.floor((tn - tp) / period + 0.5)));
            } else if (tn < tp - period / 2) {
                posN += Math.max(1, (int) Math.min(n.length() - posN, Math.floor((tp - tn) / period + 0.5)));
            } else {
                int k = Math.min(p.length() - posP, n.length() - posN);
                sink.pairs(p.volts(), posP, p.invalid(), n.volts(), posN, n.invalid(), k, tp, period);
                posP += k;
                posN += k;
            }
            if (posP >= p.length()) {
                legP.poll();
                posP = 0;
            }
            if (posN >= n.length()) {
                legN.poll();
                posN = 0;
            }
        }
    }
}
