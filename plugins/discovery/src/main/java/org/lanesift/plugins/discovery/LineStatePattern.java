package org.lanesift.plugins.discovery;

import org.lanesift.kit.LineState;
import org.lanesift.kit.LineStateClassifier;
import org.lanesift.kit.LineStateFilter;
import org.lanesift.kit.LegPairs;

/**
 * Looks for the low-power/high-speed state pattern of a D-PHY-like lane in its two single-ended
 * legs: LP-11 (stop), LP-01 (request), LP-00 (bridge), then high speed
 * (docs/reference-facts.md#d-phy-levels-and-states). Each sample pair is classified with
 * signal-kit's {@link LineStateClassifier} (the thresholds the {@code packet-link} decoder uses);
 * a state counts once it has lasted {@link LineStateClassifier#DEFAULT_MIN_STATE_FS}
 * ({@link LineStateFilter}, as in the decoder). It counts
 * the high-speed intervals and how many were entered through the whole sequence, the time spent in
 * each state, the legs' mean levels in the stop state and the high-speed common mode, and the
 * mean durations of LP-01 and LP-00 before an entry. Memory: counters only.
 */
final class LineStatePattern implements LegPairs.Sink {
    private final LineStateClassifier levels = LineStateClassifier.dphy();
    private final LegPairs pairs = new LegPairs(this);
    private final LineStateFilter filter = new LineStateFilter(LineStateClassifier.DEFAULT_MIN_STATE_FS);
    private long lastFs = Long.MIN_VALUE;
    /** States since the last stop state, up to two, with their start times. */
    private final LineState[] since = new LineState[2];
    private final long[] sinceStartFs = new long[2];
    private int sinceCount;
    private boolean afterStop;
    private boolean overflowSince;

    final long[] stateFs = new long[LineState.values().length];
    long hsIntervals;
    long fullEntries;
    double lp01SumFs;
    double lp00SumFs;
    double stopSumVolts;
    long stopSamples;
    double hsCommonSumVolts;
    long hsSamples;
    long samples;

    /**
     * @param positive true for the P leg
     * @param b        a block of that leg
     */
    void accept(boolean positive, org.lanesift.data.AnalogBlock b) {
        pairs.accept(positive, b);
    }

    @Override
    public void pairs(float[] p, int pOff, long[] pInvalid, float[] n, int nOff, long[] nInvalid, int count, long t0Fs, double periodFs) {
        for (int i = 0; i < count; i++) {
            int ip = pOff + i;
            int in = nOff + i;
            long t = t0Fs + Math.round(i * periodFs);
            LineState s = levels.classify(p, ip, pInvalid, n, in, nInvalid);
            samples++;
            if (s == LineState.LP11) {
                stopSumVolts += p[ip] + n[in];
                stopSamples += 2;
            } else if (s == LineState.HS) {
                hsCommonSumVolts += 0.5 * (p[ip] + n[in]);
                hsSamples++;
            }
            step(s, t);
        }
    }

    private void step(LineState s, long t) {
        LineState committed = filter.committed();
        if (committed != null && lastFs != Long.MIN_VALUE) {
            stateFs[committed.ordinal()] += t - lastFs;
        }
        lastFs = t;
        if (filter.step(s, t)) {
            commit(s, filter.committedStartFs());
        }
    }

    private void commit(LineState s, long startFs) {
        if (s == LineState.LP11) {
            afterStop = true;
            sinceCount = 0;
            overflowSince = false;
            return;
        }
        if (s == LineState.HS) {
            hsIntervals++;
            if (afterStop && !overflowSince && sinceCount == 2 && since[0] == LineState.LP01 && since[1] == LineState.LP00) {
                fullEntries++;
                lp01SumFs += sinceStartFs[1] - sinceStartFs[0];
                lp00SumFs += startFs - sinceStartFs[1];
            }
            afterStop = false;
            sinceCount = 0;
            return;
        }
        if (sinceCount < 2) {
            since[sinceCount] = s;
            sinceStartFs[sinceCount++] = startFs;
        } else {
            overflowSince = true;
        }
    }
}
