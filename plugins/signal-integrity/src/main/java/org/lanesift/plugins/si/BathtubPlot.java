package org.lanesift.plugins.si;

import org.lanesift.kit.FramePictures;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.util.Locale;

/**
 * Draws a bathtub curve: log10 of the error probability against the sampling instant, the
 * dual-Dirac model as a line, the measured shares as dots, and the target bit error ratio as a
 * dashed line. The two walls are drawn side by side, each over its own range in picoseconds (the
 * left one after an ideal edge, the right one before the next), because jitter is often thousands
 * of times narrower than the interval; the floor between them is not drawn. PNG through {@link Plot}.
 */
final class BathtubPlot {
    private BathtubPlot() {
    }

    /**
     * Renders the picture.
     *
     * @param title      picture title
     * @param subtitle   line under the title (figures)
     * @param xPs        sampling instants after the ideal edge, ps; first half on the left wall, second on the right
     * @param uiPs       interval between ideal edges, ps
     * @param modelLog10 log10 of the model's error probability at each instant (NaN: none)
     * @param measured   measured error share at each instant (0: none seen)
     * @param ber        target bit error ratio
     * @return PNG bytes
     */
    static byte[] render(String title, String subtitle, double[] xPs, double uiPs, double[] modelLog10, double[] measured, double ber) {
        int w = 760;
        int h = 440;
        int y0 = 62;
        int ph = h - 130;
        int pw = (w - 130) / 2;
        double yLo = Math.min(-14, Math.floor(Math.log10(ber)) - 2);
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = Plot.begin(img);
        g.setColor(Plot.INK);
        g.setFont(Plot.TITLE);
        g.drawString(title, 12, 22);
        g.setFont(Plot.FONT);
        g.drawString(subtitle, 12, 42);
        int half = xPs.length / 2;
        panel(g, 70, y0, pw, ph, yLo, ber, xPs, 0, half, 0, modelLog10, measured, "ps after the ideal edge");
        panel(g, 70 + pw + 30, y0, pw, ph, yLo, ber, xPs, half, xPs.length, uiPs, modelLog10, measured, "ps before the next ideal edge");
        Plot.vertical(g, "error probability", 18, y0 + ph / 2);
        g.setColor(Plot.INK);
        Plot.centred(g, "line: dual-Dirac model    dots: measured    dashed: target", w / 2, h - 12);
        g.dispose();
        return FramePictures.png(img);
    }

    private static void panel(Graphics2D g, int x0, int y0, int pw, int ph, double yLo, double ber, double[] xPs, int from, int to,
                              double originPs, double[] model, double[] measured, String axis) {
        double lo = xPs[from] - originPs;
        double hi = xPs[to - 1] - originPs;
        if (!(hi > lo)) {
            hi = lo + 1;
        }
        g.setColor(Color.WHITE);
        g.fillRect(x0, y0, pw, ph);
        for (double t = 0; t >= yLo; t -= 2) {
            int y = y0 + (int) Math.round(t / yLo * ph);
            g.setColor(Plot.GRID);
            g.drawLine(x0, y, x0 + pw, y);
            g.setColor(Plot.INK);
            Plot.right(g, String.format(Locale.ROOT, "1e%d", (int) t), x0 - 4, y + 4);
        }
        for (double t : Plot.ticks(lo, hi, 5)) {
            int x = x0 + (int) Math.round((t - lo) / (hi - lo) * pw);
            g.setColor(Plot.INK);
            g.drawLine(x, y0 + ph, x, y0 + ph + 4);
            Plot.centred(g, Plot.label(t), x, y0 + ph + 17);
        }
        int yb = y0 + (int) Math.round(Math.log10(ber) / yLo * ph);
        g.setColor(new Color(190, 60, 40));
        g.setStroke(new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, new float[] {6f, 4f}, 0f));
        g.drawLine(x0, yb, x0 + pw, yb);
        g.setStroke(new BasicStroke(2f));
        g.setColor(new Color(30, 96, 170));
        int px = Integer.MIN_VALUE;
        int py = 0;
        for (int i = from; i < to; i++) {
            double v = model[i];
            if (!Double.isFinite(v)) {
                px = Integer.MIN_VALUE;
                continue;
            }
            int x = x0 + (int) Math.round((xPs[i] - originPs - lo) / (hi - lo) * pw);
            int y = y0 + (int) Math.round(Math.max(yLo, Math.min(0, v)) / yLo * ph);
            if (px != Integer.MIN_VALUE) {
                g.drawLine(px, py, x, y);
            }
            px = x;
            py = y;
        }
        g.setColor(new Color(40, 140, 60));
        for (int i = from; i < to; i++) {
            if (measured[i] > 0) {
                int x = x0 + (int) Math.round((xPs[i] - originPs - lo) / (hi - lo) * pw);
                int y = y0 + (int) Math.round(Math.max(yLo, Math.log10(measured[i])) / yLo * ph);
                g.fillOval(x - 2, y - 2, 5, 5);
            }
        }
        g.setStroke(new BasicStroke(1f));
        g.setColor(Plot.INK);
        g.drawRect(x0, y0, pw, ph);
        Plot.centred(g, axis, x0 + pw / 2, y0 + ph + 34);
    }
}
