package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.Frame;
import org.lanesift.testkit.StageHarness;

/** Frame assembly, timing and pictures on small synthetic links made by {@link TestLink}. */
class FrameAssemblyTest {
    /** A small invented timing: 16 x 8 active, 24 x 12 total, negative syncs. */
    static final TestLink.Video SMALL = new TestLink.Video(16, 2, 3, 3, 8, 1, 1, 2, false, false, true);
    /** Even values everywhere, for dual links (two pixels per clock). */
    static final TestLink.Video SMALL_EVEN = new TestLink.Video(16, 2, 4, 2, 8, 1, 2, 1, true, false, true);

    static Capture small(TestLink.Video v) {
        Capture c = new Capture(v);
        c.periodFs = 1e15 / 40e6;
        c.firstPixel = 4L * v.hTotal() + 9; // inside source frame 0's active area
        c.pixels = 4 * v.frameClocks() - c.firstPixel + 5L * v.hTotal(); // ends inside source frame 4
        if ((c.firstPixel & 1) != 0) {
            c.firstPixel++;
        }
        if ((c.pixels & 1) != 0) {
            c.pixels++;
        }
        c.blockClocks = 50;
        c.options = new HashMap<>(Map.of("pictures", "none"));
        return c;
    }

    static void assertFrames(Capture c, StageHarness h, int complete) {
        List<Frame> frames = h.outputs("frames", Frame.class);
        assertEquals(complete + 2, frames.size(), frames.toString());
        assertTrue(frames.get(0).partial(), "first frame partial");
        assertTrue(frames.get(frames.size() - 1).partial(), "last frame partial");
        for (int k = 1; k <= complete; k++) {
            Frame f = frames.get(k);
            assertEquals(k, f.index());
            assertFalse(f.partial(), "frame " + k);
            assertEquals(c.video.hActive(), f.width());
            assertEquals(c.video.vActive(), f.height());
            assertArrayEquals(c.expectedFrame(k), f.rgb(), "frame " + k);
        }
    }

    @ParameterizedTest(name = "{0} reverse={1} dual={2}")
    @CsvSource({"vesa-24,false,false", "jeida-24,false,false", "bits-18,false,false", "vesa-24,true,false",
        "jeida-24,false,true", "bits-18,true,true"})
    void smallLinkDecodesPixelForPixel(String mapping, boolean reverse, boolean dual) throws Exception {
        Capture c = small(dual ? SMALL_EVEN : SMALL);
        c.table = switch (mapping) {
            case "jeida-24" -> TestLink.JEIDA24;
            case "bits-18" -> TestLink.BITS18;
            default -> TestLink.VESA24;
        };
        c.colourBits = mapping.equals("bits-18") ? 6 : 8;
        c.reverse = reverse;
        c.dual = dual;
        c.options.put("mapping", mapping);
        c.options.put("reverseSlots", reverse);
        try (StageHarness h = c.run()) {
            assertFrames(c, h, 3);
            Report r = Report.of(h);
            TestLink.Video v = c.video;
            assertEquals(v.hActive(), r.num("horizontal/active/value"));
            assertEquals(v.hFront(), r.num("horizontal/frontPorch/value"));
            assertEquals(v.hSync(), r.num("horizontal/syncWidth/value"));
            assertEquals(v.hBack(), r.num("horizontal/backPorch/value"));
            assertEquals(v.hTotal(), r.num("horizontal/total/value"));
            assertEquals(v.vActive(), r.num("vertical/active/value"));
            assertEquals(v.vFront(), r.num("vertical/frontPorch/value"));
            assertEquals(v.vSync(), r.num("vertical/syncWidth/value"));
            assertEquals(v.vBack(), r.num("vertical/backPorch/value"));
            assertEquals(v.vTotal(), r.num("vertical/total/value"));
            assertEquals(v.hsHigh() ? "positive" : "negative", r.str("horizontal/syncPolarity"));
            assertEquals(v.vsHigh() ? "positive" : "negative", r.str("vertical/syncPolarity"));
            assertEquals(dual ? 80_000_000L : 40_000_000L, r.num("pixelClockHz/value"));
            assertEquals(40_000_000L, r.num("linkClockHz/value"));
            assertEquals("derived: pixel clock / pixels per clock", r.get("linkClockHz/source").asString());
            assertEquals(3, r.num("frames/complete"));
            assertEquals(0, r.num("frames/suspect"));
        }
    }

    @Test
    void positiveSyncsAndPolarityOptions() throws Exception {
        TestLink.Video v = new TestLink.Video(16, 2, 3, 3, 8, 1, 1, 2, true, true, true);
        Capture c = small(v);
        try (StageHarness h = c.run()) {
            assertFrames(c, h, 3);
            Report r = Report.of(h);
            assertEquals("positive", r.str("horizontal/syncPolarity"));
            assertEquals("positive", r.str("vertical/syncPolarity"));
            assertEquals(3, r.num("horizontal/syncWidth/value"));
        }
        c.options.put("hsPolarity", "positive");
        c.options.put("vsPolarity", "positive");
        try (StageHarness h = c.run()) {
            assertFrames(c, h, 3);
            assertEquals(2, Report.of(h).num("vertical/backPorch/value"));
        }
    }

    /** DE-only panel: H and V timing inferred from DE (total = DE period, blanking = DE low); no sync. */
    @Test
    void deOnlyLink() throws Exception {
        TestLink.Video v = new TestLink.Video(16, 2, 3, 3, 8, 1, 1, 2, false, false, false);
        Capture c = small(v);
        try (StageHarness h = c.run()) {
            assertFrames(c, h, 3);
            Report r = Report.of(h);
            assertFalse(r.bool("horizontal/syncPresent"));
            assertFalse(r.bool("vertical/syncPresent"));
            assertEquals("not-present", r.str("horizontal/syncPolarity"));
            assertEquals(null, r.get("horizontal/frontPorch"));
            assertEquals(24, r.num("horizontal/total/value"));
            assertEquals(8, r.num("horizontal/blanking/value"));
            assertEquals(12, r.num("vertical/total/value"));
            assertEquals(4, r.num("vertical/blanking/value"));
            assertTrue(Report.text(h, "dut-timing.txt").contains("no HS pulses: timing inferred from DE"));
        }
    }

    /** A capture that starts in vertical blanking, more than a line before the picture: frame 0 is complete. */
    @ParameterizedTest(name = "withSync={0}")
    @CsvSource({"true", "false"})
    void captureStartingInVerticalBlanking(boolean withSync) throws Exception {
        TestLink.Video v = new TestLink.Video(16, 2, 3, 3, 8, 1, 1, 2, false, false, withSync);
        Capture c = small(v);
        c.firstPixel = 5;
        c.pixels = 2 * v.frameClocks() + 4L * v.hTotal();
        try (StageHarness h = c.run()) {
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertEquals(3, frames.size(), frames.toString());
            for (int k = 0; k < 2; k++) {
                assertFalse(frames.get(k).partial(), "frame " + k);
                assertArrayEquals(c.expectedFrame(k), frames.get(k).rgb());
            }
            assertTrue(frames.get(2).partial());
        }
    }

    /** DE-only capture that starts with one line just before vertical blanking: the first gap is resolved afterwards. */
    @Test
    void deOnlyCaptureStartingOnTheLastLine() throws Exception {
        TestLink.Video v = new TestLink.Video(16, 2, 3, 3, 8, 1, 1, 2, false, false, false);
        Capture c = small(v);
        c.firstPixel = (long) (v.vSync() + v.vBack() + v.vActive() - 1) * v.hTotal() + 2; // last active line of frame 0
        c.pixels = 3 * v.frameClocks();
        try (StageHarness h = c.run()) {
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertTrue(frames.get(0).partial());
            assertEquals(1, frames.get(0).height(), frames.toString());
            Frame f1 = frames.get(1);
            assertFalse(f1.partial(), frames.toString());
            assertArrayEquals(c.expectedFrame(1), f1.rgb());
            assertFalse(frames.get(2).partial());
        }
    }

    @Test
    void flaggedBitsMarkTheFrameSuspect() throws Exception {
        Capture c = small(SMALL);
        long frame2 = 2 * SMALL.frameClocks();
        c.flagClock = frame2 + (SMALL.vSync() + SMALL.vBack() + 3L) * SMALL.hTotal() + 10; // a pixel in source frame 2
        try (StageHarness h = c.run()) {
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertTrue(frames.get(2).suspect());
            assertFalse(frames.get(2).partial());
            assertFalse(frames.get(1).suspect());
            assertFalse(frames.get(3).suspect());
            assertEquals(1, h.annotations("suspect-bits").size());
            assertEquals(1, Report.of(h).num("frames/suspect"));
        }
    }

    /**
     * The clock stops mid-frame and the sampler named its clock-dropout finding in the bits: lost
     * lock is annotated as that finding's consequence, that frame is partial, the others stay complete.
     */
    @Test
    void clockStoppingMidFrame() throws Exception {
        Capture c = small(SMALL);
        c.stopAfterClock = 2 * SMALL.frameClocks() + (SMALL.vSync() + SMALL.vBack() + 4L) * SMALL.hTotal() + 8;
        c.stopFs = 5_000_000_000L; // 5 us pause, 200 clock periods of 25 ns
        c.stopNamed = true;
        try (StageHarness h = c.run()) {
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertEquals(5, frames.size(), frames + " " + h.annotations());
            assertTrue(frames.get(2).partial(), "frame with the stop is partial " + frames + " " + h.annotations("lost-lock"));
            assertFalse(frames.get(1).partial());
            assertFalse(frames.get(3).partial());
            assertArrayEquals(c.expectedFrame(3), frames.get(3).rgb());
            List<Annotation> lost = h.annotations("lost-lock");
            assertEquals(1, lost.size());
            // the stopped clock is the finding of the sampler that recovers it: here it is a consequence, information only
            assertEquals(Severity.INFO, lost.get(0).severity());
            assertTrue(lost.get(0).label().contains("consequence: see the clock-dropout finding of 'sampler' at"), lost.get(0).label());
            List<Annotation> partial = h.annotations("partial-frame");
            assertTrue(partial.stream().anyMatch(a -> a.label().contains("lock lost")));
            assertTrue(partial.stream().allMatch(a -> a.severity() == Severity.INFO), partial.toString());
            Report r = Report.of(h);
            assertEquals(2, r.num("frames/complete"));
            assertFalse(r.bool("horizontal/total/varying"), "measurements across the stop are not taken");
        }
    }

    /**
     * The same stop where no finding of the sampler covers it (a sampler told to tolerate long
     * gaps): the decoder reports the lost lock itself, once, as an error, and the frame it breaks
     * is information referring to it; nothing else is a warning or an error.
     */
    @Test
    void clockStopNoSamplerFindingCoversIsFoundHereOnce() throws Exception {
        Capture c = small(SMALL);
        c.stopAfterClock = 2 * SMALL.frameClocks() + (SMALL.vSync() + SMALL.vBack() + 4L) * SMALL.hTotal() + 8;
        c.stopFs = 5_000_000_000L;
        try (StageHarness h = c.run()) {
            List<Annotation> findings = h.annotations().stream().filter(a -> a.severity() != Severity.INFO).toList();
            assertEquals(1, findings.size(), findings.toString());
            assertEquals("lost-lock", findings.get(0).kind());
            assertEquals(Severity.ERROR, findings.get(0).severity());
            assertFalse(findings.get(0).label().contains("consequence"), findings.get(0).label());
            assertTrue(h.annotations("partial-frame").stream().anyMatch(a -> a.label().contains("lock lost")));
            assertTrue(h.outputs("frames", Frame.class).get(2).partial());
        }
    }

    /** A clock that drifts (period growing by 2 % over the capture): drift is annotated, the clock reported as varying, pictures intact. */
    @Test
    void driftingClock() throws Exception {
        Capture c = small(SMALL);
        c.driftPerClock = 0.02 / c.pixels;
        try (StageHarness h = c.run()) {
            assertFrames(c, h, 3);
            assertTrue(h.annotations("clock-drift").size() >= 1, h.annotations().toString());
            Report r = Report.of(h);
            assertTrue(r.bool("pixelClockHz/varying"));
            double min = r.real("pixelClockHz/min");
            double max = r.real("pixelClockHz/max");
            assertTrue(max / min > 1.01 && max / min < 1.03, min + " .. " + max);
            assertEquals(0, h.annotations("lost-lock").size());
            assertTrue(Report.text(h, "dut-timing.txt").contains("VARYING"));
        }
    }

    /** A line of unexpected length is annotated, the frame marked suspect, and H active reported as varying. */
    @Test
    void lineOfUnexpectedLength() throws Exception {
        Capture c = small(SMALL);
        long lineStart = 2 * SMALL.frameClocks() + (SMALL.vSync() + SMALL.vBack() + 5L) * SMALL.hTotal() + SMALL.hSync() + SMALL.hBack();
        c.hook = (p, w) -> p >= lineStart + 12 && p < lineStart + 16 ? w & ~(1 << 24) : w; // DE drops 4 pixels early
        try (StageHarness h = c.run()) {
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertTrue(frames.get(2).suspect());
            List<Annotation> a = h.annotations("line-length");
            assertEquals(1, a.size());
            assertEquals(Severity.WARNING, a.get(0).severity());
            assertTrue(a.get(0).label().contains("the lane carrying"), a.get(0).label());
            assertEquals(12L, ((Number) a.get(0).fields().get("pixels").value()).longValue());
            assertEquals(16L, ((Number) a.get(0).fields().get("expected").value()).longValue());
            Report r = Report.of(h);
            assertTrue(r.bool("horizontal/active/varying"));
            assertEquals(12, r.num("horizontal/active/min"));
            assertEquals(16, r.num("horizontal/active/max"));
            assertEquals(16, r.num("horizontal/active/value"));
        }
    }

    @Test
    void annotationsForLinesFramesAndSyncs() throws Exception {
        Capture c = small(SMALL);
        try (StageHarness h = c.run()) {
            List<Annotation> lines = h.annotations("line");
            assertTrue(lines.size() >= 3 * 8);
            assertTrue(lines.stream().allMatch(a -> ((Number) a.fields().get("pixels").value()).longValue() == 16));
            assertEquals(5, h.annotations("frame").size());
            assertTrue(h.annotations("hsync").size() > 3 * 12);
            assertTrue(h.annotations("hsync").stream().allMatch(a -> a.label().equals("HS 3 px")));
            assertTrue(h.annotations("vsync").stream().allMatch(a -> a.label().equals("VS 1 lines")));
            assertEquals(2, h.annotations("partial-frame").size());
            assertTrue(h.annotations().stream().allMatch(a -> a.endFs() >= a.startFs()));
        }
        c.options.put("detail", "anomalies");
        try (StageHarness h = c.run()) {
            assertEquals(0, h.annotations("line").size());
            assertEquals(0, h.annotations("hsync").size());
            assertEquals(2, h.annotations("partial-frame").size());
        }
    }

    @Test
    void picturesAllChangedNoneAndRange() throws Exception {
        Capture c = small(SMALL);
        c.options.put("pictures", "all");
        try (StageHarness h = c.run()) {
            List<String> names = pngs(h);
            assertEquals(List.of("dut-frame-0000-partial.png", "dut-frame-0001.png", "dut-frame-0002.png", "dut-frame-0003.png",
                    "dut-frame-0004-partial.png"), names);
            Frame f2 = h.outputs("frames", Frame.class).get(2);
            Artifact a = h.outputs("files", Artifact.class).stream().filter(x -> x.fileName().equals("dut-frame-0002.png")).findFirst().orElseThrow();
            assertEquals("image/png", a.mediaType());
            BufferedImage img = ImageIO.read(new ByteArrayInputStream(a.content()));
            assertEquals(16, img.getWidth());
            assertEquals(8, img.getHeight());
            for (int y = 0; y < 8; y++) {
                for (int x = 0; x < 16; x++) {
                    assertEquals(f2.rgb()[y * 16 + x], img.getRGB(x, y) & 0xFFFFFF);
                }
            }
        }
        c.options.put("pictureRange", "2-3");
        try (StageHarness h = c.run()) {
            assertEquals(List.of("dut-frame-0002.png", "dut-frame-0003.png"), pngs(h));
        }
        // a still picture: only the first complete frame differs from its predecessor
        c.image = (f, x, y) -> (x * 16) << 16 | (y * 32) << 8 | 0x55;
        c.options.put("pictures", "changed");
        c.options.put("pictureRange", "");
        try (StageHarness h = c.run()) {
            assertEquals(List.of("dut-frame-0001.png"), pngs(h));
        }
        c.options.put("pictures", "none");
        try (StageHarness h = c.run()) {
            assertEquals(List.of(), pngs(h));
            assertEquals(List.of("dut-timing.json", "dut-timing.txt", "dut-timing.dts", "dut-timing.h", "dut-tx.v"),
                    h.outputs("files", Artifact.class).stream().map(Artifact::fileName).toList(), "timing files only");
        }
    }

    static List<String> pngs(StageHarness h) {
        return h.outputs("files", Artifact.class).stream().map(Artifact::fileName).filter(n -> n.endsWith(".png")).toList();
    }
}
