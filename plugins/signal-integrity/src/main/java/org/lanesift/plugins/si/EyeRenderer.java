package org.lanesift.plugins.si;


import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.util.Locale;
import org.lanesift.kit.FramePictures;

/**
 * Draws an {@link EyeAnalysis} as a PNG: the density plot (one pixel per bin, logarithmic colour
 * scale), a time axis in nanoseconds from the crossing, a voltage axis in millivolts, a colour
 * scale legend in samples per bin, the sample point, threshold, measured opening and the mask.
 */
final class EyeRenderer {
    private static final int LEFT = 78;
    private static final int RIGHT = 140;
    private static final int TOP = 48;
    private static final int BOTTOM = 58;
    private static final int EMPTY = 0x10101A;

    private EyeRenderer() {
    }

    static byte[] render(EyeAnalysis e, String title) {
        int w = e.acc.widthBins();
        int h = e.acc.heightBins();
        BufferedImage img = new BufferedImage(LEFT + w + RIGHT, TOP + h + BOTTOM, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = Plot.begin(img);
        double logMax = Math.log1p(Math.max(1, e.maxCount));
        for (int y = 0; y < h; y++) {
            int py = TOP + h - 1 - y;
            for (int x = 0; x < w; x++) {
                long n = e.at(x, y);
                int rgb = n == 0 ? EMPTY : Plot.ramp(Math.log1p(n) / logMax);
                if (e.maskMap != null && e.maskMap[y * w + x] >= 0) {
                    rgb = n == 0 ? 0x3A1418 : 0xFF3030;
                }
                img.setRGB(LEFT + x, py, rgb);
            }
        }
        // axes: time in ns from the crossing, voltage in mV
        double windowNs = e.uiCount * e.uiFs / 1e6;
        g.setColor(Plot.INK);
        for (double t : Plot.ticks(0, windowNs, 8)) {
            int x = LEFT + (int) Math.round(t / windowNs * w);
            g.drawLine(x, TOP + h, x, TOP + h + 5);
            Plot.centred(g, Plot.label(t), x, TOP + h + 19);
        }
        Plot.centred(g, (e.aligned ? "time (ns), eye opening centred at 0.5 UI" : "time from the folding origin (ns)")
                + "; 1 UI = " + fmt(e.uiFs / 1000) + " ps", LEFT + w / 2, TOP + h + 40);
        double mvLo = e.rowMv(0);
        double mvHi = e.rowMv(h);
        for (double v : Plot.ticks(mvLo, mvHi, 8)) {
            int y = TOP + h - (int) Math.round((v - mvLo) / (mvHi - mvLo) * h);
            g.drawLine(LEFT - 5, y, LEFT, y);
            Plot.right(g, Plot.label(v), LEFT - 8, y + 4);
        }
        Plot.vertical(g, "voltage (mV)", 18, TOP + h / 2);
        g.drawRect(LEFT - 1, TOP - 1, w + 1, h + 1);

        // overlays
        Graphics2D o = (Graphics2D) g.create();
        o.clipRect(LEFT, TOP, w, h);
        o.setStroke(new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, new float[] {5f, 4f}, 0f));
        o.setColor(new Color(255, 255, 255, 170));
        for (int k = 0; k < e.uiCount; k++) {
            int sx = LEFT + (int) Math.round((e.samplePointUi + k) * e.binsPerUi);
            o.drawLine(sx, TOP, sx, TOP + h);
        }
        int ty = TOP + h - 1 - e.thresholdRow;
        o.setColor(new Color(255, 200, 120, 150));
        o.drawLine(LEFT, ty, LEFT + w, ty);
        o.setStroke(new BasicStroke(2f));
        o.setColor(new Color(120, 230, 255));
        if (e.openTopRow >= 0) {
            int x = LEFT + e.sampleColumn;
            int y1 = TOP + h - 1 - e.openTopRow;
            int y0 = TOP + h - 1 - e.openBottomRow;
            o.drawLine(x, y1, x, y0);
            o.drawLine(x - 6, y1, x + 6, y1);
            o.drawLine(x - 6, y0, x + 6, y0);
        }
        if (e.openLeftColumn >= 0 || e.openRightColumn >= 0) {
            int x0 = LEFT + e.openLeftColumn;
            int x1 = LEFT + e.openRightColumn;
            o.drawLine(x0, ty, x1, ty);
            o.drawLine(x0, ty - 6, x0, ty + 6);
            o.drawLine(x1, ty - 6, x1, ty + 6);
        }
        if (e.mask != null) {
            o.setColor(new Color(255, 80, 80));
            o.setStroke(new BasicStroke(1.5f));
            for (EyeMask.Polygon p : e.mask.polygons) {
                for (int k = -1; k <= e.uiCount; k++) {
                    Path2D.Double path = new Path2D.Double();
                    for (int i = 0; i < p.xUi().length; i++) {
                        double px = LEFT + (p.xUi()[i] + k) * e.binsPerUi;
                        double py = TOP + h - (p.yMv()[i] - mvLo) / (mvHi - mvLo) * h;
                        if (i == 0) {
                            path.moveTo(px, py);
                        } else {
                            path.lineTo(px, py);
                        }
                    }
                    path.closePath();
                    o.draw(path);
                }
            }
        }
        o.dispose();

        // legend: colour scale in samples per bin (logarithmic)
        int lx = LEFT + w + 34;
        int lw = 18;
        for (int y = 0; y < h; y++) {
            double f = (double) y / (h - 1);
            g.setColor(new Color(Plot.ramp(f)));
            g.drawLine(lx, TOP + h - 1 - y, lx + lw, TOP + h - 1 - y);
        }
        g.setColor(Plot.INK);
        g.drawRect(lx, TOP, lw, h - 1);
        for (long n = 1; n <= Math.max(1, e.maxCount); n *= 10) {
            int y = TOP + h - 1 - (int) Math.round(Math.log1p(n) / logMax * (h - 1));
            g.drawLine(lx + lw, y, lx + lw + 4, y);
            g.drawString(count(n), lx + lw + 7, y + 4);
            if (n > Long.MAX_VALUE / 10) {
                break;
            }
        }
        if (e.maxCount > 1) {
            int y = TOP;
            g.drawString(count(e.maxCount) + " max", lx - 6, y - 6);
        }
        Plot.vertical(g, "samples per bin (log scale)", lx - 10, TOP + h / 2);

        g.setFont(Plot.TITLE);
        g.drawString(title, 12, 20);
        g.setFont(Plot.FONT);
        String sub = String.format(Locale.ROOT, "height %s mV, width %s ps (%s UI) at %s UI; threshold %.1f mV",
                fmt(e.eyeHeightMv), fmt(e.eyeWidthPs()), fmt(e.eyeWidthUi), fmt(e.samplePointUi), Math.abs(e.thresholdMv) < 0.05 ? 0.0 : e.thresholdMv);
        if (e.mask != null) {
            sub += "; mask hits " + e.totalMaskHits();
        }
        g.drawString(sub, 12, 38);
        g.dispose();
        return FramePictures.png(img);
    }

    private static String count(long n) {
        if (n >= 1_000_000) {
            return String.format(Locale.ROOT, "%.3gM", n / 1e6);
        } else if (n >= 10_000) {
            return String.format(Locale.ROOT, "%.3gk", n / 1e3);
        }
        return Long.toString(n);
    }

    static String fmt(double v) {
        if (!Double.isFinite(v)) {
            return "n/a";
        }
        return String.format(Locale.ROOT, Math.abs(v) >= 100 ? "%.0f" : Math.abs(v) >= 10 ? "%.1f" : "%.3g", v);
    }
}
