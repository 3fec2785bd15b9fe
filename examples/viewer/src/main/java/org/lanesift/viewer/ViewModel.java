package org.lanesift.viewer;

import java.awt.image.BufferedImage;
import java.util.List;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Frame;

/**
 * Everything one run (or one output folder) gives the screen, immutable once built: the rows,
 * the decoded frames, the analysis pictures and the findings. Built on the worker thread, handed
 * to the UI thread whole.
 *
 * @param rows     waveform rows, top to bottom
 * @param frames   decoded frames in time order
 * @param pictures analysis pictures (eye, jitter, bathtub, ...) in arrival order
 * @param findings every annotation, by time
 * @param startFs  earliest time of any row, femtoseconds
 * @param endFs    latest time of any row, femtoseconds
 */
public record ViewModel(List<Row> rows, List<Frame> frames, List<Picture> pictures, List<Annotation> findings,
                        long startFs, long endFs) {

    /**
     * A picture a stage produced as a PNG artifact, decoded.
     *
     * @param name  the artifact's file name
     * @param image the decoded picture
     */
    public record Picture(String name, BufferedImage image) {
    }

    /**
     * A model with nothing in it.
     *
     * @return the empty model
     */
    public static ViewModel empty() {
        return new ViewModel(List.of(), List.of(), List.of(), List.of(), 0, 1);
    }
}
