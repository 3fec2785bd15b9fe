package org.lanesift.viewer;

import java.awt.Color;
import java.awt.Dimension;
import java.awt.Image;
import java.util.List;
import javax.swing.BorderFactory;
import javax.swing.BoxLayout;
import javax.swing.ImageIcon;
import javax.swing.JLabel;
import javax.swing.JPanel;

/**
 * The analysis pane: every picture the stages made (eye diagram, jitter histogram, bathtub
 * curve, edge metrics), one under the other, scaled to the pane's width, each titled with its file
 * name so it can be found in the run's output folder.
 */
public final class PicturesPane extends JPanel {
    private static final long serialVersionUID = 1L;
    private static final int WIDTH_PX = 340;

    /** Creates an empty pane. */
    public PicturesPane() {
        setLayout(new BoxLayout(this, BoxLayout.Y_AXIS));
        setBackground(Palette.PAPER);
    }

    /**
     * Shows pictures.
     *
     * @param pictures the pictures, in order
     */
    public void setPictures(List<ViewModel.Picture> pictures) {
        removeAll();
        if (pictures.isEmpty()) {
            add(new JLabel("no analysis pictures in this run"));
        }
        for (ViewModel.Picture p : pictures) {
            JLabel title = new JLabel(p.name());
            title.setForeground(Palette.CAPTION);
            add(title);
            double s = Math.min(1.0, WIDTH_PX / (double) p.image().getWidth());
            Image img = p.image().getScaledInstance((int) (p.image().getWidth() * s), (int) Math.max(1, p.image().getHeight() * s),
                    Image.SCALE_SMOOTH);
            JLabel pic = new JLabel(new ImageIcon(img));
            pic.setBorder(BorderFactory.createLineBorder(new Color(0xD8D0BF)));
            pic.setMaximumSize(new Dimension(WIDTH_PX + 4, Integer.MAX_VALUE));
            add(pic);
        }
        revalidate();
        repaint();
    }
}
