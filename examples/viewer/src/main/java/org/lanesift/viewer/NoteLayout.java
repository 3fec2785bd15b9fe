package org.lanesift.viewer;

import java.util.ArrayList;
import java.util.List;
import java.util.function.ToIntFunction;
import org.lanesift.annotation.Annotation;

/**
 * Places the annotations of one track that touch the viewport into stacked lanes of one row, so
 * that no two boxes in a lane overlap (one free column between them), and fits each label inside
 * its box, cut with an ellipsis when it is too long, or left out when not even two characters fit.
 * An annotation that finds no free lane among {@code maxLanes} is counted as crowded and drawn as
 * a thin mark on the last lane; the row's caption says how many.
 *
 * <p>Cost: a binary search plus the annotations in view; no per-annotation state is kept between
 * repaints.
 */
public final class NoteLayout {
    /** Pixels of padding either side of a label inside its box. */
    public static final int PAD_PX = 2;

    private NoteLayout() {
    }

    /**
     * One annotation as drawn.
     *
     * @param note  the annotation
     * @param x0    left column, pixels (inclusive; may be negative when it starts left of the view)
     * @param x1    right column, pixels (exclusive; at least {@code x0 + 1})
     * @param lane  lane from 0 (top)
     * @param label the text drawn inside the box, or null
     * @param crowded true if it found no free lane and is only a mark on the last lane
     */
    public record Placed(Annotation note, int x0, int x1, int lane, String label, boolean crowded) {
    }

    /**
     * Lays out one track.
     *
     * @param track      the annotations
     * @param view       the time axis
     * @param textWidth  width of a text in pixels, as the font will draw it
     * @param maxLanes   lanes available in the row, at least 1
     * @return the annotations in view, in start order
     */
    public static List<Placed> layout(NoteTrack track, Viewport view, ToIntFunction<String> textWidth, int maxLanes) {
        List<Placed> out = new ArrayList<>();
        List<Annotation> notes = track.notes();
        double left = view.leftFs();
        double right = view.rightFs();
        int[] laneEnd = new int[Math.max(1, maxLanes)];
        java.util.Arrays.fill(laneEnd, Integer.MIN_VALUE);
        for (int i = track.firstReaching(left); i < notes.size(); i++) {
            Annotation a = notes.get(i);
            if (a.startFs() > right) {
                break;
            }
            if (a.endFs() < left) {
                continue;
            }
            int x0 = (int) Math.floor(clampPx(view.xOf(a.startFs())));
            int x1 = Math.max(x0 + 1, (int) Math.ceil(clampPx(view.xOf(a.endFs()))));
            int lane = -1;
            for (int k = 0; k < laneEnd.length; k++) {
                if (laneEnd[k] < x0) {
                    lane = k;
                    break;
                }
            }
            boolean crowded = lane < 0;
            if (crowded) {
                lane = laneEnd.length - 1;
            } else {
                laneEnd[lane] = x1;
            }
            String label = crowded ? null : fit(a.label(), x1 - x0 - 2 * PAD_PX, textWidth);
            out.add(new Placed(a, x0, x1, lane, label, crowded));
        }
        return out;
    }

    /** Keeps far-off columns inside int range; the painter clips anyway. */
    private static double clampPx(double x) {
        return Math.max(-1e6, Math.min(1e6, x));
    }

    /**
     * The longest form of a label that fits a width: whole, or cut with an ellipsis.
     *
     * @param label     the label
     * @param widthPx   room, pixels
     * @param textWidth text measure
     * @return the text, or null when fewer than two characters fit
     */
    static String fit(String label, int widthPx, ToIntFunction<String> textWidth) {
        if (label == null || label.isEmpty() || widthPx <= 0) {
            return null;
        }
        if (textWidth.applyAsInt(label) <= widthPx) {
            return label;
        }
        int lo = 0;
        int hi = label.length();
        while (lo < hi) {
            int mid = (lo + hi + 1) >>> 1;
            if (textWidth.applyAsInt(label.substring(0, mid) + "\u2026") <= widthPx) {
                lo = mid;
            } else {
                hi = mid - 1;
            }
        }
        return lo >= 2 ? label.substring(0, lo) + "\u2026" : null;
    }
}
