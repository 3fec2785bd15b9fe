package org.lanesift.plugins.si;

/**
 * Measurements on a finished eye histogram: the two levels and the decision threshold, the
 * alignment of the time axis on the data crossing, eye height and width at the sample point, and
 * mask hits. Display coordinates: column {@code j} of the picture shows histogram column
 * {@code (j + shift) mod width}, so that with alignment the eye opening (the longest run of
 * columns with an empty band around the threshold) is centred at 0.5 UI and the crossings fall
 * near 0 and 1 UI.
 */
final class EyeAnalysis {
    final EyeAccumulator acc;
    final int uiCount;
    final double uiFs;
    final double binsPerUi;
    final int shift;
    /** Estimated data crossing in the raw folding phase: half a UI before the centre of the opening. */
    final double crossingUi;
    final boolean aligned;
    final double lowMv;
    final double highMv;
    final double thresholdMv;
    final int thresholdRow;
    final double samplePointUi;
    final int sampleColumn;
    /** Rows of the opening at the sample column, inclusive; -1 when closed. */
    final int openBottomRow;
    final int openTopRow;
    /** Columns of the opening on the threshold row, inclusive (display coordinates); -1 when closed. */
    final int openLeftColumn;
    final int openRightColumn;
    final double eyeHeightMv;
    final double eyeHeight3SigmaMv;
    final double eyeWidthUi;
    final EyeMask mask;
    final long[] maskHits;
    /** Mask polygon index per display bin (row-major, row 0 lowest), or null without a mask. */
    final short[] maskMap;
    final long maxCount;
    /** Why height and width could not be measured, or null. */
    final String unmeasured;
    /** Fewer samples than this at the sample point (+/-1 column) leave the eye height unknown. */
    static final int MIN_SAMPLES = 10;

    EyeAnalysis(EyeAccumulator acc, int uiCount, double uiFs, double samplePointUi, boolean align, double offsetUi,
                double thresholdMvGiven, EyeMask mask) {
        this.acc = acc;
        this.aligned = align;
        this.uiCount = uiCount;
        this.uiFs = uiFs;
        this.mask = mask;
        int w = acc.widthBins();
        int h = acc.heightBins();
        int[] c = acc.counts();
        binsPerUi = (double) w / uiCount;
        long max = 0;
        long[] rows = new long[h];
        for (int y = 0; y < h; y++) {
            long s = 0;
            for (int x = 0; x < w; x++) {
                int v = c[y * w + x];
                s += v;
                max = Math.max(max, v);
            }
            rows[y] = s;
        }
        maxCount = max;
        // levels: modes of the voltage marginal in the lower and upper half of the occupied rows
        int firstRow = 0;
        while (firstRow < h - 1 && rows[firstRow] == 0) {
            firstRow++;
        }
        int lastRow = h - 1;
        while (lastRow > 0 && rows[lastRow] == 0) {
            lastRow--;
        }
        int mid = (firstRow + lastRow + 1) / 2;
        int lowRow = argmax(rows, firstRow, Math.max(firstRow + 1, mid));
        int highRow = argmax(rows, Math.min(mid, lastRow), lastRow + 1);
        double win = Math.max(2, 0.1 * (lastRow - firstRow + 1));
        lowMv = rowMv(meanShift(rows, lowRow + 0.5, win));
        highMv = rowMv(meanShift(rows, highRow + 0.5, win));
        thresholdMv = Double.isNaN(thresholdMvGiven) ? (lowMv + highMv) / 2 : thresholdMvGiven;
        thresholdRow = clamp((int) Math.floor((thresholdMv / 1000 - acc.minVolts()) * acc.binsPerVolt()), 0, h - 1);

        // crossing: column density within a band around the threshold, folded onto one UI
        int bpu = Math.max(1, (int) Math.round(binsPerUi));
        double swingRows = Math.abs(highMv - lowMv) / 1000 * acc.binsPerVolt();
        int band = Math.max(1, (int) Math.round(0.05 * swingRows));
        double[] dens = new double[bpu];
        for (int y = Math.max(0, thresholdRow - band); y <= Math.min(h - 1, thresholdRow + band); y++) {
            for (int x = 0; x < w; x++) {
                dens[x % bpu] += c[y * w + x];
            }
        }
        double cross = 0;
        if (align) {
            // the eye's centre is the middle of the longest (circular) run of columns whose band around
            // the threshold is (nearly) empty; the crossing sits half a UI before it. This follows the
            // opening rather than the densest column, so a ring that dwells near the threshold cannot
            // pull the axis off the real edges.
            double lo = Double.POSITIVE_INFINITY;
            double hi = Double.NEGATIVE_INFINITY;
            for (double d : dens) {
                lo = Math.min(lo, d);
                hi = Math.max(hi, d);
            }
            double limit = lo + 0.02 * (hi - lo);
            int bestLen = 0;
            int bestStart = 0;
            int runStart = -1;
            for (int k = 0; k < 2 * bpu; k++) {
                boolean open = dens[k % bpu] <= limit;
                if (open && runStart < 0) {
                    runStart = k;
                }
                if ((!open || k == 2 * bpu - 1) && runStart >= 0) {
                    int len = Math.min(bpu, (open ? k + 1 : k) - runStart);
                    if (len > bestLen) {
                        bestLen = len;
                        bestStart = runStart;
                    }
                    runStart = -1;
                }
            }
            double centre = bestStart + bestLen / 2.0;
            cross = centre - bpu / 2.0;
            cross -= Math.floor(cross / bpu) * bpu;
        }
        crossingUi = cross / binsPerUi;
        shift = Math.floorMod((int) Math.round(cross + offsetUi * binsPerUi), w);

        this.samplePointUi = samplePointUi;
        sampleColumn = clamp((int) Math.floor(samplePointUi * binsPerUi), 0, w - 1);

        // eye height: the empty run of rows containing the threshold row, over sample column +/- 1
        long atSample = 0;
        long below = 0;
        for (int y = 0; y < h; y++) {
            for (int x = Math.max(0, sampleColumn - 1); x <= Math.min(w - 1, sampleColumn + 1); x++) {
                atSample += at(x, y);
                if (y < thresholdRow) {
                    below += at(x, y);
                }
            }
        }
        long above = atSample - below;
        boolean twoLevels = Math.abs(highMv - lowMv) / 1000 * acc.binsPerVolt() >= 4;
        if (!twoLevels) {
            unmeasured = "no two distinct levels (low " + Math.round(lowMv) + " mV, high " + Math.round(highMv) + " mV)";
        } else if (atSample < MIN_SAMPLES) {
            unmeasured = "too few samples at the sample point";
        } else if (below == 0 || above == 0) {
            unmeasured = "only one level at the sample point (a data pattern whose period matches the window?)";
        } else {
            unmeasured = null;
        }
        if (unmeasured != null) {
            openBottomRow = -1;
            openTopRow = -1;
            eyeHeightMv = Double.NaN;
        } else if (columnsEmpty(thresholdRow, sampleColumn)) {
            int lo = thresholdRow;
            while (lo > 0 && columnsEmpty(lo - 1, sampleColumn)) {
                lo--;
            }
            int hi = thresholdRow;
            while (hi < h - 1 && columnsEmpty(hi + 1, sampleColumn)) {
                hi++;
            }
            openBottomRow = lo;
            openTopRow = hi;
            eyeHeightMv = (hi - lo + 1) / acc.binsPerVolt() * 1000;
        } else {
            openBottomRow = -1;
            openTopRow = -1;
            eyeHeightMv = 0;
        }
        // statistical height from the sample column: (mean - 3 sigma) of the upper rail minus (mean + 3 sigma) of the lower
        double s0 = 0;
        double q0 = 0;
        long n0 = 0;
        double s1 = 0;
        double q1 = 0;
        long n1 = 0;
        for (int y = 0; y < h; y++) {
            long n = at(sampleColumn, y);
            double mv = rowMv(y + 0.5);
            if (mv < thresholdMv) {
                n0 += n;
                s0 += n * mv;
                q0 += n * mv * mv;
            } else {
                n1 += n;
                s1 += n * mv;
                q1 += n * mv * mv;
            }
        }
        if (n0 > 1 && n1 > 1) {
            double m0 = s0 / n0;
            double m1 = s1 / n1;
            double sd0 = Math.sqrt(Math.max(0, q0 / n0 - m0 * m0));
            double sd1 = Math.sqrt(Math.max(0, q1 / n1 - m1 * m1));
            eyeHeight3SigmaMv = (m1 - 3 * sd1) - (m0 + 3 * sd0);
        } else {
            eyeHeight3SigmaMv = Double.NaN;
        }
        // eye width: the empty run of columns on the threshold row containing the sample column
        if (unmeasured != null) {
            openLeftColumn = -1;
            openRightColumn = -1;
            eyeWidthUi = Double.NaN;
        } else if (at(sampleColumn, thresholdRow) == 0) {
            int l = sampleColumn;
            int steps = 0;
            while (steps < w - 1 && at(Math.floorMod(l - 1, w), thresholdRow) == 0) {
                l--;
                steps++;
            }
            int r = sampleColumn;
            while (steps < w - 1 && at(Math.floorMod(r + 1, w), thresholdRow) == 0) {
                r++;
                steps++;
            }
            if (steps >= w - 1) {
                openLeftColumn = -1; // the threshold row is empty everywhere: no crossings to measure against
                openRightColumn = -1;
                eyeWidthUi = Double.NaN;
            } else {
                openLeftColumn = l;
                openRightColumn = r;
                eyeWidthUi = (r - l + 1) / binsPerUi;
            }
        } else {
            openLeftColumn = -1;
            openRightColumn = -1;
            eyeWidthUi = 0;
        }
        // mask
        if (mask != null) {
            maskMap = new short[w * h];
            maskHits = new long[mask.polygons.size()];
            for (int y = 0; y < h; y++) {
                double mv = rowMv(y + 0.5);
                for (int x = 0; x < w; x++) {
                    int p = mask.hit((x + 0.5) / binsPerUi, mv);
                    maskMap[y * w + x] = (short) p;
                    if (p >= 0) {
                        maskHits[p] += at(x, y);
                    }
                }
            }
        } else {
            maskMap = null;
            maskHits = new long[0];
        }
    }

    /** Count in display column {@code x}, row {@code y}. */
    long at(int x, int y) {
        int w = acc.widthBins();
        return acc.counts()[y * w + Math.floorMod(x + shift, w)];
    }

    long totalMaskHits() {
        long s = 0;
        for (long v : maskHits) {
            s += v;
        }
        return s;
    }

    double eyeWidthPs() {
        return eyeWidthUi * uiFs / 1000;
    }

    /** Millivolts at a fractional row position (row 0 bottom edge = minimum voltage). */
    double rowMv(double row) {
        return (acc.minVolts() + row / acc.binsPerVolt()) * 1000;
    }

    private boolean columnsEmpty(int row, int col) {
        int w = acc.widthBins();
        for (int x = Math.max(0, col - 1); x <= Math.min(w - 1, col + 1); x++) {
            if (at(x, row) != 0) {
                return false;
            }
        }
        return true;
    }

    /** Moves a level estimate to the mean of the rows within +/-{@code half} of it, a few times (mean shift). */
    static double meanShift(long[] rows, double centre, double half) {
        double c = centre;
        for (int it = 0; it < 8; it++) {
            double num = 0;
            double den = 0;
            int lo = Math.max(0, (int) Math.floor(c - half));
            int hi = Math.min(rows.length - 1, (int) Math.ceil(c + half));
            for (int k = lo; k <= hi; k++) {
                double x = k + 0.5;
                if (Math.abs(x - c) <= half) {
                    num += rows[k] * x;
                    den += rows[k];
                }
            }
            if (den == 0) {
                break;
            }
            c = num / den;
        }
        return c;
    }

    private static int argmax(long[] a, int from, int to) {
        int best = from;
        for (int i = from; i < to && i < a.length; i++) {
            if (a[i] > a[best]) {
                best = i;
            }
        }
        return best;
    }

    private static int clamp(int v, int lo, int hi) {
        return Math.max(lo, Math.min(hi, v));
    }
}
