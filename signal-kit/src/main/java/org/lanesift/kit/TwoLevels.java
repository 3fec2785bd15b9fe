package org.lanesift.kit;

/**
 * The two levels {@link TwoLevelFinder} found, in the units of the samples (volts, usually).
 *
 * @param low       lower level; the minimum when {@code twoLevels} is false
 * @param high      upper level; the maximum when {@code twoLevels} is false
 * @param min       smallest sample
 * @param max       largest sample
 * @param median    median sample
 * @param split     where the two classes divide (the converged threshold), or the median
 * @param twoLevels whether two separate levels were found
 */
public record TwoLevels(double low, double high, double min, double max, double median, double split, boolean twoLevels) {
    /** @return the middle between the levels */
    public double mid() {
        return 0.5 * (low + high);
    }

    /** @return the distance between the levels */
    public double swing() {
        return high - low;
    }
}
