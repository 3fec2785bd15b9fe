package org.lanesift.plugins.dualedge;

import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;

/**
 * Running statistics of one lane's margins: counts, exact minima, and fine histograms of setup and
 * hold margins as fractions of the unit interval (bins of 1/{@link #BINS} UI over 0..1 UI), from
 * which percentiles are read to half a bin.
 */
final class MarginStats {
    static final int BINS = 2000;
    static final double[] PERCENTILES = {0.1, 1, 5, 10, 50, 90, 99};
    static final int REPORT_BINS = 50;

    /** Bins 0..BINS (BINS holds exactly 1 UI); bin BINS + 1 counts unknown margins. */
    final long[] setupHist = new long[BINS + 2];
    final long[] holdHist = new long[BINS + 2];
    /**
     * Four interleaved copies (index {@code bin * 4 + (i & 3)}) filled by the fast loop, so that
     * consecutive bits never increment the same counter (no store-to-load stalls); added into
     * {@link #setupHist} / {@link #holdHist} by {@link #merge()}.
     */
    final long[] setupHist4 = new long[(BINS + 2) * 4];
    final long[] holdHist4 = new long[(BINS + 2) * 4];

    /** Adds the interleaved copies into the plain histograms and clears them. */
    void merge() {
        for (int b = 0; b < BINS + 2; b++) {
            setupHist[b] += setupHist4[4 * b] + setupHist4[4 * b + 1] + setupHist4[4 * b + 2] + setupHist4[4 * b + 3];
            holdHist[b] += holdHist4[4 * b] + holdHist4[4 * b + 1] + holdHist4[4 * b + 2] + holdHist4[4 * b + 3];
        }
        java.util.Arrays.fill(setupHist4, 0);
        java.util.Arrays.fill(holdHist4, 0);
    }
    long bits;
    long flagged;
    long unknown;

    long setupKnown() {
        return bits - setupHist[BINS + 1];
    }

    long holdKnown() {
        return bits - holdHist[BINS + 1];
    }
    long minSetupFs = Long.MAX_VALUE;
    long minHoldFs = Long.MAX_VALUE;
    double minSetupUi = Double.POSITIVE_INFINITY;
    double minHoldUi = Double.POSITIVE_INFINITY;
    long lowRuns;

    /**
     * The p-th percentile of a histogram, in UI.
     *
     * @param hist  counts
     * @param total sum of counts
     * @param p     percentile, 0..100
     * @return bin centre in UI, or NaN for an empty histogram
     */
    static double percentile(long[] hist, long total, double p) {
        if (total == 0) {
            return Double.NaN;
        }
        long rank = (long) Math.ceil(p / 100.0 * total);
        if (rank < 1) {
            rank = 1;
        }
        long c = 0;
        for (int i = 0; i <= BINS; i++) {
            c += hist[i];
            if (c >= rank) {
                return Math.min(1.0, (i + 0.5) / BINS);
            }
        }
        return 1.0;
    }

    void writeMargin(JsonWriter j, String name, long[] hist, long known, long minFs, double minUi, double meanUiFs) {
        j.name(name).beginObject();
        j.name("known").value(known);
        j.name("minFs").value(known == 0 ? Double.NaN : (double) minFs);
        j.name("minUI").value(known == 0 ? Double.NaN : minUi);
        j.name("percentilesUI").beginObject();
        for (double p : PERCENTILES) {
            j.name(p == Math.rint(p) ? Long.toString((long) p) : Double.toString(p)).value(percentile(hist, known, p));
        }
        j.endObject();
        j.name("percentilesFs").beginObject();
        for (double p : PERCENTILES) {
            j.name(p == Math.rint(p) ? Long.toString((long) p) : Double.toString(p)).value(percentile(hist, known, p) * meanUiFs);
        }
        j.endObject();
        j.name("histogram").beginObject();
        j.name("binUI").value(1.0 / REPORT_BINS);
        j.name("counts").beginArrayInline();
        int per = BINS / REPORT_BINS;
        for (int b = 0; b < REPORT_BINS; b++) {
            long s = 0;
            for (int i = b * per; i < (b + 1) * per; i++) {
                s += hist[i];
            }
            if (b == REPORT_BINS - 1) {
                s += hist[BINS];
            }
            j.value(s);
        }
        j.endArray().endObject();
        j.endObject();
    }
}
