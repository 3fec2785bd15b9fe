package org.lanesift.plugins.discovery;

import java.util.List;
import org.lanesift.kit.FramePictures;

/**
 * The candidate pictures side by side on one PNG, best on the left, each at most
 * {@link #TILE_PIXELS} pixels wide and high (nearest-neighbour), on a mid-grey background with
 * an eight-pixel gap; the Markdown report lists them in the same order.
 */
final class ContactSheet {
    static final int TILE_PIXELS = 256;
    static final int GAP = 8;
    private static final int BACKGROUND = 0x808080;

    private ContactSheet() {
    }

    static byte[] png(List<PictureCandidate> pics, int max) {
        int n = Math.min(max, pics.size());
        if (n == 0) {
            return FramePictures.png(1, 1, new int[] {BACKGROUND});
        }
        int[] tw = new int[n];
        int[] th = new int[n];
        int width = GAP;
        int height = 0;
        for (int i = 0; i < n; i++) {
            PictureCandidate p = pics.get(i);
            double scale = Math.min(1.0, TILE_PIXELS / (double) Math.max(p.lineLength(), p.lines()));
            tw[i] = Math.max(1, (int) (p.lineLength() * scale));
            th[i] = Math.max(1, (int) (p.lines() * scale));
            width += tw[i] + GAP;
            height = Math.max(height, th[i]);
        }
        height += 2 * GAP;
        int[] rgb = new int[width * height];
        java.util.Arrays.fill(rgb, BACKGROUND);
        int x0 = GAP;
        for (int i = 0; i < n; i++) {
            PictureCandidate p = pics.get(i);
            for (int y = 0; y < th[i]; y++) {
                int sy = (int) ((long) y * p.lines() / th[i]);
                for (int x = 0; x < tw[i]; x++) {
                    int sx = (int) ((long) x * p.lineLength() / tw[i]);
                    rgb[(GAP + y) * width + x0 + x] = p.rgb()[sy * p.lineLength() + sx];
                }
            }
            x0 += tw[i] + GAP;
        }
        return FramePictures.png(width, height, rgb);
    }
}
