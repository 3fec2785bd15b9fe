package org.lanesift.plugins.si;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.util.List;
import java.util.Locale;
import org.lanesift.kit.FramePictures;
import org.lanesift.kit.SampleStats;

/**
 * Drawing helpers for the pictures of this module: tick positions, number labels, the colour scale
 * of density plots and a histogram bar chart, encoded by the shared {@link FramePictures}. Works headless.
 */
final class Plot {
    static final Color BACKGROUND = new Color(250, 250, 247);
    static final Color INK = new Color(30, 30, 34);
    static final Color GRID = new Color(205, 205, 200);
    static final Font FONT = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 13);

    static {
        System.setProperty("java.awt.headless", System.getProperty("java.awt.headless", "true"));
    }

    private Plot() {
    }

    /** Tick values at 1, 2 or 5 times a power of ten covering [lo, hi], about {@code target} of them. */
    static double[] ticks(double lo, double hi, int target) {
        if (!(hi > lo)) {
            return new double[] {lo};
        }
        double raw = (hi - lo) / Math.max(1, target);
        double mag = Math.pow(10, Math.floor(Math.log10(raw)));
        double step = mag;
        for (double m : new double[] {1, 2, 5, 10}) {
            if (m * mag >= raw) {
                step = m * mag;
                break;
            }
        }
        double first = Math.ceil(lo / step - 1e-9) * step;
        int n = (int) Math.floor((hi - first) / step + 1e-9) + 1;
        double[] t = new double[Math.max(0, Math.min(n, 100))];
        for (int i = 0; i < t.length; i++) {
            t[i] = first + i * step;
            if (Math.abs(t[i]) < step * 1e-9) {
                t[i] = 0;
            }
        }
        return t;
    }

    /** A short label for a tick value. */
    static String label(double v) {
        double a = Math.abs(v);
        if (v == 0) {
            return "0";
        }
        if (a >= 1e5 || a < 1e-3) {
            return String.format(Locale.ROOT, "%.2g", v);
        }
        String s = String.format(Locale.ROOT, "%.4f", v);
        s = s.replaceFirst("0+$", "");
        return s.endsWith(".") ? s.substring(0, s.length() - 1) : s;
    }

    /**
     * The density colour scale: 0 maps to the plot background, small densities to deep blue, then
     * through teal and green to yellow and nearly white at the top.
     *
     * @param f density fraction 0..1
     * @return packed RGB
     */
    static int ramp(double f) {
        double[][] stops = {
            {0.00, 38, 24, 96},
            {0.25, 30, 96, 170},
            {0.50, 24, 170, 150},
            {0.75, 190, 210, 50},
            {1.00, 255, 250, 200}};
        double x = Math.max(0, Math.min(1, f));
        for (int i = 1; i < stops.length; i++) {
            if (x <= stops[i][0]) {
                double[] a = stops[i - 1];
                double[] b = stops[i];
                double t = (x - a[0]) / (b[0] - a[0]);
                int r = (int) Math.round(a[1] + t * (b[1] - a[1]));
                int g = (int) Math.round(a[2] + t * (b[2] - a[2]));
                int bl = (int) Math.round(a[3] + t * (b[3] - a[3]));
                return (r << 16) | (g << 8) | bl;
            }
        }
        return 0xFFFAC8;
    }

    static Graphics2D begin(BufferedImage img) {
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setColor(BACKGROUND);
        g.fillRect(0, 0, img.getWidth(), img.getHeight());
        g.setFont(FONT);
        return g;
    }

    static void centred(Graphics2D g, String s, int x, int y) {
        FontMetrics fm = g.getFontMetrics();
        g.drawString(s, x - fm.stringWidth(s) / 2, y);
    }

    static void right(Graphics2D g, String s, int x, int y) {
        FontMetrics fm = g.getFontMetrics();
        g.drawString(s, x - fm.stringWidth(s), y);
    }

    static void vertical(Graphics2D g, String s, int x, int y) {
        Graphics2D g2 = (Graphics2D) g.create();
        g2.translate(x, y);
        g2.rotate(-Math.PI / 2);
        centred(g2, s, 0, 0);
        g2.dispose();
    }

    /** One panel of a {@link #histograms} picture. */
    record Panel(String title, String axis, SampleStats.Histogram histogram, double scale) {
    }

    /**
     * Histogram bar charts, one panel per row, each with its own x axis.
     *
     * @param title  picture title
     * @param panels panels; the histogram values are multiplied by {@code scale} for the axis
     * @return PNG bytes
     */
    static byte[] histograms(String title, List<Panel> panels) {
        int w = 720;
        int ph = 210;
        int h = 40 + ph * Math.max(1, panels.size());
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = begin(img);
        g.setColor(INK);
        g.setFont(TITLE);
        g.drawString(title, 12, 22);
        g.setFont(FONT);
        int top = 40;
        for (Panel p : panels) {
            drawPanel(g, p, 70, top + 20, w - 100, ph - 80);
            top += ph;
        }
        g.dispose();
        return FramePictures.png(img);
    }

    private static void drawPanel(Graphics2D g, Panel p, int x0, int y0, int pw, int ph) {
        g.setColor(INK);
        g.drawString(p.title(), x0, y0 - 6);
        long[] c = p.histogram().counts();
        long max = 1;
        for (long v : c) {
            max = Math.max(max, v);
        }
        g.setColor(Color.WHITE);
        g.fillRect(x0, y0, pw, ph);
        double lo = p.histogram().lo() * p.scale();
        double hi = p.histogram().hi() * p.scale();
        if (c.length == 0) {
            g.setColor(INK);
            centred(g, "no values", x0 + pw / 2, y0 + ph / 2);
        } else {
            double[] yt = ticks(0, max, 4);
            for (double t : yt) {
                int y = y0 + ph - (int) Math.round(t / max * ph);
                g.setColor(GRID);
                g.drawLine(x0, y, x0 + pw, y);
                g.setColor(INK);
                right(g, label(t), x0 - 6, y + 4);
            }
            double bw = (double) pw / c.length;
            g.setColor(new Color(30, 96, 170));
            for (int i = 0; i < c.length; i++) {
                int bh = (int) Math.round((double) c[i] / max * ph);
                int bx = x0 + (int) Math.round(i * bw);
                int bx2 = x0 + (int) Math.round((i + 1) * bw);
                g.fillRect(bx, y0 + ph - bh, Math.max(1, bx2 - bx - 1), bh);
            }
            g.setColor(INK);
            for (double t : ticks(lo, hi, 6)) {
                int x = x0 + (int) Math.round((t - lo) / (hi - lo) * pw);
                g.drawLine(x, y0 + ph, x, y0 + ph + 4);
                centred(g, label(t), x, y0 + ph + 17);
            }
        }
        g.setColor(INK);
        g.setStroke(new BasicStroke(1f));
        g.drawRect(x0, y0, pw, ph);
        centred(g, p.axis(), x0 + pw / 2, y0 + ph + 34);
        vertical(g, "count", x0 - 48, y0 + ph / 2);
    }
}
