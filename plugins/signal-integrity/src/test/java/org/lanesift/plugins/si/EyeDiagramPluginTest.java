package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import javax.imageio.ImageIO;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionException;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

class EyeDiagramPluginTest {
    static final double UI_FS = 1e6; // 1 ns, 1 Gbit/s
    static final double RATE = 39.71234e9; // not a multiple of the bit rate, so the phases fill the UI

    static String jsonOf(StageHarness h, String suffix) {
        for (Artifact a : h.outputs("files", Artifact.class)) {
            if (a.fileName().endsWith(suffix)) {
                return new String(a.content(), StandardCharsets.UTF_8);
            }
        }
        throw new AssertionError("no artifact *" + suffix);
    }

    /** The first member {@code key} of the report (null is NaN), read with the JSON reader. */
    static double num(String json, String key) {
        return org.lanesift.testkit.JsonScan.number(org.lanesift.testkit.JsonScan.parse("report", json), key);
    }

    static StageHarness run(AnalogBlock sig, Map<String, Object> opts) {
        StageHarness h = StageHarness.of(new EyeDiagramPlugin(), opts);
        h.push("signal", sig).finish();
        return h;
    }

    @Test
    void heightOfASyntheticEyeWithBoundedNoise() {
        // +/-200 mV rails with uniform noise of +/-20 mV: the opening at mid-UI is exactly 2 * (200 - 20) = 360 mV.
        // Uniform noise of half-width a has sd a / sqrt(3), so the 3-sigma height is 400 - 2 * 3 * 20 / sqrt(3) = 330.7 mV.
        AnalogBlock sig = SynthSignals.nrz(20_000, UI_FS, RATE, 0.2, 200e3, 0, 0.020, 1);
        StageHarness h = run(sig, Map.of("bitRateHz", 1e9));
        String j = jsonOf(h, "-eye.json");
        double bin = num(j, "binMv");
        assertEquals(360, num(j, "eyeHeightMv"), 2 * bin, j);
        assertEquals(330.7, num(j, "eyeHeight3SigmaMv"), 2 * bin + 2, j);
        assertEquals(200, num(j, "highLevelMv"), 3);
        assertEquals(-200, num(j, "lowLevelMv"), 3);
        // noise of +/-20 mV on a 2 mV/ps ramp moves the crossing by +/-10 ps: width 1000 - 20 = 980 ps
        assertEquals(980, num(j, "eyeWidthPs"), 2 * num(j, "binPs"), j);
        for (Artifact a : h.outputs("files", Artifact.class)) {
            SynthSignals.save(a);
        }
        List<Annotation> ann = h.annotations("eye-opening");
        assertEquals(1, ann.size());
        assertEquals(num(j, "eyeHeightMv"), ann.get(0).fields().get("eyeHeightMv").asDouble(), 1e-3);
    }

    @Test
    void widthOfASyntheticEyeWithBoundedJitter() {
        // edges moved by uniform jitter of +/-50 ps, no noise: the crossing spreads over 100 ps, width 900 ps
        AnalogBlock sig = SynthSignals.nrz(20_000, UI_FS, RATE, 0.2, 200e3, 50e3, 0, 2);
        StageHarness h = run(sig, Map.of("bitRateHz", 1e9, "uiCount", 1));
        String j = jsonOf(h, "-eye.json");
        assertEquals(900, num(j, "eyeWidthPs"), 2 * num(j, "binPs") + 1, j);
        assertEquals(400, num(j, "eyeHeightMv"), 2 * num(j, "binMv"), j);
    }

    @Test
    void foldingOnAClockGivesTheSameEyeAsTheBitRate() {
        AnalogBlock sig = SynthSignals.nrz(5_000, UI_FS, RATE, 0.2, 200e3, 0, 0.020, 3);
        // a DDR-style clock: one edge per UI at the bit boundaries
        long[] t = new long[5_000];
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.round(i * UI_FS);
        }
        Edges clk = Edges.of("clk", 0, Math.round(5_000 * UI_FS), false, t);
        StageHarness h = StageHarness.of(new EyeDiagramPlugin(), Map.of("clockEdge", "both"));
        h.push("clock", clk).push("signal", sig).finish();
        String j = jsonOf(h, "-eye.json");
        assertEquals(1000, num(j, "uiPs"), 1e-6);
        assertEquals(360, num(j, "eyeHeightMv"), 2 * num(j, "binMv"), j);
        assertEquals(980, num(j, "eyeWidthPs"), 2 * num(j, "binPs"), j);
    }

    @Test
    void theTransitionEndingAnUnknownClockStartIsNoClockEdge() {
        // the clock is unknown over [0, 300 ps); the transition at 300 ps only restores its level
        // (Edges.levelOnly): folded on, it would shift the unit interval and the eye
        AnalogBlock sig = SynthSignals.nrz(5_000, UI_FS, RATE, 0.2, 200e3, 0, 0.020, 3);
        long[] t = new long[5_000];
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.round(i * UI_FS);
        }
        t[0] = 300_000;
        Edges clk = new Edges("clk", 0, Math.round(5_000 * UI_FS), false, t, t.length, new long[] {0, 300_000}, 1);
        StageHarness h = StageHarness.of(new EyeDiagramPlugin(), Map.of("clockEdge", "both"));
        h.push("clock", clk).push("signal", sig).finish();
        String j = jsonOf(h, "-eye.json");
        assertEquals(4_999, num(j, "clockEdges"), j);
        assertEquals(1000, num(j, "uiPs"), 1e-6, j);
    }

    @Test
    void clockArrivingAfterTheSignalIsWaitedFor() {
        AnalogBlock sig = SynthSignals.nrz(2_000, UI_FS, RATE, 0.2, 200e3, 0, 0.0, 4);
        long[] t = new long[1_000];
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.round(2 * i * UI_FS);
        }
        Edges clk = Edges.of("clk", 0, Math.round(2_000 * UI_FS), false, t);
        StageHarness h = StageHarness.of(new EyeDiagramPlugin(), Map.of("clockEdge", "both", "uiPerClockInterval", 2));
        for (AnalogBlock b : Synth.split(sig, 7_000, 13_001)) {
            h.push("signal", b);
        }
        h.push("clock", clk).finish();
        String j = jsonOf(h, "-eye.json");
        assertEquals(400, num(j, "eyeHeightMv"), 2 * num(j, "binMv"), j);
        assertEquals(1000, num(j, "clockEdges"));
    }

    @Test
    void interleavedClockAndSignalBlocksGiveTheSameEye() {
        AnalogBlock sig = SynthSignals.nrz(3_000, UI_FS, RATE, 0.2, 200e3, 10e3, 0.01, 8);
        long[] t = new long[3_000];
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.round(i * UI_FS);
        }
        Edges clk = Edges.of("clk", 0, Math.round(3_000 * UI_FS), false, t);
        Map<String, Object> o = Map.of("clockEdge", "both", "uiCount", 1);
        StageHarness one = StageHarness.of(new EyeDiagramPlugin(), o);
        one.push("clock", clk).push("signal", sig).finish();
        StageHarness many = StageHarness.of(new EyeDiagramPlugin(), o);
        List<AnalogBlock> sb = Synth.split(sig, 10_000);
        List<Edges> cb = Synth.split(clk, Math.round(500 * UI_FS), Math.round(1000 * UI_FS), Math.round(2000 * UI_FS));
        int k = 0;
        for (AnalogBlock b : sb) {
            while (k < cb.size() && cb.get(k).startFs() <= b.startFs()) {
                many.push("clock", cb.get(k++));
            }
            many.push("signal", b);
        }
        while (k < cb.size()) {
            many.push("clock", cb.get(k++));
        }
        many.finish();
        assertEquals(jsonOf(one, "-eye.json"), jsonOf(many, "-eye.json"));
        String j = jsonOf(one, "-eye.json");
        // +/-10 ps uniform jitter: width 1000 - 20 - (noise 10 mV / 2 mV/ps = 5 ps each side) = 970 ps
        assertEquals(970, num(j, "eyeWidthPs"), 3 * num(j, "binPs"), j);
        for (Artifact a : one.outputs("files", Artifact.class)) {
            SynthSignals.save(new Artifact(a.channel(), a.startFs(), a.endFs(), "clocked-" + a.fileName(), a.mediaType(), a.content()));
        }
    }

    @Property(tries = 50)
    void accumulatingInPiecesEqualsOnePass(@ForAll @IntRange(min = 1, max = 5000) int cut1,
                                           @ForAll @IntRange(min = 1, max = 5000) int cut2,
                                           @ForAll @DoubleRange(min = 0.01, max = 300) double step) {
        float[] v = new float[10_000];
        java.util.Random r = new java.util.Random(cut1 * 31L + cut2);
        for (int i = 0; i < v.length; i++) {
            v[i] = (float) (r.nextGaussian() * 0.2);
        }
        EyeAccumulator a = new EyeAccumulator(300, 50, -0.5, 0.5);
        a.accumulate(v, 0, v.length, 17.25, step);
        EyeAccumulator b = new EyeAccumulator(300, 50, -0.5, 0.5);
        int c1 = Math.min(cut1, cut2);
        int c2 = Math.max(cut1, cut2);
        double p = b.accumulate(v, 0, c1, 17.25, step);
        p = b.accumulate(v, c1, c2, p, step);
        b.accumulate(v, c2, v.length, p, step);
        assertArrayEquals(a.counts(), b.counts());
        assertEquals(a.inRange() + a.outOfRange(), v.length);
        assertEquals(a.outOfRange(), b.outOfRange());
    }

    @Test
    void blockBoundariesDoNotChangeTheResult() {
        AnalogBlock sig = SynthSignals.nrz(4_000, UI_FS, RATE, 0.2, 200e3, 20e3, 0.01, 5);
        StageHarness one = run(sig, Map.of("bitRateHz", 1e9));
        StageHarness many = StageHarness.of(new EyeDiagramPlugin(), Map.of("bitRateHz", 1e9));
        for (AnalogBlock b : Synth.split(sig, 1, 999, 4096, 30_000, 17)) {
            many.push("signal", b);
        }
        many.finish();
        assertEquals(jsonOf(one, "-eye.json"), jsonOf(many, "-eye.json"));
        assertArrayEquals(one.outputs("files", Artifact.class).get(0).content(), many.outputs("files", Artifact.class).get(0).content());
    }

    @Test
    void pictureHasTheDeclaredSizeAndShowsTheOpening() throws Exception {
        AnalogBlock sig = SynthSignals.nrz(5_000, UI_FS, RATE, 0.2, 200e3, 0, 0.02, 6);
        StageHarness h = run(sig, Map.of("bitRateHz", 1e9, "widthPx", 500, "heightPx", 300));
        Artifact png = h.outputs("files", Artifact.class).get(0);
        assertEquals("dut-eye.png", png.fileName());
        BufferedImage img = ImageIO.read(new ByteArrayInputStream(png.content()));
        assertTrue(img.getWidth() > 500 && img.getHeight() > 300, img.getWidth() + "x" + img.getHeight());
        // the centre of the eye (mid-UI, 0 mV) is empty: plot pixel (78 + 125, 48 + 150) has the empty colour
        int rgb = img.getRGB(78 + 125 - 10, 48 + 150 - 20) & 0xFFFFFF;
        assertEquals(0x10101A, rgb, Integer.toHexString(rgb));
        // and the upper rail at mid-UI (+200 mV) is coloured
        double j = num(jsonOf(h, "-eye.json"), "rangeMaxMv");
        int railY = 48 + (int) Math.round((j - 200) / (2 * j) * 300);
        assertTrue((img.getRGB(78 + 125 - 10, railY) & 0xFFFFFF) != 0x10101A);
    }

    @Test
    void maskInsideTheOpeningHasNoHitsAndOneOverARailHas(@TempDir Path dir) throws Exception {
        Path inside = dir.resolve("inside.mask");
        Files.writeString(inside, "lanesift-eye-mask 1\n# diamond\npolygon centre\n 0.3 0\n 0.5 150\n 0.7 0\n 0.5 -150\nend\n");
        Path rail = dir.resolve("rail.mask");
        Files.writeString(rail, "lanesift-eye-mask 1\npolygon centre\n 0.3 0\n 0.5 150\n 0.7 0\n 0.5 -150\nend\n"
                + "polygon top\n 0.4 190\n 0.6 190\n 0.6 230\n 0.4 230\nend\n");
        AnalogBlock sig = SynthSignals.nrz(5_000, UI_FS, RATE, 0.2, 200e3, 0, 0.02, 7);
        String j1 = jsonOf(run(sig, Map.of("bitRateHz", 1e9, "maskFile", inside.toString())), "-eye.json");
        assertEquals(0, num(j1, "hits"), j1);
        StageHarness h2 = run(sig, Map.of("bitRateHz", 1e9, "maskFile", rail.toString()));
        String j2 = jsonOf(h2, "-eye.json");
        assertTrue(num(j2, "hits") > 1000, j2);
        assertEquals(1, h2.annotations("eye-mask-hits").size());
        for (Artifact a : h2.outputs("files", Artifact.class)) {
            SynthSignals.save(new Artifact(a.channel(), a.startFs(), a.endFs(), "masked-" + a.fileName(), a.mediaType(), a.content()));
        }
    }

    /** All messages of an exception and its causes. */
    private static List<String> messages(Throwable e) {
        List<String> msgs = new ArrayList<>();
        for (Throwable c = e; c != null; c = c.getCause()) {
            msgs.add(String.valueOf(c.getMessage()));
        }
        return msgs;
    }

    private static Throwable maskFailure(String maskFile) {
        Map<String, Object> o = new HashMap<>(Map.of("bitRateHz", 1e9, "maskFile", maskFile));
        return org.junit.jupiter.api.Assertions.assertTimeoutPreemptively(java.time.Duration.ofSeconds(30),
                () -> assertThrows(Exception.class, () -> StageHarness.of(new EyeDiagramPlugin(), o).push("signal",
                        Synth.analog("s", 1e9, 10, x -> 0)).finish()));
    }

    /**
     * Issue 18: a mask file that is no mask shows at most its first word, escaped: never the rest of
     * the line (for /proc/self/environ that would be the process environment); a device is refused
     * after a bounded read, a pipe or folder before it is opened.
     */
    @Test
    void aFileThatIsNoMaskIsNotEchoedAndDevicesArePassedOver(@TempDir Path dir) throws Exception {
        Path secret = dir.resolve("secret.txt");
        Files.writeString(secret, "TOKEN=abc123\u001b[2J and the rest of the line\n");
        List<String> msgs = messages(maskFailure(secret.toString()));
        assertTrue(msgs.stream().anyMatch(m -> m.contains("secret.txt line 1: expected the header 'lanesift-eye-mask 1', got 'TOKEN=abc123\\x1B[2J'")),
                msgs.toString());
        assertTrue(msgs.stream().noneMatch(m -> m.contains("rest of the line") || m.contains("\u001b")), msgs.toString());
        if (Files.exists(Path.of("/dev/zero"))) {
            List<String> zero = messages(maskFailure("/dev/zero"));
            assertTrue(zero.stream().anyMatch(m -> m.contains("/dev/zero: a pipe, device or socket, not a regular file")), zero.toString());
        }
        List<String> folder = messages(maskFailure(dir.toString()));
        assertTrue(folder.stream().anyMatch(m -> m.contains("a directory, not a regular file")), folder.toString());
    }

    @Test
    void badMaskFileNamesTheLine(@TempDir Path dir) throws Exception {
        Path bad = dir.resolve("bad.mask");
        Files.writeString(bad, "lanesift-eye-mask 1\npolygon a\n 0.3 0\n 0.5 oops\nend\n");
        Map<String, Object> o = new HashMap<>(Map.of("bitRateHz", 1e9, "maskFile", bad.toString()));
        Exception e = assertThrows(Exception.class, () -> StageHarness.of(new EyeDiagramPlugin(), o).push("signal",
                Synth.analog("s", 1e9, 10, x -> 0)).finish());
        Throwable c = e;
        List<String> msgs = new ArrayList<>();
        while (c != null) {
            msgs.add(String.valueOf(c.getMessage()));
            c = c.getCause();
        }
        assertTrue(msgs.stream().anyMatch(m -> m.contains("bad.mask line 4") && m.contains("X_UI Y_MV")), msgs.toString());
        assertThrows(EyeMask.MaskException.class, () -> EyeMask.parse("m", List.of("lanesift-eye-mask 1", "polygon a", "0 0", "1 1", "end")));
        assertThrows(EyeMask.MaskException.class, () -> EyeMask.parse("m", List.of("not a mask")));
        assertThrows(EyeMask.MaskException.class, () -> EyeMask.parse("m", List.of("lanesift-eye-mask 1", "polygon a", "0 0", "1 1", "1 0")));
    }

    @Test
    void aConstantSignalHasNoMeasurableEyeAndOutOfRangeIsAnError() {
        AnalogBlock flat = Synth.withNoise(Synth.analog("s", RATE, 100_000, x -> 0.1), 0.001, 1);
        StageHarness h = run(flat, Map.of("bitRateHz", 1e9));
        String j = jsonOf(h, "-eye.json");
        assertTrue(Double.isNaN(num(j, "eyeWidthUi")), j);
        assertEquals(1, h.annotations("eye-unmeasured").size());
        Exception e = assertThrows(Exception.class, () -> run(flat, Map.of("bitRateHz", 1e9, "rangeMv", List.of(500.0, 900.0))));
        Throwable c = e;
        StringBuilder all = new StringBuilder();
        while (c != null) {
            all.append(c.getMessage()).append(" | ");
            c = c.getCause();
        }
        assertTrue(all.toString().contains("outside the voltage range 500 to 900 mV; set option rangeMv"), all.toString());
    }

    @Test
    void badOptionsAndMissingClockAreReported() {
        assertThrows(OptionException.class, () -> StageHarness.of(new EyeDiagramPlugin(), Map.of("uiCount", 3)));
        Exception e = assertThrows(Exception.class, () -> StageHarness.of(new EyeDiagramPlugin(), Map.of())
                .push("signal", Synth.analog("s", 1e9, 1000, x -> Math.sin(x * 1e8))).finish());
        Throwable c = e;
        StringBuilder all = new StringBuilder();
        while (c != null) {
            all.append(c.getMessage()).append(" | ");
            c = c.getCause();
        }
        assertTrue(all.toString().contains("bitRateHz"), all.toString());
    }
}
