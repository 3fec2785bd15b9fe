package org.lanesift.viewer;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import javax.imageio.ImageIO;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.Frame;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.plugin.InputFormatException;

/**
 * Gathers what a running chain hands the host - capture blocks, decoded edges, frames, pictures
 * and annotations - into growable primitive arrays, then builds the {@link ViewModel} once at the
 * end (the min/max pyramids are built there, once per channel). Called on the worker thread only.
 */
public final class Collector implements AnnotationSink {
    private final Map<String, AnalogGrow> analog = new LinkedHashMap<>();
    private final Map<String, LogicGrow> logic = new LinkedHashMap<>();
    private final List<Frame> frames = new ArrayList<>();
    private final List<ViewModel.Picture> pictures = new ArrayList<>();
    private final List<Annotation> notes = new ArrayList<>();
    /** Annotations not yet handed to the UI; the one field shared between threads. */
    private final List<Annotation> fresh = new ArrayList<>();

    /** Creates an empty collector. */
    public Collector() {
    }

    @Override
    public void accept(String source, Annotation a) {
        notes.add(a);
        synchronized (fresh) {
            fresh.add(a);
        }
    }

    /**
     * The annotations that arrived since the last call, for handing to the UI thread in a batch
     * while the chain still runs. Safe from any thread.
     *
     * @return the batch, possibly empty
     */
    public List<Annotation> drainFresh() {
        synchronized (fresh) {
            List<Annotation> out = List.copyOf(fresh);
            fresh.clear();
            return out;
        }
    }

    /**
     * Takes an annotation read back from a file.
     *
     * @param a the annotation
     */
    public void note(Annotation a) {
        notes.add(a);
    }

    /**
     * Takes a block from a tap.
     *
     * @param row   the row name to file it under (a capture channel or a decoded signal)
     * @param block the block
     */
    public void accept(String row, Block block) {
        if (block instanceof AnalogBlock b) {
            analog.computeIfAbsent(row, AnalogGrow::new).add(b);
        } else if (block instanceof Edges e) {
            logic.computeIfAbsent(row, LogicGrow::new).add(e);
        } else if (block instanceof LogicBlock l) {
            logic.computeIfAbsent(row, LogicGrow::new).add(LogicEdges.edgesOf(l));
        } else if (block instanceof Frame f) {
            frames.add(f);
        } else if (block instanceof Artifact a && a.mediaType().equals("image/png") && !a.fileName().contains("-frame-")) {
            // frame pictures are shown from the frames themselves, in the frame pane
            picture(a.fileName(), a.content());
        }
    }

    /**
     * Takes a PNG picture.
     *
     * @param name  its file name
     * @param png   the file's bytes
     */
    public void picture(String name, byte[] png) {
        BufferedImage img;
        try {
            img = ImageIO.read(new ByteArrayInputStream(png));
        } catch (IOException e) {
            throw new InputFormatException(name + ": not a readable PNG picture: " + e.getMessage(), e);
        }
        if (img == null) {
            throw new InputFormatException(name + ": not a readable PNG picture (expected PNG data)");
        }
        pictures.add(new ViewModel.Picture(name, img));
    }

    /**
     * Turns the picture taken last into a decoded frame (a frame read back from a PNG file).
     *
     * @param name    its file name
     * @param index   frame number
     * @param partial whether the capture cut it
     */
    void framePicture(String name, long index, boolean partial) {
        ViewModel.Picture p = pictures.remove(pictures.size() - 1);
        frames.add(OutputFolder.frameOf(name, index, partial, p.image()));
    }

    /**
     * Builds the model; the collector should not be used afterwards.
     *
     * @return the model
     */
    public ViewModel build() {
        List<AnalogTrace> a = new ArrayList<>();
        for (AnalogGrow g : analog.values()) {
            a.add(AnalogTrace.of(g.name, g.startFs, g.periodFs, g.volts, g.length));
        }
        List<LogicTrace> l = new ArrayList<>();
        for (LogicGrow g : logic.values()) {
            l.add(new LogicTrace(g.name, g.startFs, g.endFs, g.initial, g.times, g.count));
        }
        Map<String, List<Annotation>> byTrack = new LinkedHashMap<>();
        for (Annotation n : notes) {
            byTrack.computeIfAbsent(n.track(), k -> new ArrayList<>()).add(n);
        }
        List<NoteTrack> tracks = new ArrayList<>();
        byTrack.forEach((k, v) -> tracks.add(new NoteTrack(k, v)));
        long start = Long.MAX_VALUE;
        long end = Long.MIN_VALUE;
        for (AnalogTrace t : a) {
            start = Math.min(start, t.startFs());
            end = Math.max(end, t.endFs());
        }
        for (LogicTrace t : l) {
            start = Math.min(start, t.startFs());
            end = Math.max(end, t.endFs());
        }
        for (Annotation n : notes) {
            start = Math.min(start, n.startFs());
            end = Math.max(end, n.endFs());
        }
        if (start > end) {
            start = 0;
            end = 1;
        }
        List<Annotation> findings = new ArrayList<>(notes);
        findings.sort(Comparator.comparingLong(Annotation::startFs));
        List<Frame> fr = new ArrayList<>(frames);
        fr.sort(Comparator.comparingLong(Frame::startFs));
        return new ViewModel(RowPlan.plan(a, l, tracks), List.copyOf(fr), List.copyOf(pictures), List.copyOf(findings),
                start, Math.max(end, start + 1));
    }

    /** One analog channel growing block by block (doubling array, no per-sample objects). */
    private static final class AnalogGrow {
        final String name;
        long startFs;
        double periodFs;
        long nextIndex = -1;
        float[] volts = new float[1 << 16];
        int length;

        AnalogGrow(String name) {
            this.name = name;
        }

        void add(AnalogBlock b) {
            if (nextIndex < 0) {
                startFs = b.startFs();
                periodFs = b.periodFs();
                nextIndex = b.firstIndex();
            } else if (b.firstIndex() != nextIndex) {
                throw new IllegalStateException("channel '" + name + "': block at sample " + b.firstIndex()
                        + " does not follow sample " + (nextIndex - 1));
            }
            if ((long) length + b.length() > Integer.MAX_VALUE - 16) {
                throw new InputFormatException("channel '" + name + "': more than " + (Integer.MAX_VALUE - 16)
                        + " samples; the viewer holds a channel in one array (open a shorter span)");
            }
            if (length + b.length() > volts.length) {
                long grown = Math.max((long) length + b.length(), 2L * volts.length);
                volts = java.util.Arrays.copyOf(volts, (int) Math.min(grown, Integer.MAX_VALUE - 16));
            }
            System.arraycopy(b.volts(), 0, volts, length, b.length());
            length += b.length();
            nextIndex += b.length();
        }
    }

    /** One logic signal growing edge list by edge list. */
    private static final class LogicGrow {
        final String name;
        long startFs = Long.MIN_VALUE;
        long endFs;
        boolean initial;
        boolean level;
        long[] times = new long[1024];
        int count;

        LogicGrow(String name) {
            this.name = name;
        }

        void add(Edges e) {
            if (startFs == Long.MIN_VALUE) {
                startFs = e.startFs();
                initial = e.initialLevel();
                level = initial;
            } else if (e.initialLevel() != level && e.count() >= 0) {
                // a level change exactly at the seam between two lists
                push(e.startFs());
            }
            for (int i = 0; i < e.count(); i++) {
                push(e.timesFs()[i]);
            }
            level = e.finalLevel();
            endFs = Math.max(endFs, e.endFs());
        }

        private void push(long t) {
            if (count == times.length) {
                times = java.util.Arrays.copyOf(times, times.length * 2);
            }
            times[count++] = t;
            level = !level;
        }
    }
}
