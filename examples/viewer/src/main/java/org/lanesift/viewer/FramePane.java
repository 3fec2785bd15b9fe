package org.lanesift.viewer;

import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Dimension;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.util.List;
import java.util.function.DoubleConsumer;
import javax.swing.JButton;
import javax.swing.JComponent;
import javax.swing.JLabel;
import javax.swing.JPanel;
import org.lanesift.data.Frame;
import org.lanesift.time.Femtos;

/**
 * The picture pane: one decoded frame at a time, scaled to fit with whole pixels kept sharp, a
 * line saying which frame it is and when, and buttons to step through the frames; "go to" moves
 * the waveform to the frame's start. The last complete frame is shown first.
 */
public final class FramePane extends JPanel {
    private static final long serialVersionUID = 1L;

    private transient List<Frame> frames = List.of();
    private int shown = -1;
    private transient BufferedImage image;
    private final JLabel caption = new JLabel("no decoded frame");
    private final Picture picture = new Picture();
    private final transient DoubleConsumer goTo;

    /**
     * A pane.
     *
     * @param goTo told the start time of the frame, femtoseconds, when the user asks to go to it
     */
    public FramePane(DoubleConsumer goTo) {
        super(new BorderLayout());
        this.goTo = goTo;
        JPanel bar = new JPanel();
        JButton prev = new JButton("\u25c0");
        JButton next = new JButton("\u25b6");
        JButton go = new JButton("go to");
        prev.addActionListener(e -> show(shown - 1));
        next.addActionListener(e -> show(shown + 1));
        go.addActionListener(e -> {
            if (shown >= 0) {
                this.goTo.accept(frames.get(shown).startFs());
            }
        });
        bar.add(prev);
        bar.add(next);
        bar.add(go);
        add(caption, BorderLayout.NORTH);
        add(picture, BorderLayout.CENTER);
        add(bar, BorderLayout.SOUTH);
        setPreferredSize(new Dimension(360, 300));
    }

    /**
     * Shows the frames of a run.
     *
     * @param all frames in time order
     */
    public void setFrames(List<Frame> all) {
        frames = all;
        int pick = all.size() - 1;
        for (int i = all.size() - 1; i >= 0; i--) {
            if (!all.get(i).partial()) {
                pick = i;
                break;
            }
        }
        show(pick);
    }

    /**
     * Where the picture is drawn, in this pane's coordinates.
     *
     * @return the picture component
     */
    public JComponent pictureArea() {
        return picture;
    }

    private void show(int i) {
        if (frames.isEmpty()) {
            shown = -1;
            image = null;
            caption.setText("no decoded frame");
            repaint();
            return;
        }
        shown = Math.max(0, Math.min(frames.size() - 1, i));
        Frame f = frames.get(shown);
        image = toImage(f);
        caption.setText("frame " + f.index() + " (" + (shown + 1) + " of " + frames.size() + ")  " + f.width() + "x" + f.height()
                + "  at " + Femtos.format(f.startFs()) + (f.partial() ? "  partial" : "") + (f.suspect() ? "  suspect bits" : ""));
        repaint();
    }

    /**
     * A frame as a picture.
     *
     * @param f the frame
     * @return an RGB image of its size
     */
    public static BufferedImage toImage(Frame f) {
        BufferedImage img = new BufferedImage(f.width(), f.height(), BufferedImage.TYPE_INT_RGB);
        img.setRGB(0, 0, f.width(), f.height(), f.rgb(), 0, f.width());
        return img;
    }

    /**
     * Where the frame is drawn inside {@link #pictureArea()}, or null when none is shown.
     *
     * @return the rectangle, pixels
     */
    public java.awt.Rectangle drawnPicture() {
        if (image == null) {
            return null;
        }
        double s = Math.min((picture.getWidth() - 8) / (double) image.getWidth(), (picture.getHeight() - 8) / (double) image.getHeight());
        int w = (int) Math.max(1, image.getWidth() * s);
        int h = (int) Math.max(1, image.getHeight() * s);
        return new java.awt.Rectangle((picture.getWidth() - w) / 2, (picture.getHeight() - h) / 2, w, h);
    }

    /**
     * The frame shown.
     *
     * @return the frame, or null
     */
    public Frame shownFrame() {
        return shown < 0 ? null : frames.get(shown);
    }

    /** Draws the picture scaled to fit, nearest neighbour. */
    private final class Picture extends JComponent {
        private static final long serialVersionUID = 1L;

        @Override
        protected void paintComponent(Graphics g0) {
            Graphics2D g = (Graphics2D) g0;
            g.setColor(new Color(0x2F3B45));
            g.fillRect(0, 0, getWidth(), getHeight());
            java.awt.Rectangle r = drawnPicture();
            if (r == null) {
                return;
            }
            g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
            g.drawImage(image, r.x, r.y, r.width, r.height, null);
        }
    }
}
