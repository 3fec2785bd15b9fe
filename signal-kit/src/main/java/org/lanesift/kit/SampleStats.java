package org.lanesift.kit;

import java.util.Arrays;
import org.lanesift.json.JsonWriter;

/**
 * Running statistics of one measured quantity: count, mean, population standard deviation,
 * minimum and maximum over every value given (Welford's running update: B. P. Welford, Note on a
 * method for calculating corrected sums of squares and products, Technometrics 4, 1962), plus the
 * first {@code keep} values for percentiles and a histogram. Memory stays bounded however long
 * the capture is. Values that are not finite are ignored. The unit is the caller's (ps, %, V).
 */
public final class SampleStats {
    private final String unit;
    private final int keep;
    private double[] kept = new double[64];
    private int keptCount;
    private long count;
    private double mean;
    private double m2;
    private double min = Double.POSITIVE_INFINITY;
    private double max = Double.NEGATIVE_INFINITY;

    /**
     * @param unit unit of the values, for reports
     * @param keep how many first values are kept for percentiles and histograms, at least 0
     */
    public SampleStats(String unit, int keep) {
        if (keep < 0) {
            throw new IllegalArgumentException("keep must not be negative, got " + keep);
        }
        this.unit = unit;
        this.keep = keep;
    }

    /** @param v the next value; NaN and infinities are ignored */
    public void add(double v) {
        if (!Double.isFinite(v)) {
            return;
        }
        count++;
        double d = v - mean;
        mean += d / count;
        m2 += d * (v - mean);
        min = Math.min(min, v);
        max = Math.max(max, v);
        if (keptCount < keep) {
            if (keptCount == kept.length) {
                kept = Arrays.copyOf(kept, Math.min(keep, kept.length * 2));
            }
            kept[keptCount++] = v;
        }
    }

    /** @return how many values were added */
    public long count() {
        return count;
    }

    /** @return the mean, NaN when empty */
    public double mean() {
        return count == 0 ? Double.NaN : mean;
    }

    /** @return the population standard deviation (RMS about the mean), NaN when empty */
    public double std() {
        return count == 0 ? Double.NaN : Math.sqrt(m2 / count);
    }

    /** @return the smallest value, NaN when empty */
    public double min() {
        return count == 0 ? Double.NaN : min;
    }

    /** @return the largest value, NaN when empty */
    public double max() {
        return count == 0 ? Double.NaN : max;
    }

    /** @return largest minus smallest, NaN when empty */
    public double peakToPeak() {
        return count == 0 ? Double.NaN : max - min;
    }

    /** @return the unit given at construction */
    public String unit() {
        return unit;
    }

    /** @return how many values are kept */
    public int keptCount() {
        return keptCount;
    }

    /** @return a copy of the kept values, in the order added */
    public double[] keptValues() {
        return Arrays.copyOf(kept, keptCount);
    }

    /**
     * Percentile of the kept values, linear between order statistics: position
     * {@code p / 100 * (count - 1)} in the sorted values.
     *
     * @param p percentile, 0 to 100
     * @return the value, NaN when nothing is kept
     */
    public double percentile(double p) {
        if (keptCount == 0) {
            return Double.NaN;
        }
        double[] s = keptValues();
        Arrays.sort(s);
        double pos = p / 100.0 * (s.length - 1);
        int lo = (int) Math.floor(pos);
        int hi = Math.min(s.length - 1, lo + 1);
        return s[lo] + (pos - lo) * (s[hi] - s[lo]);
    }

    /**
     * Histogram of the kept values over their range, widened about its middle to at least
     * {@code minSpan} so that a tight spread still reads as one tall bar.
     *
     * @param bins    number of equal bins, at least 1
     * @param minSpan least width of the range, in the unit of the values
     * @return the histogram; empty (no bins) when nothing is kept
     */
    public Histogram histogram(int bins, double minSpan) {
        if (keptCount == 0) {
            return new Histogram(0, 0, new long[0]);
        }
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < keptCount; i++) {
            lo = Math.min(lo, kept[i]);
            hi = Math.max(hi, kept[i]);
        }
        if (hi - lo < minSpan) {
            double mid = (hi + lo) / 2;
            lo = mid - minSpan / 2;
            hi = mid + minSpan / 2;
        }
        long[] c = new long[bins];
        double scale = bins / (hi - lo);
        for (int i = 0; i < keptCount; i++) {
            int b = (int) ((kept[i] - lo) * scale);
            c[Math.min(bins - 1, Math.max(0, b))]++;
        }
        return new Histogram(lo, hi, c);
    }

    /**
     * Writes the summary and the histogram as a JSON object under {@code name}: unit, count, mean,
     * std, min, max, p50 and {@code histogram} {from, to, ofFirst, counts}.
     *
     * @param j       the writer, inside an object
     * @param name    field name
     * @param bins    histogram bins
     * @param minSpan least histogram width, see {@link #histogram}
     */
    public void write(JsonWriter j, String name, int bins, double minSpan) {
        j.name(name).beginObject();
        j.field("unit", unit);
        j.field("count", count);
        j.field("mean", mean());
        j.field("std", std());
        j.field("min", min());
        j.field("max", max());
        j.field("p50", percentile(50));
        Histogram h = histogram(bins, minSpan);
        j.name("histogram").beginObject();
        j.field("from", h.lo());
        j.field("to", h.hi());
        j.field("ofFirst", keptCount);
        j.name("counts").inlineArray(h.counts(), h.counts().length);
        j.endObject();
        j.endObject();
    }

    /**
     * Bin counts over {@code [lo, hi]} in equal bins.
     *
     * @param lo     lower edge of the first bin
     * @param hi     upper edge of the last bin
     * @param counts counts per bin
     */
    public record Histogram(double lo, double hi, long[] counts) {
    }
}
