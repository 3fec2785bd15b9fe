package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Frame;
import org.lanesift.testkit.StageHarness;

/**
 * Video timing against the VESA Display Monitor Timing standard, 640 x 480 at 60 Hz (from memory):
 * pixel clock 25.175 MHz; horizontal 640 active, 16 front porch, 96 sync, 48 back porch, 800
 * total; vertical 480, 10, 2, 33, 525 total; both syncs negative.
 */
class DmtTimingTest {
    // VESA DMT 640x480@60 (from memory)
    static final TestLink.Video DMT_640 = new TestLink.Video(640, 16, 96, 48, 480, 10, 2, 33, false, false, true);

    @Test
    void dmt640x480IsReportedExactly() throws Exception {
        Capture c = new Capture(DMT_640);
        c.periodFs = 1e15 / 25.175e6;
        long frame = DMT_640.frameClocks();
        c.firstPixel = 300L * 800 + 123; // inside the active area of source frame 0
        c.pixels = 3 * frame - c.firstPixel + 200L * 800; // ends inside source frame 3
        c.options = new java.util.HashMap<>(Map.of("pictures", "none", "detail", "frames"));
        try (StageHarness h = c.run()) {
            List<Frame> frames = h.outputs("frames", Frame.class);
            assertEquals(4, frames.size(), "frames: " + frames);
            assertTrue(frames.get(0).partial());
            assertTrue(frames.get(3).partial());
            for (int k = 1; k <= 2; k++) {
                Frame f = frames.get(k);
                assertFalse(f.partial(), "frame " + k);
                assertFalse(f.suspect(), "frame " + k);
                assertEquals(640, f.width());
                assertEquals(480, f.height());
                assertArrayEquals(c.expectedFrame(k), f.rgb(), "frame " + k + " pixels");
            }
            Report r = Report.of(h);
            assertEquals(640, r.num("horizontal/active/value"));
            assertEquals(16, r.num("horizontal/frontPorch/value"));
            assertEquals(96, r.num("horizontal/syncWidth/value"));
            assertEquals(48, r.num("horizontal/backPorch/value"));
            assertEquals(800, r.num("horizontal/total/value"));
            assertEquals(160, r.num("horizontal/blanking/value"));
            for (String q : List.of("active", "frontPorch", "syncWidth", "backPorch", "total")) {
                assertFalse(r.bool("horizontal/" + q + "/varying"), q);
                assertEquals(r.num("horizontal/" + q + "/min"), r.num("horizontal/" + q + "/max"), q);
                assertFalse(r.bool("vertical/" + q + "/varying"), q);
            }
            assertEquals(480, r.num("vertical/active/value"));
            assertEquals(10, r.num("vertical/frontPorch/value"));
            assertEquals(2, r.num("vertical/syncWidth/value"));
            assertEquals(33, r.num("vertical/backPorch/value"));
            assertEquals(525, r.num("vertical/total/value"));
            assertEquals(45, r.num("vertical/blanking/value"));
            assertEquals("negative", r.str("horizontal/syncPolarity"));
            assertEquals("negative", r.str("vertical/syncPolarity"));
            assertEquals(25_175_000L, r.num("pixelClockHz/value"));
            assertFalse(r.bool("pixelClockHz/varying"));
            // refresh = 25.175 MHz / (800 * 525) = 59.9405 Hz
            assertEquals(25.175e6 / 420000, r.real("refreshHz/value"), 1e-5);
            assertEquals(2, r.num("frames/complete"));
            assertEquals(2, r.num("frames/partial"));
            String txt = Report.text(h, "dut-timing.txt");
            assertTrue(txt.contains("Pixel clock: 25175000"), txt);
            assertTrue(txt.contains("Refresh:     59.940 Hz"), txt);
        }
    }

}
