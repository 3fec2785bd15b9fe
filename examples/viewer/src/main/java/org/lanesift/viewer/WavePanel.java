package org.lanesift.viewer;

import java.awt.Dimension;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.event.KeyAdapter;
import java.awt.event.KeyEvent;
import java.awt.event.MouseAdapter;
import java.awt.event.MouseEvent;
import java.awt.event.MouseWheelEvent;
import javax.swing.JComponent;

/**
 * The waveform area as a Swing component. Mouse: the cursor follows the pointer and every row's
 * caption reads its value there; a click sets the reference mark (the ruler then shows the time
 * difference and its inverse); the wheel zooms around the pointer; shift+wheel scrolls the rows;
 * dragging pans. Keys: left/right pan by an eighth of the width, up/down (or +/-) zoom around the
 * centre, page up/down scroll rows, Home shows everything, M sets the mark at the cursor.
 * All state lives on the UI thread.
 */
public final class WavePanel extends JComponent {
    private static final long serialVersionUID = 1L;

    private transient ViewModel model = ViewModel.empty();
    private final transient Viewport view = new Viewport(0, 1000, 800);
    private final transient WavePainter painter = new WavePainter();
    private int scrollY;
    private double cursorFs = Double.NaN;
    private double markFs = Double.NaN;
    private int dragX = -1;

    /** Creates an empty area. */
    public WavePanel() {
        setFocusable(true);
        setPreferredSize(new Dimension(900, 500));
        MouseAdapter m = new MouseAdapter() {
            @Override
            public void mouseMoved(MouseEvent e) {
                moveCursor(e.getX());
            }

            @Override
            public void mousePressed(MouseEvent e) {
                requestFocusInWindow();
                dragX = e.getX();
            }

            @Override
            public void mouseReleased(MouseEvent e) {
                dragX = -1;
            }

            @Override
            public void mouseClicked(MouseEvent e) {
                if (e.getX() >= WavePainter.CAPTION_PX) {
                    markFs = view.timeOf(e.getX() - WavePainter.CAPTION_PX);
                    repaint();
                }
            }

            @Override
            public void mouseDragged(MouseEvent e) {
                if (dragX >= 0) {
                    view.pan(dragX - e.getX());
                    dragX = e.getX();
                    moveCursor(e.getX());
                }
            }

            @Override
            public void mouseWheelMoved(MouseWheelEvent e) {
                if (e.isShiftDown()) {
                    scrollRows(e.getWheelRotation() * Row.LOGIC_PX * 2);
                } else {
                    view.zoom(Math.pow(1.25, e.getPreciseWheelRotation()), Math.max(0, e.getX() - WavePainter.CAPTION_PX));
                    moveCursor(e.getX());
                }
            }
        };
        addMouseListener(m);
        addMouseMotionListener(m);
        addMouseWheelListener(m);
        addKeyListener(new KeyAdapter() {
            @Override
            public void keyPressed(KeyEvent e) {
                key(e.getKeyCode(), e.getKeyChar());
            }
        });
    }

    /**
     * Shows a model, fitted to its whole span.
     *
     * @param m the model
     */
    public void setModel(ViewModel m) {
        model = m;
        scrollY = 0;
        markFs = Double.NaN;
        fit();
    }

    /**
     * The model shown.
     *
     * @return the model
     */
    public ViewModel model() {
        return model;
    }

    /**
     * The time axis (for reading; change it through the methods here).
     *
     * @return the viewport
     */
    public Viewport viewport() {
        return view;
    }

    /** Shows the whole span of the model. */
    public void fit() {
        track();
        view.show(model.startFs(), model.endFs() - model.startFs());
        repaint();
    }

    /**
     * Shows a span.
     *
     * @param startFs left time, femtoseconds
     * @param spanFs  span, femtoseconds
     */
    public void show(double startFs, double spanFs) {
        track();
        view.show(startFs, spanFs);
        repaint();
    }

    /**
     * Centres a time and puts the cursor on it (the findings list uses it).
     *
     * @param tFs the time, femtoseconds
     */
    public void jumpTo(double tFs) {
        view.centre(tFs);
        cursorFs = tFs;
        repaint();
    }

    /**
     * Sets the cursor.
     *
     * @param tFs time, femtoseconds, or NaN for none
     */
    public void setCursorFs(double tFs) {
        cursorFs = tFs;
        repaint();
    }

    /**
     * Sets the reference mark.
     *
     * @param tFs time, femtoseconds, or NaN for none
     */
    public void setMarkFs(double tFs) {
        markFs = tFs;
        repaint();
    }

    private void moveCursor(int x) {
        if (x >= WavePainter.CAPTION_PX) {
            cursorFs = view.timeOf(x - WavePainter.CAPTION_PX);
        }
        repaint();
    }

    private void scrollRows(int dy) {
        int[] tops = WavePainter.rowTops(model.rows(), 0);
        int most = Math.max(0, tops[tops.length - 1] - getHeight() + Row.LOGIC_PX);
        scrollY = Math.max(0, Math.min(most, scrollY + dy));
        repaint();
    }

    void key(int code, char ch) {
        int w = view.widthPx();
        switch (code) {
            case KeyEvent.VK_LEFT -> view.pan(-w / 8.0);
            case KeyEvent.VK_RIGHT -> view.pan(w / 8.0);
            case KeyEvent.VK_UP, KeyEvent.VK_ADD, KeyEvent.VK_EQUALS -> view.zoom(0.5, w / 2.0);
            case KeyEvent.VK_DOWN, KeyEvent.VK_SUBTRACT, KeyEvent.VK_MINUS -> view.zoom(2.0, w / 2.0);
            case KeyEvent.VK_PAGE_UP -> scrollRows(-getHeight() / 2);
            case KeyEvent.VK_PAGE_DOWN -> scrollRows(getHeight() / 2);
            case KeyEvent.VK_HOME -> fit();
            case KeyEvent.VK_M -> markFs = cursorFs;
            default -> {
                if (ch == '+') {
                    view.zoom(0.5, w / 2.0);
                } else if (ch == '-') {
                    view.zoom(2.0, w / 2.0);
                }
            }
        }
        repaint();
    }

    /** Follows the component's width, keeping the time span shown (a wider window shows the same span finer). */
    private void track() {
        int w = Math.max(1, getWidth() - WavePainter.CAPTION_PX);
        if (w != view.widthPx()) {
            double span = view.spanFs();
            view.resize(w);
            view.show(view.leftFs(), span);
        }
    }

    @Override
    protected void paintComponent(Graphics g) {
        track();
        painter.paint((Graphics2D) g, model, view, getHeight(), scrollY, cursorFs, markFs);
    }
}
