package org.lanesift.plugins.dualedge;

import org.lanesift.kit.SampleStats;

/**
 * Running statistics of the recovered clock: same-direction intervals (the period, in
 * femtoseconds) and duty cycle (high time over the tracked period, a fraction), kept by the shared
 * {@link SampleStats} (no values kept, so the memory is constant over any capture length).
 */
final class ClockStats {
    private final SampleStats period = new SampleStats("fs", 0);
    private final SampleStats duty = new SampleStats("", 0);

    /** @param intervalFs one same-direction interval, fs */
    void addPeriod(double intervalFs) {
        period.add(intervalFs);
    }

    /** @param dutyFraction one high time over the tracked period */
    void addDuty(double dutyFraction) {
        duty.add(dutyFraction);
    }

    /** Number of intervals measured. */
    long intervals() {
        return period.count();
    }

    /** Mean interval, fs, or {@code fallbackFs} when none was measured. */
    double periodMeanFs(double fallbackFs) {
        return period.count() > 0 ? period.mean() : fallbackFs;
    }

    /** Sample standard deviation of the intervals (n - 1 in the denominator), fs; 0 with fewer than two. */
    double periodStdFs() {
        long n = period.count();
        return n < 2 ? 0 : period.std() * Math.sqrt((double) n / (n - 1));
    }

    /** Shortest interval, fs, or NaN when none. */
    double periodMinFs() {
        return period.min();
    }

    /** Longest interval, fs, or NaN when none. */
    double periodMaxFs() {
        return period.max();
    }

    /** Mean duty cycle, or NaN when none was measured. */
    double dutyMean() {
        return duty.mean();
    }

    /** Lowest duty cycle, or NaN when none. */
    double dutyMin() {
        return duty.min();
    }

    /** Highest duty cycle, or NaN when none. */
    double dutyMax() {
        return duty.max();
    }
}
