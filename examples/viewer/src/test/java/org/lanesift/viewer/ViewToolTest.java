package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Severity;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.ToolHarness;

/** The view command without a display: snapshots of a capture and of an output folder, and bad input. */
class ViewToolTest {
    @TempDir
    Path dir;

    /** A 1 GS/s capture of one 10 MHz square wave between -0.5 V and +0.5 V, 2 us long. */
    private Path squareCsv() throws IOException {
        StringBuilder sb = new StringBuilder("Time (s),A (V)\n");
        for (int i = 0; i < 2000; i++) {
            double v = (i / 50) % 2 == 0 ? 0.5 : -0.5;
            sb.append(String.format(Locale.ROOT, "%.9e,%.3f%n", i * 1e-9, v));
        }
        Path f = dir.resolve("square.csv");
        Files.writeString(f, sb);
        return f;
    }

    @Test
    void aSnapshotOfACaptureDrawsItsChannelBetweenItsLevels() throws IOException {
        Path png = dir.resolve("shots/square.png");
        ToolHarness.Result r = ToolHarness.of(new ViewTool()).option("capture", squareCsv().toString())
                .option("snapshot", png.toString()).option("width", "1200").option("height", "700").run();
        assertEquals(0, r.code(), r.err());
        ShotCheck s = ShotCheck.read(png);
        assertEquals(1200, s.image().getWidth());
        JsonValue row = s.row("A");
        assertNotNull(row, "row A is on the screen: " + s.layout());
        assertEquals("analog", row.get("kind").asString());
        int top = (int) row.get("top").asDouble();
        int h = (int) row.get("height").asDouble();
        // 50 ns high from 0, 50 ns low from 50 ns: the trace sits in the upper part, then the lower part
        int xHigh = s.xOf(25e6);
        int xLow = s.xOf(75e6);
        assertTrue(s.count(Palette.TRACE, xHigh - 1, top, 3, h / 3) > 0, "high level drawn near the top of row A");
        assertEquals(0, s.count(Palette.TRACE, xHigh - 1, top + 2 * h / 3, 3, h / 3), "nothing drawn low while high");
        assertTrue(s.count(Palette.TRACE, xLow - 1, top + 2 * h / 3, 3, h / 3) > 0, "low level drawn near the bottom of row A");
    }

    @Test
    void aSnapshotOfAnOutputFolderShowsTheNoteAtItsTimeAndTheFrame() throws IOException {
        Path out = Files.createDirectories(dir.resolve("run"));
        // one warning from 1.0 us to 1.2 us and one info over the whole 2 us, on a track of our own
        Files.writeString(out.resolve("annotations.jsonl"),
                "{\"source\":\"chk\",\"start_fs\":1000000000,\"end_fs\":1200000000,\"track\":\"lane0\",\"kind\":\"margin-low\","
                        + "\"severity\":\"warning\",\"label\":\"setup 12 ps\",\"fields\":{\"setupFs\":{\"type\":\"number\",\"value\":12000,\"unit\":\"fs\"}}}\n"
                        + "{\"source\":\"chk\",\"start_fs\":0,\"end_fs\":2000000000,\"track\":\"lane0.all\",\"kind\":\"span\","
                        + "\"severity\":\"info\",\"label\":\"whole\",\"fields\":{}}\n");
        BufferedImage frame = new BufferedImage(8, 4, BufferedImage.TYPE_INT_RGB);
        for (int x = 0; x < 8; x++) {
            for (int y = 0; y < 4; y++) {
                frame.setRGB(x, y, x < 4 ? 0xFF0000 : 0x0000FF);
            }
        }
        ImageIO.write(frame, "png", out.resolve("panel-frame-0000.png").toFile());
        Path png = dir.resolve("folder.png");
        ToolHarness.Result r = ToolHarness.of(new ViewTool()).option("folder", out.toString())
                .option("snapshot", png.toString()).run();
        assertEquals(0, r.code(), r.err());
        ShotCheck s = ShotCheck.read(png);
        JsonValue lane = s.row("lane0");
        assertNotNull(lane, "track lane0 has a row");
        int top = (int) lane.get("top").asDouble();
        int x = s.xOf(1.1e9);
        java.awt.Color warn = Palette.fill(Severity.WARNING);
        assertTrue(s.count(warn, x - 1, top, 3, Row.LANE_PX) > 5, "the warning's box is drawn in the warning colour at 1.1 us");
        assertEquals(0, s.count(warn, s.xOf(0.95e9) - 1, top, 3, Row.LANE_PX), "and not at 0.95 us, before it starts");
        assertEquals(0, s.count(warn, s.xOf(1.25e9) - 1, top, 3, Row.LANE_PX), "nor at 1.25 us, after it ends");
        JsonValue f = s.layout().get("frame");
        assertNotNull(f, "a frame is shown");
        int fx = (int) f.get("x").asDouble();
        int fy = (int) f.get("y").asDouble();
        int fw = (int) f.get("width").asDouble();
        int fh = (int) f.get("height").asDouble();
        assertEquals(0xFF0000, s.rgb(fx + fw / 4, fy + fh / 2), "left half of the frame is red");
        assertEquals(0x0000FF, s.rgb(fx + 3 * fw / 4, fy + fh / 2), "right half of the frame is blue");
    }

    @Test
    void badInputIsExitTwoWithTheFileNamed() throws IOException {
        // neither the extension nor the content (binary, no sidecar) tells the capture kind
        Path odd = Files.write(dir.resolve("capture.xyz"), new byte[] {0, 1, 2, 3});
        ToolHarness.Result r = ToolHarness.of(new ViewTool()).option("capture", odd.toString())
                .option("snapshot", dir.resolve("x.png").toString()).run();
        assertEquals(2, r.code());
        assertTrue(r.err().contains("capture.xyz") && r.err().contains("known extensions: .csv"), r.err());

        Path chain = Files.writeString(dir.resolve("chain.json"), "{\"nodes\": 3}");
        r = ToolHarness.of(new ViewTool()).option("chain", chain.toString()).option("snapshot", dir.resolve("y.png").toString()).run();
        assertEquals(2, r.code());
        assertTrue(r.err().contains("chain.json") && r.err().contains("/nodes"), r.err());

        // the chain file goes through the same reader as 'lanesift run': a misspelt key is refused, not ignored
        Path typo = Files.writeString(dir.resolve("typo.json"), "{\"nodes\": [{\"id\": \"cap\", \"plugin\": \"csv\"}], \"wire\": []}");
        r = ToolHarness.of(new ViewTool()).option("chain", typo.toString()).option("snapshot", dir.resolve("t.png").toString()).run();
        assertEquals(2, r.code());
        assertTrue(r.err().contains("typo.json /wire: unknown key 'wire'; expected one of: description, nodes, outputs, wires"), r.err());

        Path notes = Files.createDirectories(dir.resolve("bad-run"));
        Files.writeString(notes.resolve("annotations.jsonl"), "{\"start_fs\":1,\"end_fs\":2}\n{oops\n");
        r = ToolHarness.of(new ViewTool()).option("folder", notes.toString()).option("snapshot", dir.resolve("z.png").toString()).run();
        assertEquals(2, r.code());
        assertTrue(r.err().contains("annotations.jsonl") && r.err().contains("line 1"), r.err());
        assertTrue(Files.notExists(dir.resolve("z.png")), "no picture of a folder that could not be read");
    }
}
