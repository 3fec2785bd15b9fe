package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ExternalTool;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.Frame;
import org.lanesift.testkit.StageHarness;

/**
 * An independent serialiser written in Verilog (src/test/verilog) and simulated with Icarus
 * Verilog (Debian package {@code iverilog}) writes a VCD of a 16 x 8 picture on a 7:1 link; the
 * decoder must recover the picture pixel for pixel. Skipped when iverilog is missing, unless
 * {@code CI=true}, where it fails.
 */
class VerilogSerialiserTest {

    static void run(Path dir, List<String> cmd) throws Exception {
        Process p = new ProcessBuilder(cmd).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve("log-" + Path.of(cmd.get(0)).getFileName() + ".txt").toFile()).start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail(cmd + " did not finish in 120 s");
        }
        if (p.exitValue() != 0) {
            fail(cmd + " exited with " + p.exitValue() + ": "
                    + Files.readString(dir.resolve("log-" + Path.of(cmd.get(0)).getFileName() + ".txt")));
        }
    }

    @Test
    void verilogSerialisedPictureIsRecovered(@TempDir Path dir) throws Exception {
        Path iverilog = ExternalTool.require("iverilog");
        Path vvp = ExternalTool.require("vvp");
        Path src = Path.of("src", "test", "verilog").toAbsolutePath();
        int[] img = new int[16 * 8];
        Random r = new Random(20261201);
        StringBuilder hex = new StringBuilder();
        for (int i = 0; i < img.length; i++) {
            img[i] = r.nextInt(1 << 24);
            hex.append(String.format("%06x%n", img[i]));
        }
        Files.writeString(dir.resolve("image.hex"), hex);
        run(dir, List.of(iverilog.toString(), "-g2005", "-o", "sim.vvp", src.resolve("lvds71_tx.v").toString(),
                src.resolve("tb_lvds71.v").toString()));
        int pixels = 7 * 24 + 3 * 288 + 6 * 24; // to line 5 of frame 4
        run(dir, List.of(vvp.toString(), "-n", "sim.vvp", "+image=image.hex", "+vcd=link.vcd", "+pixels=" + pixels));

        MiniVcd vcd = MiniVcd.read(dir.resolve("link.vcd"));
        List<Long> rises = vcd.signal("clk_out").risingEdges();
        assertTrue(rises.size() > pixels - 10, "clock edges: " + rises.size());
        MiniVcd.Signal[] lanes = {vcd.signal("d0"), vcd.signal("d1"), vcd.signal("d2"), vcd.signal("d3")};
        // sample at slot centres: the clock lane rises at the start of slot 5, so slot 0 of the next
        // pixel starts 2/7 of a period after the rising edge (docs/reference-facts.md#pixel-link-clock-and-slot-mappings: clock high in slots 0-1 and 5-6)
        int n = rises.size() - 1;
        try (StageHarness h = StageHarness.of(new PixelLinkPlugin(), Map.of("pictures", "all", "mapping", "vesa-24"))) {
            int block = 100;
            for (int k0 = 0; k0 < n; k0 += block) {
                int cnt = Math.min(block, n - k0);
                for (int l = 0; l < 4; l++) {
                    h.push("lane" + l, sample(lanes[l], "lane" + l, rises, k0, cnt));
                }
            }
            h.finish();
            List<Frame> frames = h.outputs("frames", Frame.class);
            List<Frame> complete = new ArrayList<>();
            for (Frame f : frames) {
                if (!f.partial()) {
                    complete.add(f);
                }
            }
            assertEquals(3, complete.size(), frames.toString());
            assertTrue(frames.get(0).partial());
            assertTrue(frames.get(frames.size() - 1).partial());
            for (Frame f : complete) {
                assertEquals(16, f.width());
                assertEquals(8, f.height());
                int[] expect = new int[img.length];
                for (int i = 0; i < img.length; i++) {
                    expect[i] = img[i] ^ (int) (f.index() & 0xFF); // the bench XORs blue with the frame number
                }
                assertArrayEquals(expect, f.rgb(), "frame " + f.index());
                assertFalse(f.suspect());
            }
            Report rep = Report.of(h);
            assertEquals(16, rep.num("horizontal/active/value"));
            assertEquals(2, rep.num("horizontal/frontPorch/value"));
            assertEquals(3, rep.num("horizontal/syncWidth/value"));
            assertEquals(3, rep.num("horizontal/backPorch/value"));
            assertEquals(24, rep.num("horizontal/total/value"));
            assertEquals(8, rep.num("vertical/active/value"));
            assertEquals(1, rep.num("vertical/frontPorch/value"));
            assertEquals(1, rep.num("vertical/syncWidth/value"));
            assertEquals(2, rep.num("vertical/backPorch/value"));
            assertEquals(12, rep.num("vertical/total/value"));
            assertEquals("negative", rep.str("horizontal/syncPolarity"));
            assertEquals("negative", rep.str("vertical/syncPolarity"));
            assertEquals(Math.round(1e12 / 7000), rep.num("pixelClockHz/value")); // 7 ns pixel period in the bench
            assertTrue(FrameAssemblyTest.pngs(h).contains("dut-frame-0001.png"));
            // a clean capture gives no warning and no error: the frames cut by the capture window at
            // either end are stated as information (partial), once each as a frame and once as the reason
            List<String> findings = new ArrayList<>();
            for (org.lanesift.annotation.Annotation a : h.annotations()) {
                if (a.severity() != org.lanesift.annotation.Severity.INFO) {
                    findings.add(a.kind() + " " + a.label());
                }
            }
            assertTrue(findings.isEmpty(), findings.toString());
            assertEquals(2, h.annotations("partial-frame").size());
        }
    }

    static BitStream sample(MiniVcd.Signal s, String name, List<Long> rises, int k0, int cnt) {
        int nb = cnt * 7;
        long[] values = new long[BitSets.words(nb)];
        long[] times = new long[nb];
        long[] edges = new long[nb];
        byte[] slot = new byte[nb];
        long[] setup = new long[nb];
        long[] hold = new long[nb];
        double ui = 0;
        for (int c = 0; c < cnt; c++) {
            int k = k0 + c;
            long rise = rises.get(k);
            double period = rises.get(k + 1) - rise;
            ui = period / 7;
            for (int sl = 0; sl < 7; sl++) {
                int i = c * 7 + sl;
                long t = Math.round(rise + (2 + sl + 0.5) * ui);
                int v = s.at(t);
                if (v == 1) {
                    values[i >>> 6] |= 1L << i;
                }
                times[i] = t;
                edges[i] = k;
                slot[i] = (byte) sl;
                setup[i] = Math.round(ui / 2);
                hold[i] = Math.round(ui / 2);
            }
        }
        long[] flagged = new long[BitSets.words(nb)];
        for (int i = 0; i < nb; i++) {
            if (s.at(times[i]) < 0) {
                flagged[i >>> 6] |= 1L << i; // x or z: suspect
            }
        }
        return new BitStream(name, rises.get(k0), rises.get(k0 + cnt), nb, values, times, edges, new long[BitSets.words(nb)], slot,
                setup, hold, flagged, ui);
    }
}
