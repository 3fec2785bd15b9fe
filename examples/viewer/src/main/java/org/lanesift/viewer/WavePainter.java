package org.lanesift.viewer;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.RenderingHints;
import java.util.List;

/**
 * Draws the waveform area - time ruler, caption column, channel, logic and note rows, cursor and
 * mark - onto any {@link Graphics2D}: the window's component and the headless snapshot use this
 * one painter, so they show the same picture. Every row costs O(columns) steps (O(columns x log n)
 * with the pyramid and the edge search), never O(samples).
 */
public final class WavePainter {
    /** Width of the caption column at the left, pixels. */
    public static final int CAPTION_PX = 150;
    /** Height of the time ruler at the top, pixels. */
    public static final int RULER_PX = 26;
    /** Font of captions, ruler and labels. */
    public static final Font FONT = new Font(Font.SANS_SERIF, Font.PLAIN, 11);

    private final float[] range = new float[2];

    /** Creates a painter (it keeps one scratch pair, so use one per thread). */
    public WavePainter() {
    }

    /**
     * The y of each row's top edge, below the ruler, with a vertical scroll applied.
     *
     * @param rows    the rows
     * @param scrollY pixels scrolled down
     * @return one top per row, plus the bottom of the last row at the end
     */
    public static int[] rowTops(List<Row> rows, int scrollY) {
        int[] y = new int[rows.size() + 1];
        int at = RULER_PX - scrollY;
        for (int i = 0; i < rows.size(); i++) {
            y[i] = at;
            at += rows.get(i).heightPx();
        }
        y[rows.size()] = at;
        return y;
    }

    /**
     * Paints the area.
     *
     * @param g        where
     * @param model    what
     * @param view     the time axis (its width is the plot width, without the caption column)
     * @param heightPx height of the area, pixels
     * @param scrollY  rows scrolled up by this many pixels
     * @param cursorFs cursor time, femtoseconds, or NaN
     * @param markFs   reference mark, femtoseconds, or NaN
     */
    public void paint(Graphics2D g, ViewModel model, Viewport view, int heightPx, int scrollY, double cursorFs, double markFs) {
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setFont(FONT);
        int w = view.widthPx();
        g.setColor(Palette.PAPER);
        g.fillRect(0, 0, CAPTION_PX + w, heightPx);
        List<Row> rows = model.rows();
        int[] tops = rowTops(rows, scrollY);
        String group = null;
        boolean band = false;
        for (int i = 0; i < rows.size(); i++) {
            Row r = rows.get(i);
            String g0 = r.owner() == null ? r.name() : r.owner();
            if (!g0.equals(group)) {
                band = !band;
                group = g0;
            }
            int top = tops[i];
            int h = r.heightPx();
            if (top + h < RULER_PX || top > heightPx) {
                continue;
            }
            Graphics2D rg = (Graphics2D) g.create(0, top, CAPTION_PX + w, h);
            rg.clip(new Rectangle(0, Math.max(0, RULER_PX - top), CAPTION_PX + w, h));
            if (band) {
                rg.setColor(Palette.BAND);
                rg.fillRect(CAPTION_PX, 0, w, h);
            }
            Graphics2D plot = (Graphics2D) rg.create(CAPTION_PX, 0, w, h);
            if (r.analog() != null) {
                analog(plot, r.analog(), view, h);
            } else if (r.logic() != null) {
                logic(plot, r.logic(), view, h);
            } else {
                notes(plot, r, view);
            }
            plot.dispose();
            caption(rg, r, h, cursorFs);
            rg.setColor(Palette.GRID);
            rg.drawLine(CAPTION_PX, h - 1, CAPTION_PX + w, h - 1);
            rg.dispose();
        }
        ruler(g, view, cursorFs, markFs);
        Graphics2D over = (Graphics2D) g.create(CAPTION_PX, RULER_PX, w, Math.max(0, heightPx - RULER_PX));
        line(over, view, markFs, Palette.MARK, heightPx, true);
        line(over, view, cursorFs, Palette.CURSOR, heightPx, false);
        over.dispose();
    }

    private static void line(Graphics2D g, Viewport view, double tFs, Color c, int h, boolean dashed) {
        if (Double.isNaN(tFs)) {
            return;
        }
        int x = (int) Math.floor(view.xOf(tFs));
        if (x < 0 || x >= view.widthPx()) {
            return;
        }
        g.setColor(c);
        if (dashed) {
            g.setStroke(new BasicStroke(1f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 1f, new float[] {4f, 3f}, 0f));
        }
        g.drawLine(x, 0, x, h);
    }

    private void caption(Graphics2D g, Row r, int h, double cursorFs) {
        g.setColor(Palette.CAPTION);
        g.fillRect(0, 0, CAPTION_PX, h);
        g.setColor(Palette.CAPTION_TEXT);
        int indent = r.owner() == null ? 6 : 16;
        FontMetrics fm = g.getFontMetrics();
        String name = NoteLayout.fit(r.name(), CAPTION_PX - indent - 4, fm::stringWidth);
        g.drawString(name == null ? "" : name, indent, Math.min(h - 3, fm.getAscent() + 2));
        if (!Double.isNaN(cursorFs) && h >= 2 * fm.getHeight()) {
            String v = NoteLayout.fit(Readout.valueOf(r, cursorFs), CAPTION_PX - indent - 4, fm::stringWidth);
            g.setColor(new Color(0xF2C14E));
            g.drawString(v == null ? "" : v, indent, fm.getAscent() + 2 + fm.getHeight());
        }
    }

    private void analog(Graphics2D g, AnalogTrace t, Viewport view, int h) {
        if (t.length() == 0) {
            return;
        }
        t.pyramid().range(0, t.length(), range);
        double lo = range[0];
        double hi = range[1];
        double pad = Math.max(1e-6, (hi - lo) * 0.08);
        lo -= pad;
        hi += pad;
        double scale = (h - 4) / (hi - lo);
        double top = hi;
        g.setColor(Palette.GRID);
        if (lo < 0 && hi > 0) {
            int y0 = (int) Math.round(2 + (top - 0) * scale);
            g.drawLine(0, y0, view.widthPx(), y0);
        }
        g.setColor(Palette.TRACE);
        double samplesPerPx = view.fsPerPx() / t.periodFs();
        int w = view.widthPx();
        grow(w + 4);
        if (samplesPerPx >= 1.0) {
            // the envelope as one polygon: maxima left to right, minima right to left; at coarse
            // zoom each column reads whole elements of one pyramid level, in memory order
            int level = t.pyramid().levelFor(samplesPerPx);
            int n = 0;
            for (int x = 0; x < w; x++) {
                long i0 = (long) Math.ceil((view.timeOf(x) - t.startFs()) / t.periodFs());
                long i1 = (long) Math.ceil((view.timeOf(x + 1) - t.startFs()) / t.periodFs());
                i0 = Math.max(0, i0 - 1); // joins this column to the last sample of the one before
                i1 = Math.min(t.length(), i1);
                if (i1 <= i0) {
                    continue;
                }
                if (level >= 0) {
                    t.pyramid().column((int) i0, (int) i1, level, range);
                } else {
                    t.pyramid().range((int) i0, (int) i1, range);
                }
                xs[n] = x;
                ysHi[n] = (int) Math.round(2 + (top - range[1]) * scale);
                ysLo[n] = (int) Math.round(2 + (top - range[0]) * scale);
                n++;
            }
            if (n == 0) {
                return;
            }
            g.drawPolyline(xs, ysHi, n);
            g.drawPolyline(xs, ysLo, n);
            for (int k = 0; k < n; k++) {
                polyX[k] = xs[k];
                polyY[k] = ysHi[k];
                polyX[2 * n - 1 - k] = xs[k];
                polyY[2 * n - 1 - k] = ysLo[k] + 1;
            }
            g.fillPolygon(polyX, polyY, 2 * n);
        } else {
            int first = Math.max(0, t.indexAt(view.leftFs()) - 1);
            int last = Math.min(t.length() - 1, t.indexAt(view.rightFs()) + 1);
            int n = 0;
            boolean dots = samplesPerPx < 0.2;
            for (int i = first; i <= last; i++) {
                xs[n] = (int) Math.round(view.xOf(t.startFs() + i * t.periodFs()));
                ysHi[n] = (int) Math.round(2 + (top - t.volts()[i]) * scale);
                if (dots) {
                    g.fillRect(xs[n] - 1, ysHi[n] - 1, 3, 3);
                }
                n++;
            }
            g.drawPolyline(xs, ysHi, n);
        }
    }

    /** Scratch coordinate arrays, grown to the widest view seen; no allocation per repaint. */
    private int[] xs = new int[0];
    private int[] ysHi = new int[0];
    private int[] ysLo = new int[0];
    private int[] polyX = new int[0];
    private int[] polyY = new int[0];

    private void grow(int n) {
        if (xs.length < n) {
            xs = new int[n];
            ysHi = new int[n];
            ysLo = new int[n];
            polyX = new int[2 * n];
            polyY = new int[2 * n];
        }
    }

    private static void logic(Graphics2D g, LogicTrace t, Viewport view, int h) {
        int yHi = 4;
        int yLo = h - 5;
        g.setColor(Palette.LOGIC);
        int w = view.widthPx();
        int xs = (int) Math.max(0, Math.floor(view.xOf(t.startFs())));
        int xe = (int) Math.min(w, Math.ceil(view.xOf(t.endFs())));
        if (xe <= xs) {
            return;
        }
        int before = t.edgesAtOrBefore(view.timeOf(xs) - 1);
        boolean level = ((before & 1) == 1) != t.initialLevel();
        int runStart = xs;
        for (int x = xs; x < xe; x++) {
            int after = t.edgesAtOrBefore(view.timeOf(x + 1) - 1);
            int n = after - before;
            if (n > 0) {
                g.drawLine(runStart, level ? yHi : yLo, x, level ? yHi : yLo);
                if (n > 1) {
                    g.fillRect(x, yHi, 1, yLo - yHi + 1); // several edges in one column
                } else {
                    g.drawLine(x, yHi, x, yLo);
                }
                level = ((after & 1) == 1) != t.initialLevel();
                runStart = x;
                before = after;
            }
        }
        g.drawLine(runStart, level ? yHi : yLo, xe - 1, level ? yHi : yLo);
    }

    private static void notes(Graphics2D g, Row r, Viewport view) {
        FontMetrics fm = g.getFontMetrics();
        for (NoteLayout.Placed p : NoteLayout.layout(r.notes(), view, fm::stringWidth, r.lanes())) {
            int y = 1 + p.lane() * Row.LANE_PX;
            int x0 = Math.max(-2, p.x0());
            int x1 = Math.min(view.widthPx() + 2, p.x1());
            var sev = p.note().severity();
            if (p.crowded()) {
                g.setColor(Palette.edge(sev));
                g.drawLine(x0, y + Row.LANE_PX - 4, x0, y + Row.LANE_PX - 2);
                continue;
            }
            g.setColor(Palette.fill(sev));
            g.fillRoundRect(x0, y, Math.max(1, x1 - x0), Row.LANE_PX - 2, 6, 6);
            g.setColor(Palette.edge(sev));
            g.drawRoundRect(x0, y, Math.max(1, x1 - x0 - 1), Row.LANE_PX - 3, 6, 6);
            if (p.label() != null) {
                g.setColor(Palette.NOTE_TEXT);
                g.drawString(p.label(), x0 + NoteLayout.PAD_PX + 1, y + fm.getAscent() + 1);
            }
        }
    }

    private static void ruler(Graphics2D g, Viewport view, double cursorFs, double markFs) {
        int w = view.widthPx();
        g.setColor(Palette.CAPTION);
        g.fillRect(0, 0, CAPTION_PX + w, RULER_PX);
        g.setColor(Palette.CAPTION_TEXT);
        FontMetrics fm = g.getFontMetrics();
        double step = tickStep(view.spanFs() / Math.max(1, w / 110));
        String head = Double.isNaN(cursorFs) ? "" : Readout.timeLine(cursorFs, markFs, view.fsPerPx());
        g.drawString(NoteLayout.fit("t0 " + Readout.time(view.leftFs(), step), CAPTION_PX - 8, fm::stringWidth), 6, 12);
        double first = Math.ceil(view.leftFs() / step) * step;
        for (double t = first; t < view.rightFs(); t += step) {
            int x = CAPTION_PX + (int) Math.round(view.xOf(t));
            g.drawLine(x, RULER_PX - 7, x, RULER_PX);
            g.drawString(Readout.time(t, step), x + 3, RULER_PX - 6);
        }
        if (!head.isEmpty()) {
            int tw = fm.stringWidth(head);
            g.setColor(Palette.CAPTION);
            g.fillRect(CAPTION_PX + w - tw - 12, 0, tw + 12, 13);
            g.setColor(new Color(0xF2C14E));
            g.drawString(head, CAPTION_PX + w - tw - 6, 11);
        }
    }

    /**
     * A ruler step of 1, 2 or 5 times a power of ten at or above a wanted step.
     *
     * @param wantFs the wanted step, femtoseconds
     * @return the step, femtoseconds
     */
    static double tickStep(double wantFs) {
        double p = Math.pow(10, Math.floor(Math.log10(Math.max(1, wantFs))));
        for (double m : new double[] {1, 2, 5, 10}) {
            if (m * p >= wantFs) {
                return m * p;
            }
        }
        return 10 * p;
    }
}
