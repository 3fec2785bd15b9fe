package org.lanesift.plugins.dualedge;

/**
 * Running statistics of the recovered clock: same-direction intervals (the period, in
 * femtoseconds) and duty cycle (high time over the tracked period, a fraction). Intervals are
 * summed as offsets from the first one, so that the variance of a long capture keeps its digits.
 */
final class ClockStats {
    private long periodCount;
    private double periodRef;
    private double periodSum;
    private double periodSumSq;
    private double periodMin = Double.POSITIVE_INFINITY;
    private double periodMax = Double.NEGATIVE_INFINITY;
    private long dutyCount;
    private double dutySum;
    private double dutyMin = Double.POSITIVE_INFINITY;
    private double dutyMax = Double.NEGATIVE_INFINITY;

    /** @param intervalFs one same-direction interval, fs */
    void addPeriod(double intervalFs) {
        if (periodCount == 0) {
            periodRef = intervalFs;
        }
        periodCount++;
        double dv = intervalFs - periodRef;
        periodSum += dv;
        periodSumSq += dv * dv;
        if (intervalFs < periodMin) {
            periodMin = intervalFs;
        }
        if (intervalFs > periodMax) {
            periodMax = intervalFs;
        }
    }

    /** @param duty one high time over the tracked period */
    void addDuty(double duty) {
        dutyCount++;
        dutySum += duty;
        if (duty < dutyMin) {
            dutyMin = duty;
        }
        if (duty > dutyMax) {
            dutyMax = duty;
        }
    }

    /** Number of intervals measured. */
    long intervals() {
        return periodCount;
    }

    /** Mean interval, fs, or {@code fallbackFs} when none was measured. */
    double periodMeanFs(double fallbackFs) {
        return periodCount > 0 ? periodRef + periodSum / periodCount : fallbackFs;
    }

    /** Sample standard deviation of the intervals, fs; 0 with fewer than two. */
    double periodStdFs() {
        if (periodCount < 2) {
            return 0;
        }
        double v = (periodSumSq - periodSum * periodSum / periodCount) / (periodCount - 1);
        return Math.sqrt(Math.max(0, v));
    }

    /** Shortest interval, fs, or NaN when none. */
    double periodMinFs() {
        return periodCount > 0 ? periodMin : Double.NaN;
    }

    /** Longest interval, fs, or NaN when none. */
    double periodMaxFs() {
        return periodCount > 0 ? periodMax : Double.NaN;
    }

    /** Mean duty cycle, or NaN when none was measured. */
    double dutyMean() {
        return dutyCount > 0 ? dutySum / dutyCount : Double.NaN;
    }

    /** Lowest duty cycle, or NaN when none. */
    double dutyMin() {
        return dutyCount > 0 ? dutyMin : Double.NaN;
    }

    /** Highest duty cycle, or NaN when none. */
    double dutyMax() {
        return dutyCount > 0 ? dutyMax : Double.NaN;
    }
}
