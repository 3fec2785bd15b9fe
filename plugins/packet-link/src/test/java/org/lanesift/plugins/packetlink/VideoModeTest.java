package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.data.Artifact;
import org.lanesift.data.Frame;
import org.lanesift.testkit.StageHarness;

/**
 * Video-mode streams on an invented one-lane link: per line one burst starting with a sync packet;
 * frame layout: VSS, HSS (vertical sync), VSE, HSS (back porch), 4 active lines (HSS + pixel packet),
 * 2 front porch lines, then the next frame. Pixel packings per the module documentation (MIPI DSI,
 * from memory); 8-bit expansion of 5/6-bit colours by repeating the top bits (common practice).
 */
class VideoModeTest {
    static final int W = 8;
    static final int H = 4;
    static final long US = 1_000_000_000L;

    static int r(int f, int x, int y) {
        return (x * 7 + f * 3) & 63;
    }

    static int g(int f, int x, int y) {
        return (y * 13 + x) & 63;
    }

    static int b(int f, int x, int y) {
        return (x * y + 5 * f) & 63;
    }

    static byte[] line(int dt, int f, int y) {
        byte[] out;
        switch (dt) {
            case 0x0E -> {
                out = new byte[W * 2];
                for (int x = 0; x < W; x++) {
                    int w = (r(f, x, y) >> 1) | g(f, x, y) << 5 | (b(f, x, y) >> 1) << 11;
                    out[2 * x] = (byte) w;
                    out[2 * x + 1] = (byte) (w >> 8);
                }
            }
            case 0x1E -> {
                out = new byte[W * 18 / 8];
                for (int x = 0; x < W; x++) {
                    long v = r(f, x, y) | g(f, x, y) << 6 | (long) b(f, x, y) << 12;
                    for (int k = 0; k < 18; k++) {
                        if ((v >> k & 1) != 0) {
                            int bit = x * 18 + k;
                            out[bit >> 3] |= (byte) (1 << (bit & 7));
                        }
                    }
                }
            }
            case 0x2E -> {
                out = new byte[W * 3];
                for (int x = 0; x < W; x++) {
                    out[3 * x] = (byte) (r(f, x, y) << 2);
                    out[3 * x + 1] = (byte) (g(f, x, y) << 2);
                    out[3 * x + 2] = (byte) (b(f, x, y) << 2);
                }
            }
            default -> {
                out = new byte[W * 3];
                for (int x = 0; x < W; x++) {
                    out[3 * x] = (byte) (r(f, x, y) << 2 | 1);
                    out[3 * x + 1] = (byte) (g(f, x, y) << 2 | 2);
                    out[3 * x + 2] = (byte) (b(f, x, y) << 2 | 3);
                }
            }
        }
        return out;
    }

    static int expected(int dt, int f, int x, int y) {
        int rr = r(f, x, y);
        int gg = g(f, x, y);
        int bb = b(f, x, y);
        return switch (dt) {
            case 0x0E -> FrameAssembler.rgb565(rr >> 1, gg, bb >> 1);
            case 0x1E, 0x2E -> FrameAssembler.rgb666(rr, gg, bb);
            default -> (rr << 2 | 1) << 16 | (gg << 2 | 2) << 8 | (bb << 2 | 3);
        };
    }

    static final long LINE_US = 20;

    static void frame(LinkSynth s, int dt, int f) {
        int[] sync = {0x01, 0x21, 0x11, 0x21};
        for (int dtSync : sync) {
            s.hs(RefCodes.shortPacket(0, dtSync, 0, 0));
            s.idle(LINE_US * US - (s.nowFs % (LINE_US * US)));
        }
        for (int y = 0; y < H; y++) {
            s.hs(RefCodes.cat(RefCodes.shortPacket(0, 0x21, 0, 0), RefCodes.longPacket(0, 0x19, new byte[6]),
                    RefCodes.longPacket(0, dt, line(dt, f, y))));
            s.idle(LINE_US * US - (s.nowFs % (LINE_US * US)));
        }
        for (int k = 0; k < 2; k++) {
            s.hs(RefCodes.shortPacket(0, 0x21, 0, 0));
            s.idle(LINE_US * US - (s.nowFs % (LINE_US * US)));
        }
    }

    @ParameterizedTest
    @ValueSource(ints = {0x0E, 0x1E, 0x2E, 0x3E})
    void framesFromEachPixelFormat(int dt) {
        LinkSynth s = new LinkSynth(1);
        s.idle(LINE_US * US);
        for (int f = 0; f < 3; f++) {
            frame(s, dt, f);
        }
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 1));
        s.feed(h, 4096, false);
        assertEquals(List.of(), DsiBurstTest.problems(h));
        List<Frame> frames = h.outputs("frames", Frame.class);
        assertEquals(3, frames.size());
        for (int f = 0; f < 3; f++) {
            Frame fr = frames.get(f);
            assertEquals(W, fr.width());
            assertEquals(H, fr.height());
            assertEquals(f == 2, fr.partial(), "only the last frame is cut by the end of the capture");
            assertFalse(fr.suspect());
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    assertEquals(expected(dt, f, x, y), fr.rgb()[y * W + x], "frame " + f + " pixel " + x + "," + y);
                }
            }
        }
        String t = new String(h.outputs("files", Artifact.class).stream().filter(a -> a.fileName().equals("dut-timing.json"))
                .findFirst().orElseThrow().content(), StandardCharsets.UTF_8);
        // 10 lines of 20 us: frame period 200 us; vertical sync 2 lines, back porch 2, front porch 2
        org.lanesift.json.JsonValue timing = org.lanesift.testkit.JsonScan.parse("dut-timing.json", t);
        assertEquals(2e-4, org.lanesift.testkit.JsonScan.number(timing, "periodS"), 1e-12, t);
        assertEquals(10, org.lanesift.testkit.JsonScan.number(timing, "linesTotal"), t);
        assertEquals(2, org.lanesift.testkit.JsonScan.number(timing, "vsyncLines"), t);
        assertEquals(2, org.lanesift.testkit.JsonScan.number(timing, "backPorchLines"), t);
        assertEquals(4, org.lanesift.testkit.JsonScan.number(timing, "activeLines"), t);
        assertEquals(2, org.lanesift.testkit.JsonScan.number(timing, "frontPorchLines"), t);
        assertEquals(2e-5, org.lanesift.testkit.JsonScan.number(timing, "linePeriodS"), 1e-13, t);
        assertEquals(5000, org.lanesift.testkit.JsonScan.number(timing, "frameRateHz"), 1e-9, t);
        assertEquals(3 * H, h.annotations("packet").stream().filter(a -> DataTypes.name(dt).equals(a.fields().get("dataType").value())).count());
    }
}
