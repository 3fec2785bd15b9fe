package org.lanesift.plugins.differential;

/**
 * Times of fractional sample positions, {@code origin + (k + frac) * period} rounded to the
 * femtosecond, exact for any capture length and the same whichever way the capture was cut into
 * blocks. The product for the anchor {@code k & ~0xFFFF} is computed exactly (with a fused
 * multiply-add for the rounding error) once per 65,536 samples; the rest is a small product.
 */
final class TimeBase {
    private static final long ANCHOR_MASK = ~0xFFFFL;
    private final long originFs;
    private final double periodFs;
    private long anchorIndex = Long.MIN_VALUE;
    private long anchorFs;
    private double anchorRemainder;

    TimeBase(long originFs, double periodFs) {
        this.originFs = originFs;
        this.periodFs = periodFs;
    }

    long originFs() {
        return originFs;
    }

    /**
     * Time of position {@code k + frac}.
     *
     * @param k    sample index from the stream start
     * @param frac fraction of a sample, may be negative
     * @return femtoseconds
     */
    long at(long k, double frac) {
        long a = k & ANCHOR_MASK;
        if (a != anchorIndex) {
            double hi = a * periodFs;
            double lo = Math.fma((double) a, periodFs, -hi);
            long r = Math.round(hi);
            anchorFs = originFs + r;
            anchorRemainder = (hi - r) + lo;
            anchorIndex = a;
        }
        return anchorFs + Math.round(anchorRemainder + ((k - a) + frac) * periodFs);
    }
}
