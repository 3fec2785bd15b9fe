package org.lanesift.plugins.discovery;

import org.lanesift.kit.LineState;

/**
 * The low-power/high-speed state pattern over every lane whose legs were examined (see
 * {@link LineStatePattern}). The pattern is claimed when at least {@link #MIN_ENTRIES}
 * high-speed intervals were entered through LP-11, LP-01, LP-00 and they are at least half of
 * all high-speed intervals.
 *
 * @param lanes          lanes whose legs were examined
 * @param samples        sample pairs classified
 * @param hsIntervals    high-speed intervals seen
 * @param fullEntries    of them, entered through LP-11, LP-01, LP-00
 * @param stateShare     share of the time in each {@link LineState}, in the enum's order
 * @param stopLevelVolts mean leg level in LP-11 (NaN when never seen)
 * @param hsCommonVolts  mean common mode in high speed (NaN when never seen)
 * @param lp01MeanS      mean LP-01 duration before an entry, seconds (NaN without entries)
 * @param lp00MeanS      mean LP-00 duration before an entry, seconds (NaN without entries)
 * @param found          whether the pattern is claimed
 * @param confidence     0..1: the share of intervals entered through the sequence, scaled down below four entries (found); one minus that share (not found)
 */
record LineStates(int lanes, long samples, long hsIntervals, long fullEntries, double[] stateShare, double stopLevelVolts,
                  double hsCommonVolts, double lp01MeanS, double lp00MeanS, boolean found, double confidence) {
    /** Fewest entries through the whole sequence that make the pattern. */
    static final int MIN_ENTRIES = 2;

    static LineStates of(LineStatePattern[] lanes) {
        long samples = 0;
        long hs = 0;
        long full = 0;
        double lp01 = 0;
        double lp00 = 0;
        double stop = 0;
        long stopN = 0;
        double cm = 0;
        long cmN = 0;
        long[] fs = new long[LineState.values().length];
        for (LineStatePattern p : lanes) {
            samples += p.samples;
            hs += p.hsIntervals;
            full += p.fullEntries;
            lp01 += p.lp01SumFs;
            lp00 += p.lp00SumFs;
            stop += p.stopSumVolts;
            stopN += p.stopSamples;
            cm += p.hsCommonSumVolts;
            cmN += p.hsSamples;
            for (int s = 0; s < fs.length; s++) {
                fs[s] += p.stateFs[s];
            }
        }
        long total = 0;
        for (long x : fs) {
            total += x;
        }
        double[] share = new double[fs.length];
        for (int s = 0; s < fs.length && total > 0; s++) {
            share[s] = fs[s] / (double) total;
        }
        double entered = hs == 0 ? 0 : full / (double) hs;
        boolean found = full >= MIN_ENTRIES && 2 * full >= hs;
        double confidence = found ? entered * Math.min(1.0, full / 4.0) : 1 - entered;
        return new LineStates(lanes.length, samples, hs, full, share, stopN == 0 ? Double.NaN : stop / stopN,
                cmN == 0 ? Double.NaN : cm / cmN, full == 0 ? Double.NaN : lp01 / full * 1e-15, full == 0 ? Double.NaN : lp00 / full * 1e-15,
                found, confidence);
    }
}
