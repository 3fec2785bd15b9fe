package org.lanesift.plugins.si;

/**
 * The two-dimensional histogram behind an eye diagram: {@code heightBins} rows of voltage by
 * {@code widthBins} columns of time folded over a window of one or more unit intervals. Column
 * {@code x} covers the window phase {@code [x, x + 1)} in bins; row {@code y} covers the voltage
 * {@code [minVolts + y / binsPerVolt, minVolts + (y + 1) / binsPerVolt)}, row 0 at the bottom.
 *
 * <p>The hot loop {@link #accumulate} takes a run of equally spaced samples with the window phase
 * of the first one and the phase step, both in bins; it allocates nothing. The benchmarks drive it
 * directly from the same package (bench module), so it stays package-private.
 */
final class EyeAccumulator {
    private final int widthBins;
    private final int heightBins;
    private final float minVolts;
    private final float binsPerVolt;
    private final int[] counts;
    private long inRange;
    private long outOfRange;

    /**
     * Creates an empty histogram.
     *
     * @param widthBins  columns (time bins across the whole window), at least 1
     * @param heightBins rows (voltage bins), at least 1
     * @param minVolts   voltage at the bottom edge of row 0
     * @param maxVolts   voltage at the top edge of the last row, above {@code minVolts}
     */
    EyeAccumulator(int widthBins, int heightBins, double minVolts, double maxVolts) {
        if (widthBins < 1 || heightBins < 1 || (long) widthBins * heightBins > 1 << 26) {
            throw new IllegalArgumentException("eye histogram size " + widthBins + " x " + heightBins + " outside 1..2^26 bins");
        }
        if (!(maxVolts > minVolts) || !Double.isFinite(maxVolts - minVolts)) {
            throw new IllegalArgumentException("eye voltage range must be increasing and finite, got " + minVolts + " .. " + maxVolts + " V");
        }
        this.widthBins = widthBins;
        this.heightBins = heightBins;
        this.minVolts = (float) minVolts;
        this.binsPerVolt = (float) (heightBins / (maxVolts - minVolts));
        this.counts = new int[widthBins * heightBins];
    }

    /**
     * Adds samples {@code volts[from..to)}; sample {@code from} lies at window phase {@code phaseBins}
     * and each next one {@code stepBins} later, folded modulo the window width.
     *
     * @param volts     samples
     * @param from      first index
     * @param to        end index, exclusive
     * @param phaseBins phase of the first sample in bins, any finite value
     * @param stepBins  phase step per sample in bins, positive
     * @return the folded phase the sample at {@code to} would have
     */
    double accumulate(float[] volts, int from, int to, double phaseBins, double stepBins) {
        final int w = widthBins;
        final int h = heightBins;
        final float min = minVolts;
        final float scale = binsPerVolt;
        final int[] c = counts;
        // the phase runs in 32.32 fixed point: a one-cycle add in the loop-carried chain, exact to carry over
        final long wFix = (long) w << FRAC;
        long p = toFixed(phaseBins, w);
        final long step = toFixed(stepBins, w);
        long in = 0;
        for (int i = from; i < to; i++) {
            float fy = (volts[i] - min) * scale;
            int x = (int) (p >>> FRAC);
            if (fy >= 0f && fy < h) {
                c[(int) fy * w + x]++;
                in++;
            }
            p += step;
            if (p >= wFix) {
                p -= wFix;
            }
        }
        inRange += in;
        outOfRange += (to - from) - in;
        return p * (1.0 / (1L << FRAC));
    }

    /** Fixed-point fraction bits of the phase. */
    private static final int FRAC = 32;

    /** A phase in bins folded into [0, w) as 32.32 fixed point; exact for values this class returned. */
    private static long toFixed(double bins, int w) {
        double f = bins - Math.floor(bins / w) * w;
        long v = (long) Math.floor(f * (1L << FRAC));
        long wFix = (long) w << FRAC;
        if (v >= wFix) {
            v -= wFix;
        }
        return v < 0 ? 0 : v;
    }

    /**
     * Like {@link #accumulate} but skipping samples marked in an invalid bitset (the phase still
     * advances over them, with the same arithmetic, so results do not depend on the mask's layout).
     *
     * @param volts     samples
     * @param invalid   bitset of invalid samples (index as in {@code volts})
     * @param from      first index
     * @param to        end index, exclusive
     * @param phaseBins phase of the first sample in bins
     * @param stepBins  phase step per sample in bins
     * @return the folded phase of the sample at {@code to}
     */
    double accumulate(float[] volts, long[] invalid, int from, int to, double phaseBins, double stepBins) {
        if (invalid == null) {
            return accumulate(volts, from, to, phaseBins, stepBins);
        }
        final int w = widthBins;
        final int h = heightBins;
        final long wFix = (long) w << FRAC;
        long p = toFixed(phaseBins, w);
        final long step = toFixed(stepBins, w);
        long in = 0;
        long skipped = 0;
        for (int i = from; i < to; i++) {
            if ((invalid[i >>> 6] & (1L << i)) == 0) {
                float fy = (volts[i] - minVolts) * binsPerVolt;
                int x = (int) (p >>> FRAC);
                if (fy >= 0f && fy < h) {
                    counts[(int) fy * w + x]++;
                    in++;
                }
            } else {
                skipped++;
            }
            p += step;
            if (p >= wFix) {
                p -= wFix;
            }
        }
        inRange += in;
        outOfRange += (to - from) - in - skipped;
        return p * (1.0 / (1L << FRAC));
    }

    /**
     * Count in one bin.
     *
     * @param x column
     * @param y row, 0 at the lowest voltage
     * @return samples in the bin
     */
    int count(int x, int y) {
        return counts[y * widthBins + x];
    }

    /**
     * The bins, row-major from row 0 (the lowest voltage). Owned by this accumulator.
     *
     * @return counts
     */
    int[] counts() {
        return counts;
    }

    /**
     * Columns.
     *
     * @return width in bins
     */
    int widthBins() {
        return widthBins;
    }

    /**
     * Rows.
     *
     * @return height in bins
     */
    int heightBins() {
        return heightBins;
    }

    /**
     * Voltage at the bottom of row 0.
     *
     * @return volts
     */
    double minVolts() {
        return minVolts;
    }

    /**
     * Rows per volt.
     *
     * @return bins per volt
     */
    double binsPerVolt() {
        return binsPerVolt;
    }

    /**
     * Samples that fell inside the voltage range.
     *
     * @return count
     */
    long inRange() {
        return inRange;
    }

    /**
     * Samples above or below the voltage range (not in any bin).
     *
     * @return count
     */
    long outOfRange() {
        return outOfRange;
    }
}
