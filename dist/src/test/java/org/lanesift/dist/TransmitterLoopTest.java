package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.BufferedWriter;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.runner.ChainRun;
import org.lanesift.testkit.ExternalTool;

/**
 * Closed loop of the pixel-link transmitter export ({@code docs/transmitter.md}). A user capture
 * (a 7:1 link written by this test as a VCD: invented timing, 18-bit slot mapping of
 * docs/reference-facts.md#pixel-link-clock-and-slot-mappings) is decoded by Lanesift's chain (vcd
 * reader, dual-edge sampler, pixel-link), which writes {@code panel-tx.v}. Icarus Verilog (Debian
 * {@code iverilog}) simulates that transmitter and writes a VCD (IEEE 1364-2005 clause 18); the
 * same chain decodes it. The timing, the mapping and every pixel of every complete frame must be
 * what was exported: the measured timing, and the test picture the export documents
 * (red = 5x + frame, green = 7y, blue = x XOR y, sent as the top six bits of each colour).
 */
class TransmitterLoopTest {
    // the user capture's timing (invented): H 24 active, 3 front, 4 sync, 5 back; V 10, 2, 2, 3;
    // HS active low, VS active high; 5 ns bit period (pixel clock 28.571 MHz)
    static final int HA = 24, HF = 3, HS = 4, HB = 5, VA = 10, VF = 2, VS = 2, VB = 3;
    static final int HT = HA + HF + HS + HB, VT = VA + VF + VS + VB;
    static final long UI_PS = 5000;
    // 18-bit mapping, slot 0 first (docs/reference-facts.md#pixel-link-clock-and-slot-mappings)
    static final String[][] BITS18 = {
        {"G0", "R5", "R4", "R3", "R2", "R1", "R0"},
        {"B1", "B0", "G5", "G4", "G3", "G2", "G1"},
        {"DE", "VS", "HS", "B5", "B4", "B3", "B2"},
    };
    static final int[] CLOCK = {1, 1, 0, 0, 0, 1, 1};

    @Test
    void generatedTransmitterDecodesToTheExportedTimingMappingAndPicture(@TempDir Path dir) throws Exception {
        Path iverilog = ExternalTool.require("iverilog");
        Path vvp = ExternalTool.require("vvp");
        writeUserCapture(dir.resolve("user.vcd"), 4 * HT * VT + 5 * HT);
        Path first = decode(dir, "user.vcd", "first");
        JsonValue exported = JsonReader.read(first.resolve("panel-timing.json"), "panel-timing.json");
        assertEquals(HA, num(exported, "/horizontal/active/value"));
        Path tx = first.resolve("panel-tx.v");
        assertTrue(Files.exists(tx), "no transmitter exported");

        long clockHz = Math.round(num(exported, "/pixelClockHz/value"));
        long halfPs = Math.round(1e12 / (clockHz * 7.0) / 2);
        int frames = 4;
        long runPs = 2 * halfPs * 7L * (frames * (long) HT * VT + 3L * HT);
        Files.writeString(dir.resolve("bench.v"), bench(3, halfPs, runPs));
        run(dir, List.of(iverilog.toString(), "-g2005", "-Wall", "-o", "tx.vvp", tx.toString(), "bench.v"));
        run(dir, List.of(vvp.toString(), "-n", "tx.vvp"));
        Path second = decode(dir, "tx.vcd", "second");
        JsonValue again = JsonReader.read(second.resolve("panel-timing.json"), "panel-timing.json (transmitter)");

        // timing and mapping as exported
        for (String p : List.of("/horizontal/active/value", "/horizontal/frontPorch/value", "/horizontal/syncWidth/value",
                "/horizontal/backPorch/value", "/horizontal/total/value", "/vertical/active/value", "/vertical/frontPorch/value",
                "/vertical/syncWidth/value", "/vertical/backPorch/value", "/vertical/total/value")) {
            assertEquals(num(exported, p), num(again, p), p);
        }
        assertEquals(exported.at("/horizontal/syncPolarity"), again.at("/horizontal/syncPolarity"));
        assertEquals(exported.at("/vertical/syncPolarity"), again.at("/vertical/syncPolarity"));
        assertEquals("negative", again.at("/horizontal/syncPolarity").asString());
        assertEquals("positive", again.at("/vertical/syncPolarity").asString());
        assertEquals(exported.at("/mapping"), again.at("/mapping"));
        assertEquals(1.0, num(again, "/pixelClockHz/value") / num(exported, "/pixelClockHz/value"), 1e-6);
        assertFalse(again.at("/horizontal/total/varying").asBoolean());

        // every pixel of every complete frame is the documented test picture of the transmitter's frame
        int complete = 0;
        for (int f = 0; f <= frames; f++) {
            Path png = second.resolve(String.format("panel-frame-%04d.png", f));
            if (!Files.exists(png)) {
                continue;
            }
            complete++;
            BufferedImage img = ImageIO.read(png.toFile());
            assertEquals(HA, img.getWidth());
            assertEquals(VA, img.getHeight());
            for (int y = 0; y < VA; y++) {
                for (int x = 0; x < HA; x++) {
                    assertEquals(Integer.toHexString(six(picture(x, y, f))), Integer.toHexString(img.getRGB(x, y) & 0xFFFFFF),
                            "frame " + f + " pixel " + x + "," + y);
                }
            }
        }
        assertTrue(complete >= 2, "complete frames: " + complete);
    }

    /** The export's test picture (docs/transmitter.md), 8 bits per colour. */
    static int picture(int x, int y, int frame) {
        return ((5 * x + frame) & 0xFF) << 16 | ((7 * y) & 0xFF) << 8 | ((x ^ y) & 0xFF);
    }

    /** What an 18-bit link carries of a colour: the top six bits, widened again by bit replication (common practice). */
    static int six(int rgb) {
        int out = 0;
        for (int sh = 0; sh <= 16; sh += 8) {
            int v6 = (rgb >> sh & 0xFF) >> 2;
            out |= ((v6 << 2) | (v6 >> 4)) << sh;
        }
        return out;
    }

    static double num(JsonValue v, String pointer) {
        return v.at(pointer).asDouble();
    }

    /** The chain that decodes this test's VCD (clock and three data lanes, 18-bit mapping, every picture). */
    static String decodeChain(String vcd) {
        return "{\"nodes\": [\n"
                + " {\"id\": \"cap\", \"plugin\": \"vcd\", \"options\": {\"file\": \"" + vcd + "\"}},\n"
                + " {\"id\": \"sampler\", \"plugin\": \"dual-edge\", \"options\": {\"mode\": \"multiplied\", \"slots\": 7, \"lanes\": 3}},\n"
                + " {\"id\": \"panel\", \"plugin\": \"pixel-link\", \"options\": {\"mapping\": \"bits-18\", \"pictures\": \"all\"}}],\n"
                + " \"wires\": [{\"from\": \"cap.clk_out\", \"to\": \"sampler.clock\"},\n"
                + "  {\"from\": \"cap.d0\", \"to\": \"sampler.lane0\"}, {\"from\": \"cap.d1\", \"to\": \"sampler.lane1\"},"
                + " {\"from\": \"cap.d2\", \"to\": \"sampler.lane2\"},\n"
                + "  {\"from\": \"sampler.bits0\", \"to\": \"panel.lane0\"}, {\"from\": \"sampler.bits1\", \"to\": \"panel.lane1\"},"
                + " {\"from\": \"sampler.bits2\", \"to\": \"panel.lane2\"}]}\n";
    }

    Path decode(Path dir, String vcd, String out) throws Exception {
        String chain = decodeChain(vcd);
        Path c = dir.resolve(out + "-chain.json");
        Files.writeString(c, chain);
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int code = ChainRun.of(c).out(dir.resolve(out)).quiet(true).run(new PrintStream(o, true, StandardCharsets.UTF_8),
                new PrintStream(e, true, StandardCharsets.UTF_8));
        assertEquals(0, code, o.toString(StandardCharsets.UTF_8) + e.toString(StandardCharsets.UTF_8));
        return dir.resolve(out);
    }

    /** A 7:1 link with the invented timing and random 6-bit colours, as scalar wires clk_out, d0..d2. */
    static void writeUserCapture(Path file, int pixels) throws Exception {
        Random rnd = new Random(20261203);
        int[] img = new int[HA * VA];
        for (int i = 0; i < img.length; i++) {
            img[i] = rnd.nextInt(1 << 24);
        }
        try (BufferedWriter w = Files.newBufferedWriter(file, StandardCharsets.US_ASCII)) {
            w.write("$timescale 1 ps $end\n$scope module user $end\n$var wire 1 ! clk_out $end\n$var wire 1 \" d0 $end\n"
                    + "$var wire 1 # d1 $end\n$var wire 1 $ d2 $end\n$upscope $end\n$enddefinitions $end\n");
            int[] last = {-1, -1, -1, -1};
            String codes = "!\"#$";
            int startLine = 3; // the capture starts in line 3 of a frame
            for (int p = 0; p < pixels; p++) {
                int q = p + startLine * HT;
                int h = q % HT;
                int v = (q / HT) % VT;
                boolean hs = h < HS;
                boolean vs = v < VS;
                boolean de = h >= HS + HB && h < HS + HB + HA && v >= VS + VB && v < VS + VB + VA;
                int rgb = de ? img[(v - VS - VB) * HA + (h - HS - HB)] : 0;
                for (int s = 0; s < 7; s++) {
                    StringBuilder line = new StringBuilder();
                    int[] now = new int[4];
                    now[0] = CLOCK[s];
                    for (int l = 0; l < 3; l++) {
                        now[l + 1] = bit(BITS18[l][s], rgb, de, !hs, vs); // HS active low, VS active high
                    }
                    for (int k = 0; k < 4; k++) {
                        if (now[k] != last[k]) {
                            line.append(now[k]).append(codes.charAt(k)).append('\n');
                            last[k] = now[k];
                        }
                    }
                    if (line.length() > 0) {
                        w.write("#" + ((long) p * 7 + s) * UI_PS + "\n" + line);
                    }
                }
            }
            w.write("#" + (long) pixels * 7 * UI_PS + "\n");
        }
    }

    static int bit(String name, int rgb, boolean de, boolean hs, boolean vs) {
        return switch (name) {
            case "DE" -> de ? 1 : 0;
            case "HS" -> hs ? 1 : 0;
            case "VS" -> vs ? 1 : 0;
            default -> {
                int shift = name.charAt(0) == 'R' ? 16 : name.charAt(0) == 'G' ? 8 : 0;
                int k = name.charAt(1) - '0';
                yield rgb >> (shift + 2 + k) & 1; // six-bit colour = top six bits of the eight
            }
        };
    }

    /** Test bench (not part of the export): bit clock, reset, and a dump of the clock and data lanes. */
    static String bench(int lanes, long halfPs, long runPs) {
        StringBuilder sb = new StringBuilder("`timescale 1ps/1ps\nmodule bench;\n    reg bitclk = 1'b0;\n    reg rst = 1'b1;\n")
                .append("    wire clk_out;\n    wire [").append(lanes - 1).append(":0] d;\n");
        List<String> dumps = new ArrayList<>(List.of("bench.clk_out"));
        for (int l = 0; l < lanes; l++) {
            sb.append("    wire d").append(l).append(" = d[").append(l).append("];\n");
            dumps.add("bench.d" + l);
        }
        sb.append("    panel_tx dut (.bitclk(bitclk), .rst(rst), .clk_out(clk_out), .d(d));\n")
                .append("    always #").append(halfPs).append(" bitclk = ~bitclk;\n")
                .append("    initial begin\n        $dumpfile(\"tx.vcd\");\n        $dumpvars(0, ").append(String.join(", ", dumps)).append(");\n")
                .append("        #").append(9 * halfPs).append(" rst = 1'b0;\n")
                .append("        #").append(runPs).append(" $finish;\n    end\nendmodule\n");
        return sb.toString();
    }

    static void run(Path dir, List<String> cmd) throws Exception {
        String out = ExternalTool.run(dir, Duration.ofSeconds(120), cmd);
        assertFalse(out.contains("warning"), cmd + ": " + out);
    }
}
