package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.chain.ChainException;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.Frame;
import org.lanesift.testkit.StageHarness;

/** Missing lanes, short captures, broken bit streams and bad options. */
class BadInputTest {

    @Test
    void silentLaneGivesAnErrorAndNoPicture() throws Exception {
        Capture c = FrameAssemblyTest.small(FrameAssemblyTest.SMALL);
        c.silentLanes = Set.of("lane2");
        try (StageHarness h = c.run()) {
            assertEquals(List.of(), h.outputs("frames"));
            List<Annotation> a = h.annotations("missing-lane");
            assertEquals(1, a.size());
            assertEquals(Severity.ERROR, a.get(0).severity());
            assertTrue(a.get(0).label().contains("lane2"), a.get(0).label());
            Report r = Report.of(h);
            assertTrue(r.str("errors/0").contains("lane2"));
        }
    }

    @Test
    void unwiredLaneIsAChainError() {
        // the harness wires every input; a chain that leaves lane3 open must not build
        org.lanesift.plugin.PluginRegistry reg = new org.lanesift.plugin.PluginRegistry().add(new PixelLinkPlugin());
        ChainException e = assertThrows(ChainException.class, () -> org.lanesift.chain.Chain.builder(reg)
                .add("pix", "pixel-link", Map.of())
                .input("l0", org.lanesift.data.DataKind.BITS).wire("l0", "pix.lane0")
                .input("l1", org.lanesift.data.DataKind.BITS).wire("l1", "pix.lane1")
                .input("l2", org.lanesift.data.DataKind.BITS).wire("l2", "pix.lane2")
                .build());
        assertTrue(e.getMessage().contains("lane3"), e.getMessage());
    }

    @Test
    void captureShorterThanOneLine() throws Exception {
        Capture c = FrameAssemblyTest.small(FrameAssemblyTest.SMALL);
        c.firstPixel = 4L * 24 + 8; // inside a line
        c.pixels = 20;
        try (StageHarness h = c.run()) {
            assertEquals(List.of(), h.outputs("frames"));
            List<Annotation> a = h.annotations("short-capture");
            assertEquals(1, a.size());
            assertEquals(Severity.ERROR, a.get(0).severity());
            assertTrue(Report.of(h).str("errors/0").contains("shorter than one line"));
        }
    }

    /** A lane that ends early: the pixels after it are lost lock, the frame is partial, nothing garbage is complete. */
    @Test
    void laneEndingEarly() throws Exception {
        Capture c = FrameAssemblyTest.small(FrameAssemblyTest.SMALL);
        c.blockClocks = 10_000;
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of("pictures", "none"))) {
            int n = (int) (3 * FrameAssemblyTest.SMALL.frameClocks());
            int[] words = new int[n];
            for (int i = 0; i < n; i++) {
                words[i] = TestLink.word(c.video, c.image, c.firstPixel + i);
            }
            List<BitStream> lanes = TestLink.serialise(words, n, c.firstPixel, c.periodFs, TestLink.VESA24, 8, false, false, -1,
                    TestLink.laneNames(4, false));
            for (BitStream b : lanes) {
                h.push(b.channel(), b.channel().equals("lane1") ? TestLink.slice(b, 0, b.count() - 7 * 400) : b);
            }
            h.finish();
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertTrue(!frames.isEmpty());
            Frame last = frames.get(frames.size() - 1);
            assertTrue(last.partial(), frames.toString());
            assertTrue(h.annotations("lost-lock").size() >= 1);
            for (Frame f : frames) {
                if (!f.partial()) {
                    org.junit.jupiter.api.Assertions.assertArrayEquals(c.expectedFrame(f.index()), f.rgb());
                }
            }
        }
    }

    /** Bits with slots missing (a sampler that lost slots) mark the pixel incomplete: lost lock, frame partial. */
    @Test
    void missingSlotsMakeLostLock() throws Exception {
        Capture c = FrameAssemblyTest.small(FrameAssemblyTest.SMALL);
        long victim = 2 * FrameAssemblyTest.SMALL.frameClocks() + 5L * 24 + 10;
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of("pictures", "none"))) {
            int n = (int) (c.pixels);
            int[] words = new int[n];
            for (int i = 0; i < n; i++) {
                words[i] = TestLink.word(c.video, c.image, c.firstPixel + i);
            }
            List<BitStream> lanes = TestLink.serialise(words, n, c.firstPixel, c.periodFs, TestLink.VESA24, 8, false, false, -1,
                    TestLink.laneNames(4, false));
            for (BitStream b : lanes) {
                if (b.channel().equals("lane0")) {
                    int cut = (int) (victim - c.firstPixel) * 7 + 3; // drop slots 3..6 of one pixel
                    h.push(b.channel(), TestLink.slice(b, 0, cut));
                    h.push(b.channel(), TestLink.slice(b, cut + 4, b.count() - cut - 4));
                } else {
                    h.push(b.channel(), b);
                }
            }
            h.finish();
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertEquals(5, frames.size());
            assertTrue(frames.get(2).partial());
            assertTrue(!frames.get(1).partial() && !frames.get(3).partial());
            assertEquals(1, h.annotations("lost-lock").size());
        }
    }

    /** A clock period missing on every lane (the clock index jumps): lost lock inside a run of good pixels. */
    @Test
    void droppedClockPeriodIsLostLock() throws Exception {
        Capture c = FrameAssemblyTest.small(FrameAssemblyTest.SMALL);
        long victim = 2 * FrameAssemblyTest.SMALL.frameClocks() + 6L * 24 + 11;
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of("pictures", "none"))) {
            int n = (int) (c.pixels);
            int[] words = new int[n];
            for (int i = 0; i < n; i++) {
                words[i] = TestLink.word(c.video, c.image, c.firstPixel + i);
            }
            List<BitStream> lanes = TestLink.serialise(words, n, c.firstPixel, c.periodFs, TestLink.VESA24, 8, false, false, -1,
                    TestLink.laneNames(4, false));
            int cut = (int) (victim - c.firstPixel) * 7;
            for (BitStream b : lanes) {
                h.push(b.channel(), TestLink.slice(b, 0, cut));
            }
            for (BitStream b : lanes) {
                h.push(b.channel(), TestLink.slice(b, cut + 7, b.count() - cut - 7));
            }
            h.finish();
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertEquals(5, frames.size());
            assertTrue(frames.get(2).partial(), frames.toString());
            assertTrue(!frames.get(1).partial() && !frames.get(3).partial());
            assertEquals(1, h.annotations("lost-lock").size());
        }
    }

    @Test
    void bitsWithoutSlotNumbersAreRejectedClearly() {
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of())) {
            int n = 70;
            BitStream b = new BitStream("lane0", 0, 1000, n, new long[BitSets.words(n)], new long[n], new long[n],
                    new long[BitSets.words(n)], null, new long[n], new long[n], new long[BitSets.words(n)], 10);
            RuntimeException e = assertThrows(RuntimeException.class, () -> h.push("lane0", b));
            assertTrue(e.getMessage().contains("no slot numbers"), e.getMessage());
        }
    }

    @Test
    void badOptions() {
        RuntimeException e = assertThrows(ChainException.class,
                () -> StageHarness.of(new PixelLinkPlugin(), Map.of("pictureRange", "5-2")));
        assertTrue(e.getMessage().contains("pictureRange"), e.getMessage());
        // the harness validates declared choices itself, before the chain is built
        e = assertThrows(org.lanesift.plugin.OptionException.class,
                () -> StageHarness.of(new PixelLinkPlugin(), Map.of("mapping", "vesa-30")));
        assertTrue(e.getMessage().contains("vesa-24, jeida-24, bits-18"), e.getMessage());
        e = assertThrows(ChainException.class, () -> StageHarness.of(new PixelLinkPlugin(), Map.of("mappingFile", "/no/such/map.json")));
        assertTrue(e.getMessage().contains("/no/such/map.json"), e.getMessage());
    }

    @Test
    void lanesFollowTheMapping() {
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of("mapping", "bits-18"))) {
            assertThrows(IllegalArgumentException.class, () -> h.push("lane3", null));
        }
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of("mapping", "bits-18", "dual", true))) {
            assertThrows(IllegalArgumentException.class, () -> h.push("lane0", null));
            assertThrows(IllegalArgumentException.class, () -> h.push("even3", null));
        }
    }
}
