package org.lanesift.plugins.pixellink;

/** Real-valued measurements (frequencies): count, min, max, mean. */
final class DStat {
    private long count;
    private double min = Double.POSITIVE_INFINITY;
    private double max = Double.NEGATIVE_INFINITY;
    private double sum;

    void add(double v) {
        if (!Double.isFinite(v)) {
            return;
        }
        count++;
        sum += v;
        min = Math.min(min, v);
        max = Math.max(max, v);
    }

    long count() {
        return count;
    }

    double min() {
        return min;
    }

    double max() {
        return max;
    }

    double mean() {
        return count == 0 ? Double.NaN : sum / count;
    }

    /** Whether max and min differ by more than a relative tolerance of the mean. */
    boolean varying(double relTol) {
        return count > 1 && (max - min) > relTol * Math.abs(mean());
    }
}
