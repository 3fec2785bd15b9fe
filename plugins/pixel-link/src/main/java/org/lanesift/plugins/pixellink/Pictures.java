package org.lanesift.plugins.pixellink;

import java.util.Arrays;
import java.util.function.Consumer;
import org.lanesift.data.Artifact;
import org.lanesift.kit.FramePictures;
import org.lanesift.data.Frame;
import org.lanesift.plugin.OptionException;

/**
 * Chooses which frames become PNG files: {@code all} frames, only frames that differ from the
 * previous complete one ({@code changed}), or {@code none}, limited to a frame index range; the
 * shared {@link FramePictures} encodes and names them ({@code <id>-frame-NNNN.png}). Partial frames
 * are written only under {@code all}, as {@code <id>-frame-NNNN-partial.png}, never under the
 * complete name.
 */
final class Pictures {
    enum Mode {
        ALL, CHANGED, NONE
    }

    private final String id;
    private final Mode mode;
    private final long first;
    private final long last;
    private final Consumer<Artifact> sink;
    private int[] previous;
    private int prevW;
    private int prevH;

    Pictures(String id, Mode mode, long first, long last, Consumer<Artifact> sink) {
        this.id = id;
        this.mode = mode;
        this.first = first;
        this.last = last;
        this.sink = sink;
    }

    /**
     * Parses {@code pictureRange}: empty for every frame, {@code N} for one frame, {@code N-M} for
     * frames N to M inclusive, {@code N-} for N onwards.
     *
     * @param s the option text
     * @return {first, last}
     */
    static long[] parseRange(String s) {
        String t = s.trim();
        if (t.isEmpty()) {
            return new long[] {0, Long.MAX_VALUE};
        }
        try {
            int dash = t.indexOf('-');
            if (dash < 0) {
                long v = Long.parseLong(t);
                if (v >= 0) {
                    return new long[] {v, v};
                }
            } else {
                long a = Long.parseLong(t.substring(0, dash).trim());
                String rest = t.substring(dash + 1).trim();
                long b = rest.isEmpty() ? Long.MAX_VALUE : Long.parseLong(rest);
                if (a >= 0 && b >= a) {
                    return new long[] {a, b};
                }
            }
        } catch (NumberFormatException e) {
            // fall through
        }
        throw new OptionException("pictureRange", "option 'pictureRange' of plugin 'pixel-link': expected a frame index 'N', "
                + "a range 'N-M' with 0 <= N <= M, 'N-' or empty for every frame, got '" + s + "'");
    }

    void offer(Frame f) {
        if (mode == Mode.NONE) {
            return;
        }
        boolean inRange = f.index() >= first && f.index() <= last;
        if (f.partial()) {
            if (mode == Mode.ALL && inRange) {
                write(f);
            }
            return;
        }
        boolean changed = previous == null || prevW != f.width() || prevH != f.height() || !Arrays.equals(previous, f.rgb());
        previous = f.rgb();
        prevW = f.width();
        prevH = f.height();
        if (inRange && (mode == Mode.ALL || changed)) {
            write(f);
        }
    }

    private void write(Frame f) {
        sink.accept(FramePictures.artifact(id, f));
    }
}
