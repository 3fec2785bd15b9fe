package org.lanesift.plugins.si;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.util.Locale;

/**
 * Draws a bathtub curve: log10 of the error probability against the sampling instant across one
 * interval (in unit intervals), the dual-Dirac model as a line, the measured shares as dots, and the
 * target bit error ratio as a horizontal line. PNG through {@link Plot}.
 */
final class BathtubPlot {
    private BathtubPlot() {
    }

    /**
     * Renders the picture.
     *
     * @param title      picture title
     * @param subtitle   line under the title (figures)
     * @param xUi        sampling instants, unit intervals
     * @param modelLog10 log10 of the model's error probability at each instant (NaN: none)
     * @param measured   measured error share at each instant (0: none seen)
     * @param ber        target bit error ratio
     * @return PNG bytes
     */
    static byte[] render(String title, String subtitle, double[] xUi, double[] modelLog10, double[] measured, double ber) {
        int w = 720;
        int h = 440;
        int x0 = 70;
        int y0 = 62;
        int pw = w - 100;
        int ph = h - 130;
        double yLo = Math.min(-14, Math.floor(Math.log10(ber)) - 2);
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = Plot.begin(img);
        g.setColor(Plot.INK);
        g.setFont(Plot.TITLE);
        g.drawString(title, 12, 22);
        g.setFont(Plot.FONT);
        g.drawString(subtitle, 12, 42);
        g.setColor(Color.WHITE);
        g.fillRect(x0, y0, pw, ph);
        for (double t = 0; t >= yLo; t -= 2) {
            int y = y0 + (int) Math.round(t / yLo * ph);
            g.setColor(Plot.GRID);
            g.drawLine(x0, y, x0 + pw, y);
            g.setColor(Plot.INK);
            Plot.right(g, String.format(Locale.ROOT, "1e%d", (int) t), x0 - 6, y + 4);
        }
        for (double t : Plot.ticks(0, 1, 6)) {
            int x = x0 + (int) Math.round(t * pw);
            g.setColor(Plot.INK);
            g.drawLine(x, y0 + ph, x, y0 + ph + 4);
            Plot.centred(g, Plot.label(t), x, y0 + ph + 17);
        }
        int yb = y0 + (int) Math.round(Math.log10(ber) / yLo * ph);
        g.setColor(new Color(190, 60, 40));
        g.setStroke(new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, new float[] {6f, 4f}, 0f));
        g.drawLine(x0, yb, x0 + pw, yb);
        Plot.right(g, "target " + String.format(Locale.ROOT, "%.0e", ber), x0 + pw - 4, yb - 4);
        g.setStroke(new BasicStroke(2f));
        g.setColor(new Color(30, 96, 170));
        int px = Integer.MIN_VALUE;
        int py = 0;
        for (int i = 0; i < xUi.length; i++) {
            double v = modelLog10[i];
            if (!Double.isFinite(v)) {
                px = Integer.MIN_VALUE;
                continue;
            }
            int x = x0 + (int) Math.round(xUi[i] * pw);
            int y = y0 + (int) Math.round(Math.max(yLo, Math.min(0, v)) / yLo * ph);
            if (px != Integer.MIN_VALUE) {
                g.drawLine(px, py, x, y);
            }
            px = x;
            py = y;
        }
        g.setColor(new Color(40, 140, 60));
        for (int i = 0; i < xUi.length; i++) {
            if (measured[i] > 0) {
                int x = x0 + (int) Math.round(xUi[i] * pw);
                int y = y0 + (int) Math.round(Math.max(yLo, Math.log10(measured[i])) / yLo * ph);
                g.fillOval(x - 2, y - 2, 5, 5);
            }
        }
        g.setStroke(new BasicStroke(1f));
        g.setColor(Plot.INK);
        g.drawRect(x0, y0, pw, ph);
        Plot.centred(g, "sampling instant after the ideal edge (unit intervals)    line: dual-Dirac model    dots: measured",
                x0 + pw / 2, y0 + ph + 34);
        Plot.vertical(g, "error probability", x0 - 52, y0 + ph / 2);
        g.dispose();
        return Plot.png(img);
    }
}
