package org.lanesift.plugins.si;

import java.util.Arrays;
import org.lanesift.json.JsonWriter;

/**
 * One measured quantity over a capture: count, mean, standard deviation, minimum and maximum over
 * every value (Welford's running update), plus the first {@code keep} values for a histogram and
 * percentiles. Memory stays bounded however long the capture is.
 */
final class Distribution {
    private final String unit;
    private final int keep;
    private double[] kept = new double[64];
    private int keptCount;
    private long count;
    private double mean;
    private double m2;
    private double min = Double.POSITIVE_INFINITY;
    private double max = Double.NEGATIVE_INFINITY;

    Distribution(String unit, int keep) {
        this.unit = unit;
        this.keep = keep;
    }

    void add(double v) {
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

    long count() {
        return count;
    }

    double mean() {
        return count == 0 ? Double.NaN : mean;
    }

    /** Population standard deviation (RMS about the mean). */
    double std() {
        return count == 0 ? Double.NaN : Math.sqrt(m2 / count);
    }

    double min() {
        return count == 0 ? Double.NaN : min;
    }

    double max() {
        return count == 0 ? Double.NaN : max;
    }

    double peakToPeak() {
        return count == 0 ? Double.NaN : max - min;
    }

    String unit() {
        return unit;
    }

    int keptCount() {
        return keptCount;
    }

    double[] keptValues() {
        return Arrays.copyOf(kept, keptCount);
    }

    /** Percentile (0..100) of the kept values, linear between order statistics. */
    double percentile(double p) {
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

    /** Histogram of the kept values over [min, max] of the kept values. */
    Histogram histogram(int bins) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < keptCount; i++) {
            lo = Math.min(lo, kept[i]);
            hi = Math.max(hi, kept[i]);
        }
        if (keptCount == 0) {
            return new Histogram(0, 0, new long[0]);
        }
        // at least one unit (1 ps, 1 %) wide, so that a tight spread still reads as one tall bar
        double minSpan = 1.0;
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

    /** Writes the summary and histogram as a JSON object under {@code name}. */
    void write(JsonWriter j, String name, int bins) {
        j.name(name).beginObject();
        j.field("unit", unit);
        j.field("count", count);
        j.field("mean", mean());
        j.field("std", std());
        j.field("min", min());
        j.field("max", max());
        j.field("p50", percentile(50));
        Histogram h = histogram(bins);
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
    record Histogram(double lo, double hi, long[] counts) {
    }
}
