package org.lanesift.viewer;

/**
 * One analog channel held whole for drawing: samples in volts at a fixed period, the absolute
 * time of the first one, and its {@link MinMaxPyramid}.
 *
 * @param name     channel name, as the source port calls it
 * @param startFs  time of sample 0, femtoseconds
 * @param periodFs sample period, femtoseconds
 * @param volts    samples, volts (at least {@code length} long)
 * @param length   number of samples
 * @param pyramid  min/max pyramid over {@code volts}
 */
public record AnalogTrace(String name, long startFs, double periodFs, float[] volts, int length, MinMaxPyramid pyramid) {

    /**
     * A trace with its pyramid built.
     *
     * @param name     channel name
     * @param startFs  time of sample 0, femtoseconds
     * @param periodFs sample period, femtoseconds
     * @param volts    samples, volts
     * @param length   number of samples used
     * @return the trace
     */
    public static AnalogTrace of(String name, long startFs, double periodFs, float[] volts, int length) {
        return new AnalogTrace(name, startFs, periodFs, volts, length, MinMaxPyramid.build(volts, length));
    }

    /**
     * Time just after the last sample.
     *
     * @return femtoseconds
     */
    public long endFs() {
        return startFs + Math.round(length * periodFs);
    }

    /**
     * The sample index whose time is at or before {@code tFs}, clamped to the trace.
     *
     * @param tFs a time, femtoseconds
     * @return index in {@code 0..length-1}
     */
    public int indexAt(double tFs) {
        double i = Math.floor((tFs - startFs) / periodFs);
        return (int) Math.max(0, Math.min(length - 1, i));
    }

    /**
     * The value at a time, interpolated linearly between the two samples around it.
     *
     * @param tFs a time inside the trace, femtoseconds
     * @return volts, or NaN outside the trace
     */
    public double valueAt(double tFs) {
        double x = (tFs - startFs) / periodFs;
        if (length == 0 || x < 0 || x > length - 1) {
            return Double.NaN;
        }
        int i = (int) Math.floor(x);
        if (i >= length - 1) {
            return volts[length - 1];
        }
        double f = x - i;
        return volts[i] + f * (volts[i + 1] - volts[i]);
    }
}
