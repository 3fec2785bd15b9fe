package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.examples.demo.DemoTool;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.ExternalTool;
import org.lanesift.testkit.Poll;
import org.lanesift.testkit.ToolHarness;

/**
 * End to end on a virtual display (Debian {@code xvfb}): the viewer opens the demo's pixel-link
 * capture with the demo's decoding chain, runs it on its worker thread, and photographs its own
 * window from the screen once the result is shown. The picture must show every channel row, a
 * decoded line's annotation with its label where its time is, and the decoded frame exactly as the
 * command-line run of the same chain wrote it.
 */
class ViewerWindowTest {
    @TempDir
    Path dir;

    @Test
    void theDemoCaptureDecodedInTheWindowShowsRowsNotesAndTheFrame() throws Exception {
        Path xvfbRun = ExternalTool.require("xvfb-run");
        ExternalTool.require("Xvfb");
        Path demo = dir.resolve("demo");
        ToolHarness.Result made = ToolHarness.of(new DemoTool()).option("out", demo.toString()).quiet(true).run();
        assertEquals(0, made.code(), made.err());

        // a decoded video line of the demo, from the command-line run's annotations
        Annotation line = firstLineAfter(demo.resolve("pixel/annotations.jsonl"), 2_000_000_000L);
        double spanFs = 4.0 * (line.endFs() - line.startFs());
        double atFs = (line.startFs() + line.endFs()) / 2.0;
        Path shot = dir.resolve("window.png");
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        List<String> cmd = new ArrayList<>(List.of(xvfbRun.toString(), "-a", "-s", "-screen 0 1800x2400x24",
                java, "-cp", System.getProperty("java.class.path"), "org.lanesift.runner.Main", "view",
                "--capture", demo.resolve("captures/pixel-link.bin").toString(),
                "--chain", demo.resolve("chains/pixel-3-decode.json").toString(),
                "--shot-when-done", shot.toString(), "--width", "1700", "--height", "2300",
                "--at", String.format(Locale.ROOT, "%.0ffs", atFs), "--span", String.format(Locale.ROOT, "%.0ffs", spanFs)));
        Path log = dir.resolve("viewer.log");
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile()).start();
        try {
            Poll.until(Duration.ofMinutes(3), "the viewer to run the chain, photograph its window and close", () -> !p.isAlive());
        } finally {
            p.destroyForcibly();
        }
        String out = Files.readString(log, StandardCharsets.UTF_8);
        assertEquals(0, p.exitValue(), out);
        ShotCheck s = ShotCheck.read(shot);

        for (String leg : List.of("CLK_P", "CLK_N", "D0_P", "D0_N", "D1_P", "D1_N", "D2_P", "D2_N")) {
            JsonValue r = s.row(leg);
            assertNotNull(r, "row " + leg + " is on the screen");
            int top = (int) r.get("top").asDouble();
            assertTrue(s.count(Palette.TRACE, s.xOf(atFs - spanFs / 2), top, 1000, Row.ANALOG_PX) > 100, "the trace of " + leg + " is drawn");
        }
        for (String lane : List.of("CLK", "D0", "D1", "D2")) {
            JsonValue r = rowOfKind(s, lane, "logic");
            assertNotNull(r, "the decoded logic row " + lane + " is on the screen");
            assertTrue(s.count(Palette.LOGIC, s.xOf(atFs - spanFs / 2), (int) r.get("top").asDouble(), 1000, Row.LOGIC_PX) > 100,
                    "the decoded edges of " + lane + " are drawn");
        }

        JsonValue lines = s.row(line.track());
        assertNotNull(lines, "the decoder's track " + line.track() + " has a row");
        int top = (int) lines.get("top").asDouble();
        int x0 = s.xOf(line.startFs());
        int x1 = s.xOf(line.endFs());
        assertTrue(x1 - x0 > 200, "the line spans half the plot: " + x0 + ".." + x1);
        java.awt.Color info = Palette.fill(Severity.INFO);
        assertTrue(s.count(info, (x0 + x1) / 2 - 1, top, 3, Row.LANE_PX) > 5, "the line's box is drawn over its time");
        assertEquals(0, s.count(info, x0 - 6, top, 4, Row.LANE_PX), "and does not start before its time");
        assertTrue(s.count(Palette.NOTE_TEXT, x0 + 1, top, 40, Row.LANE_PX) > 10,
                "its label '" + line.label() + "' is written at the start of its box");

        JsonValue f = s.layout().get("frame");
        assertNotNull(f, "a decoded frame is shown");
        long index = (long) f.get("index").asDouble();
        BufferedImage want = ImageIO.read(demo.resolve(String.format(Locale.ROOT, "pixel/panel-frame-%04d.png", index)).toFile());
        assertNotNull(want, "the command-line run wrote frame " + index + " as a PNG");
        int fx = (int) f.get("x").asDouble();
        int fy = (int) f.get("y").asDouble();
        double sx = f.get("width").asDouble() / want.getWidth();
        double sy = f.get("height").asDouble() / want.getHeight();
        int compared = 0;
        for (int py = 1; py < want.getHeight(); py += 5) {
            for (int px = 1; px < want.getWidth(); px += 5) {
                int x = fx + (int) ((px + 0.5) * sx);
                int y = fy + (int) ((py + 0.5) * sy);
                assertEquals(want.getRGB(px, py) & 0xFFFFFF, s.rgb(x, y), "frame pixel (" + px + ", " + py + ") on the screen");
                compared++;
            }
        }
        assertTrue(compared > 50);
    }

    private static JsonValue rowOfKind(ShotCheck s, String name, String kind) {
        for (JsonValue r : s.layout().get("rows").elements()) {
            if (r.get("name").asString().equals(name) && r.get("kind").asString().equals(kind)) {
                return r;
            }
        }
        return null;
    }

    private static Annotation firstLineAfter(Path jsonl, long afterFs) throws IOException {
        int n = 0;
        for (String text : Files.readAllLines(jsonl, StandardCharsets.UTF_8)) {
            n++;
            Annotation a = OutputFolder.annotation(jsonl, n, text);
            if (a.kind().equals("line") && a.startFs() >= afterFs) {
                return a;
            }
        }
        throw new AssertionError("no decoded line after " + afterFs + " fs in " + jsonl);
    }
}
