package org.lanesift.plugins.discovery;

import java.util.ArrayList;
import java.util.List;

/**
 * Turns the data bursts into candidate pictures: for each pixel format the pixels are decoded,
 * the line length is the lag of the strongest local peak of the luma autocorrelation (a picture
 * repeats itself one line down), and the picture is scored by its smoothness: the correlation of
 * neighbouring pixels, horizontally and vertically (natural and drawn pictures are smooth; a
 * wrong format or line length gives noise).
 */
final class PictureFinder {
    /** Pixels examined per candidate (memory bounded by what is examined, not by the capture). */
    static final int MAX_PIXELS = 1 << 16;
    static final int MIN_LINE = 8;
    static final int MAX_LINE = 4096;
    /** Pixels the line-length search looks at. */
    static final int MAX_LINE_SEARCH_PIXELS = 1 << 14;
    /** Lowest correlation of horizontal neighbours worth a line-length search. */
    static final double MIN_HORIZONTAL = 0.2;

    private PictureFinder() {
    }

    /**
     * @param data   data bits, the data words' values concatenated MSB first
     * @param nbits  bit count
     * @param label  the framing hypothesis, for the report
     * @return one candidate per format that yields at least four lines
     */
    static List<PictureCandidate> candidates(long[] data, int nbits, String label) {
        List<PictureCandidate> out = new ArrayList<>();
        for (PixelFormat f : PixelFormat.values()) {
            if (f.blueFirst) {
                continue; // the blue-first twin is the red-first picture with two components swapped
            }
            PictureCandidate c = decode(data, nbits, f, label);
            if (c != null) {
                out.add(c);
                out.add(twin(c));
            }
        }
        return out;
    }

    /**
     * Smoothness taken off a reading that explains the bits less well than its same-size twin:
     * loosely packed 18-bit colour whose padding bits carry data, or 24-bit colour whose two low
     * bits of every component are always zero (the loose reading explains them). Smaller than any
     * real difference of smoothness, it only orders the two.
     */
    static final double DEPTH_PENALTY = 0.005;
    /** Share of pixels with a bit set under the loose padding above which the padding carries data. */
    static final double PADDING_SHARE = 0.02;

    /**
     * The same pixels with red and blue swapped. Swapping two components changes no neighbour
     * correlation of a component, so smoothness cannot tell the two apart: the twin gets the same
     * scores and stands next to it in the ranking (red first, then blue first), and the report
     * and the picture sheet show both.
     */
    static PictureCandidate twin(PictureCandidate c) {
        int[] rgb = new int[c.rgb().length];
        for (int i = 0; i < rgb.length; i++) {
            int v = c.rgb()[i];
            rgb[i] = (v & 0x00FF00) | (v >>> 16 & 0xFF) | (v & 0xFF) << 16;
        }
        return new PictureCandidate(c.format().twin(), c.lineLength(), c.lines(), rgb, c.smoothness(), c.horizontal(), c.vertical(),
                c.hypothesis());
    }

    static PictureCandidate decode(long[] data, int nbits, PixelFormat f, String label) {
        int n = Math.min(MAX_PIXELS, nbits / f.bitsPerPixel);
        if (n < 4 * MIN_LINE) {
            return null;
        }
        int[] rgb = new int[n];
        double[] y = new double[n];
        long looseMask = PixelFormat.RGB666_LOOSE.paddingMask();
        int padded = 0;
        for (int i = 0; i < n; i++) {
            long v = 0;
            int at = i * f.bitsPerPixel;
            for (int j = 0; j < f.bitsPerPixel; j++) {
                v = v << 1 | (data[(at + j) >>> 6] >>> (at + j) & 1L);
            }
            if ((v & looseMask) != 0) {
                padded++;
            }
            rgb[i] = f.rgb(v);
            y[i] = luma(rgb[i]);
        }
        boolean paddingCarriesData = padded > PADDING_SHARE * n;
        double penalty = f.layout == PixelFormat.Layout.P666_LOOSE && paddingCarriesData
                || f.layout == PixelFormat.Layout.P888 && !paddingCarriesData ? DEPTH_PENALTY : 0;
        double h0 = correlation(y, n, 1, Integer.MAX_VALUE);
        if (h0 < MIN_HORIZONTAL) {
            return null; // noise along the line: no picture in this format, not worth a line-length search
        }
        int line = lineLength(y, Math.min(n, MAX_LINE_SEARCH_PIXELS));
        if (line < 0) {
            return null;
        }
        int lines = n / line;
        int[] pic = java.util.Arrays.copyOf(rgb, line * lines);
        double h = correlation(y, line * lines, 1, line);
        double v = correlation(y, line * lines, line, line);
        return new PictureCandidate(f, line, lines, pic, (h + v) / 2 - penalty, h, v, label);
    }

    /**
     * The line length: among the local peaks of the luma autocorrelation above its trend (the
     * value at the lag minus the mean of the values two lags either side), the shortest lag whose
     * peak reaches half the highest one; longer lags at multiples of the line (several lines down,
     * where a picture with horizontal bands repeats) do not win.
     */
    static int lineLength(double[] y, int n) {
        int maxLag = Math.min(MAX_LINE, n / 4);
        if (maxLag < MIN_LINE + 2) {
            return -1;
        }
        double[] r = Autocorrelation.of(y, n, maxLag + 2);
        double[] peak = new double[maxLag + 2];
        double best = 0;
        for (int lag = MIN_LINE; lag <= maxLag; lag++) {
            peak[lag] = r[lag] - 0.5 * (r[lag - 2] + r[lag + 2]);
            best = Math.max(best, peak[lag]);
        }
        if (!(best > 0)) {
            return -1;
        }
        for (int lag = MIN_LINE; lag <= maxLag; lag++) {
            if (peak[lag] >= 0.5 * best && peak[lag] >= peak[lag - 1] && peak[lag] >= peak[lag + 1]) {
                return lag;
            }
        }
        return -1;
    }

    static double luma(int rgb) {
        // ITU-R BT.601 luma weights
        return 0.299 * (rgb >>> 16 & 255) + 0.587 * (rgb >>> 8 & 255) + 0.114 * (rgb & 255);
    }

    /** Pearson correlation of y[i] and y[i + lag] over pairs in the same column band (horizontal pairs stay within a line). */
    static double correlation(double[] y, int n, int lag, int line) {
        double sx = 0;
        double sy = 0;
        double sxx = 0;
        double syy = 0;
        double sxy = 0;
        int m = 0;
        for (int i = 0; i + lag < n; i++) {
            if (lag == 1 && (i % line) == line - 1) {
                continue;
            }
            double a = y[i];
            double b = y[i + lag];
            sx += a;
            sy += b;
            sxx += a * a;
            syy += b * b;
            sxy += a * b;
            m++;
        }
        if (m < 2) {
            return 0;
        }
        double cov = sxy / m - (sx / m) * (sy / m);
        double va = sxx / m - (sx / m) * (sx / m);
        double vb = syy / m - (sy / m) * (sy / m);
        return va > 0 && vb > 0 ? cov / Math.sqrt(va * vb) : 0;
    }
}
