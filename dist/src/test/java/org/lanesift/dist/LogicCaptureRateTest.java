package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.time.Duration;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.json.JsonWriter;
import org.lanesift.testkit.ExternalTool;

/**
 * End to end through the command line: the 7:1 serialiser written in Verilog (the pixel-link
 * module's test bench, simulated with Icarus Verilog, Debian package {@code iverilog}) writes a
 * VCD; read as a logic capture it decodes with no warning and no error. The same VCD re-timed as a
 * 100 MS/s logic capture (every change seen at the next 10 ns sample; the link's unit interval is
 * 1 ns) is refused with exit code 2 and one line naming the lane and the capture's rate
 * (docs/sampling-rate.md: at least 2 samples per unit interval).
 */
class LogicCaptureRateTest {
    @TempDir
    Path tmp;

    /**
     * Simulates the pixel-link module's Verilog 7:1 serialiser test bench with Icarus Verilog.
     *
     * @param dir    the working folder
     * @param pixels pixel clocks to simulate
     * @return the 16 x 8 picture it sent (24-bit RRGGBB, row-major; frame f has blue XORed with f)
     *         and {@code dir/link.vcd} written
     */
    static int[] serialiserVcd(Path dir, int pixels) throws Exception {
        Path iverilog = ExternalTool.require("iverilog");
        Path vvp = ExternalTool.require("vvp");
        Path src = Path.of("..", "plugins", "pixel-link", "src", "test", "verilog").toAbsolutePath().normalize();
        StringBuilder hex = new StringBuilder();
        Random r = new Random(20261203);
        int[] img = new int[16 * 8];
        for (int i = 0; i < img.length; i++) {
            img[i] = r.nextInt(1 << 24);
            hex.append(String.format("%06x%n", img[i]));
        }
        Files.writeString(dir.resolve("image.hex"), hex);
        exec(dir, List.of(iverilog.toString(), "-g2005", "-o", "sim.vvp", src.resolve("lvds71_tx.v").toString(),
                src.resolve("tb_lvds71.v").toString()));
        exec(dir, List.of(vvp.toString(), "-n", "sim.vvp", "+image=image.hex", "+vcd=link.vcd", "+pixels=" + pixels));
        return img;
    }

    @Test
    void aCleanSerialiserCaptureGivesNoFindingAndTheSameCaptureTooSlowIsRefused() throws Exception {
        serialiserVcd(tmp, 1500);
        Path clean = tmp.resolve("link.vcd");
        EndToEndTest.Cli ok = EndToEndTest.cli("run", chain("fast.json", clean).toString(), "--out", tmp.resolve("o1").toString(), "-q");
        assertEquals(0, ok.code(), ok.err());
        List<String> findings = new ArrayList<>();
        int frames = 0;
        for (String line : Files.readAllLines(tmp.resolve("o1").resolve("annotations.jsonl"))) {
            JsonValue a = JsonReader.parse("annotations.jsonl", line);
            String severity = a.get("severity").asString();
            if (!severity.equals("info")) {
                findings.add(a.get("kind").asString() + ": " + a.get("label").asString());
            }
            if (a.get("kind").asString().equals("frame")) {
                frames++;
            }
        }
        assertTrue(findings.isEmpty(), findings.toString());
        assertTrue(frames >= 4, "frames " + frames);

        Path slow = tmp.resolve("slow.vcd");
        Files.writeString(slow, retime(Files.readAllLines(clean), 10_000)); // timescale 1 ps: 10 ns
        EndToEndTest.Cli refused = EndToEndTest.cli("run", chain("slow.json", slow).toString(), "--out", tmp.resolve("o2").toString(), "-q");
        assertEquals(2, refused.code(), refused.err());
        assertEquals(1, refused.errLines().size(), refused.err());
        String msg = refused.errLines().get(0);
        assertTrue(msg.contains("lane0") && msg.contains("sample grid (100 MS/s)") && msg.contains("at least 2 samples per unit interval"), msg);
    }

    /** The VCD as a logic capture at one sample every {@code stepTicks}: each change shows at the next sample. */
    static String retime(List<String> lines, long stepTicks) {
        StringBuilder out = new StringBuilder();
        Map<String, String> pending = new LinkedHashMap<>();
        boolean header = true;
        long at = -1;
        for (String l : lines) {
            if (header) {
                out.append(l).append('\n');
                header = !l.startsWith("$enddefinitions");
                continue;
            }
            if (l.startsWith("#")) {
                long t = Long.parseLong(l.substring(1).trim());
                long q = Math.floorDiv(t + stepTicks - 1, stepTicks) * stepTicks;
                if (q != at) {
                    flush(out, at, pending);
                    at = q;
                }
            } else if (!l.isBlank() && !l.startsWith("$")) {
                pending.put(l.substring(1), l); // scalar change: value then identifier code
            }
        }
        flush(out, at, pending);
        return out.toString();
    }

    private static void flush(StringBuilder out, long at, Map<String, String> pending) {
        if (!pending.isEmpty()) {
            out.append('#').append(at).append('\n');
            pending.values().forEach(v -> out.append(v).append('\n'));
            pending.clear();
        }
    }

    private Path chain(String name, Path vcd) throws Exception {
        StringBuilder wires = new StringBuilder("{\"from\":\"cap.clk_out\",\"to\":\"sampler.clock\"}");
        for (int l = 0; l < 4; l++) {
            wires.append(",{\"from\":\"cap.d").append(l).append("\",\"to\":\"sampler.lane").append(l).append("\"}");
            wires.append(",{\"from\":\"sampler.bits").append(l).append("\",\"to\":\"panel.lane").append(l).append("\"}");
        }
        String json = "{\"nodes\":[{\"id\":\"cap\",\"plugin\":\"vcd\",\"options\":{\"file\":" + JsonWriter.quote(vcd.toString()) + "}},"
                + "{\"id\":\"sampler\",\"plugin\":\"dual-edge\",\"options\":{\"mode\":\"multiplied\",\"slots\":7,\"lanes\":4}},"
                + "{\"id\":\"panel\",\"plugin\":\"pixel-link\",\"options\":{\"mapping\":\"vesa-24\",\"pictures\":\"none\"}}],"
                + "\"wires\":[" + wires + "]}";
        Path p = tmp.resolve(name);
        Files.writeString(p, json);
        return p;
    }

    private static void exec(Path dir, List<String> cmd) throws Exception {
        ExternalTool.run(dir, Duration.ofSeconds(120), cmd);
    }
}
