package org.lanesift.bench;

import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.lanesift.viewer.AnalogTrace;
import org.lanesift.viewer.MinMaxPyramid;
import org.lanesift.viewer.RowPlan;
import org.lanesift.viewer.ViewModel;
import org.lanesift.viewer.Viewport;
import org.lanesift.viewer.WavePainter;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Repaint of the viewer's waveform area (1600 x 506 pixels, 8 analog rows) over a capture of 8
 * channels x {@code samples} samples at 2.5 GS/s (noisy two-level data), at three zooms: the whole
 * capture, a thousandth of it (tens of samples a column) and sample level (a third of a sample a
 * column). Milliseconds per repaint. The baseline reads every sample of the 8 channels once: what
 * any repaint that touches every sample would cost at least. {@code buildPyramid} is the one-time
 * cost of one channel's min/max pyramid.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(value = 1, jvmArgsAppend = {"-Xmx4g", "-Djava.awt.headless=true"})
public class ViewerRepaintBench {
    static final int CHANNELS = 8;
    static final int WIDTH_PX = 1600;
    static final double PERIOD_FS = 400_000; // 2.5 GS/s

    @Param({"50000000"})
    int samples;

    @Param({"full", "mid", "sample"})
    String zoom;

    float[][] volts;
    ViewModel model;
    Viewport view;
    BufferedImage image;
    Graphics2D g;
    final WavePainter painter = new WavePainter();

    @Setup
    public void setup() {
        volts = new float[CHANNELS][samples];
        List<AnalogTrace> traces = new ArrayList<>();
        long x = 0x9E3779B97F4A7C15L;
        for (int c = 0; c < CHANNELS; c++) {
            float[] v = volts[c];
            boolean level = false;
            for (int i = 0; i < samples; i++) {
                x ^= x << 13;
                x ^= x >>> 7;
                x ^= x << 17;
                if ((i & 7) == 0 && (x & 3) == 0) {
                    level = !level; // a bit every 8 samples, changing at random
                }
                v[i] = (level ? 1.4f : 1.0f) + ((x >>> 40) & 0xFF) * 1e-4f;
            }
            traces.add(AnalogTrace.of("CH" + c, 0, PERIOD_FS, v, samples));
        }
        long endFs = Math.round(samples * PERIOD_FS);
        model = new ViewModel(RowPlan.plan(traces, List.of(), List.of()), List.of(), List.of(), List.of(), 0, endFs);
        int plot = WIDTH_PX - WavePainter.CAPTION_PX;
        double span = switch (zoom) {
            case "full" -> endFs;
            case "mid" -> endFs / 1000.0;
            default -> plot * PERIOD_FS / 3.0;
        };
        view = new Viewport(0, 1, plot);
        view.show(endFs / 2.0 - span / 2, span);
        image = new BufferedImage(WIDTH_PX, WavePainter.RULER_PX + CHANNELS * 60, BufferedImage.TYPE_INT_RGB);
        g = image.createGraphics();
    }

    @TearDown(Level.Trial)
    public void tearDown() {
        g.dispose();
    }

    /** Baseline: one sequential pass over every sample of the 8 channels. */
    @Benchmark
    public float sequentialReadAllSamples() {
        float s = 0;
        for (float[] v : volts) {
            for (float f : v) {
                s += f;
            }
        }
        return s;
    }

    /** One repaint of the waveform area, cursor at the centre. */
    @Benchmark
    public int repaint() {
        painter.paint(g, model, view, image.getHeight(), 0, view.timeOf(view.widthPx() / 2.0), Double.NaN);
        return image.getRGB(WIDTH_PX / 2, 40);
    }

    /** The one-time cost: the min/max pyramid of one channel. */
    @Benchmark
    public int buildPyramid() {
        return MinMaxPyramid.build(volts[0], samples).length();
    }
}
