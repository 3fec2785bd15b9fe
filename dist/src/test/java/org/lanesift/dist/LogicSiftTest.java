package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.kit.FramePictures;

/**
 * {@code sift} on a logic-only capture: the Verilog 7:1 serialiser (simulated with Icarus Verilog,
 * Debian package {@code iverilog}) writes a VCD of 1-bit lanes, re-timed here so that each data
 * lane arrives with its own skew. sift finds the clock and the lanes without a map, estimates the
 * lane skews on the logic edges and corrects them in the same run (no leg skew: there are no
 * legs), and decodes the pictures exactly.
 */
class LogicSiftTest {
    @TempDir
    Path tmp;

    /** Injected delay of lanes d0..d3 against the clock, ps (the VCD's timescale is 1 ps). */
    static final long[] LANE_SKEW_PS = {150, -90, 60, 0};

    @Test
    void aLogicVcdDecodesWithItsLaneSkewsMeasuredAndCorrected() throws Exception {
        int[] img = LogicCaptureRateTest.serialiserVcd(tmp, 1500);
        Path cap = tmp.resolve("skewed.vcd");
        Files.writeString(cap, skew(Files.readAllLines(tmp.resolve("link.vcd")),
                Map.of("d0", LANE_SKEW_PS[0], "d1", LANE_SKEW_PS[1], "d2", LANE_SKEW_PS[2], "d3", LANE_SKEW_PS[3])));
        Path out = tmp.resolve("o");
        EndToEndTest.Cli r = EndToEndTest.cli("sift", "--capture", cap.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        JsonValue report = JsonReader.parse("report.json", Files.readString(out.resolve("report.json")));
        assertEquals("vesa-24", report.at("/link/mapping/value").asString(), "4 data lanes: 24-bit");
        assertEquals(0, (int) report.at("/trust/errors").asDouble(), report.at("/trust").toString());
        assertEquals(0, (int) report.at("/result/frames/suspect").asDouble());
        long complete = (long) report.at("/result/frames/complete").asDouble();
        assertTrue(complete >= 3, "complete frames: " + complete);
        // the test bench's timing: H 16 active, 2 front porch, 3 sync, 3 back porch; V 8, 1, 1, 2 (tb_lvds71.v)
        assertEquals(24, (int) report.at("/result/timing/horizontal/total").asDouble());
        assertEquals(12, (int) report.at("/result/timing/vertical/total").asDouble());
        List<String> seen = new ArrayList<>();
        for (JsonValue s : report.at("/skews").elements()) {
            assertEquals("lane", s.get("kind").asString(), "a logic capture has no legs: " + s);
            int k = Integer.parseInt(s.get("channel").asString().substring(1));
            assertEquals(LANE_SKEW_PS[k], s.get("skewPs").asDouble(), 5, s.toString());
            seen.add(s.get("channel").asString());
        }
        assertEquals(List.of("d0", "d1", "d2", "d3"), seen);
        String chain = Files.readString(out.resolve("chains/sift.json"));
        assertTrue(!chain.contains("\"legs\"") && chain.contains("\"tables\""), chain);
        // pixel-exact: decoded frame k is the test bench's frame k (the capture starts inside frame 0), whose blue
        // channel is XORed with k
        for (int k = 1; k <= 2; k++) {
            BufferedImage png = ImageIO.read(out.resolve("decode").resolve(FramePictures.fileName("panel", k, false)).toFile());
            assertEquals(16, png.getWidth());
            assertEquals(8, png.getHeight());
            for (int y = 0; y < 8; y++) {
                for (int x = 0; x < 16; x++) {
                    int want = img[y * 16 + x] ^ k;
                    assertEquals(want, png.getRGB(x, y) & 0xFFFFFF, "frame " + k + " pixel " + x + "," + y);
                }
            }
        }
    }

    /**
     * The VCD with the changes of the named signals moved later by their skew (ps), and every change
     * 1 ns later so that none moves before time 0; time stamps re-sorted.
     */
    static String skew(List<String> lines, Map<String, Long> skewPs) {
        StringBuilder out = new StringBuilder();
        Map<String, Long> byCode = new HashMap<>();
        List<long[]> order = new ArrayList<>();
        List<String> changes = new ArrayList<>();
        boolean header = true;
        long now = 0;
        for (String l : lines) {
            if (header) {
                out.append(l).append('\n');
                String[] w = l.trim().split("\\s+");
                if (w.length >= 5 && w[0].equals("$var") && skewPs.containsKey(w[4])) {
                    byCode.put(w[3], skewPs.get(w[4]));
                }
                header = !l.startsWith("$enddefinitions");
                continue;
            }
            if (l.startsWith("#")) {
                now = Long.parseLong(l.substring(1).trim());
            } else if (!l.isBlank() && !l.startsWith("$")) {
                long t = now + 1000 + byCode.getOrDefault(l.substring(1).trim(), 0L);
                order.add(new long[] {t, changes.size()});
                changes.add(l);
            }
        }
        order.sort((a, b) -> a[0] != b[0] ? Long.compare(a[0], b[0]) : Long.compare(a[1], b[1]));
        long at = Long.MIN_VALUE;
        for (long[] o : order) {
            if (o[0] != at) {
                at = o[0];
                out.append('#').append(at).append('\n');
            }
            out.append(changes.get((int) o[1])).append('\n');
        }
        return out.toString();
    }
}
