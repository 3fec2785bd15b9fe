package org.lanesift.dist.sift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.kit.FramePictures;

/**
 * End to end from the command line: an 8-channel logic analyser's packed export (one byte per
 * sample, docs/capture-raw.md "Packed logic captures") of a 7:1 pixel link, with the clock and the
 * three lanes on bits 5, 0, 3, 6 and unrelated activity on the other four, decodes pixel-exact
 * through the worked example's chain of docs/capture-raw.md (packed-logic, logic-edges, dual-edge,
 * pixel-link); a file one byte short of a 16-bit
 * word, and a sidecar naming more channels than the word holds, are refused with exit 2 and one line.
 */
class PackedLogicDecodeTest {
    /** 500 MS/s against a 5.714 ns unit interval: 2.86 samples per UI (docs/sampling-rate.md: at least 2). */
    static final double RATE_HZ = 500e6;

    @Test
    void anEightChannelPackedExportDecodesPixelExact(@TempDir Path dir) throws IOException {
        LogicLink link = new LogicLink(515);
        Random rnd = new Random(7);
        int n = (int) (3.4 * LogicLink.FRAME_S * RATE_HZ);
        double[] delayS = {0, 150e-12, -120e-12, 60e-12};
        boolean[][] ch = new boolean[4][];
        for (int lane = 0; lane < 4; lane++) {
            ch[lane] = link.sample(lane, 0, RATE_HZ, n, delayS[lane], 40e-12, rnd);
        }
        Path cap = dir.resolve("analyser.bin");
        Files.write(cap, LogicLink.logic8(ch, new int[] {5, 0, 3, 6}, new Random(3)));
        Files.writeString(dir.resolve("analyser.bin.json"), "{\"rateHz\": 5e8, \"format\": \"logic8\", \"channels\": ["
                + "{\"name\": \"PCLK\", \"bit\": 5}, {\"name\": \"RX0\", \"bit\": 0}, {\"name\": \"RX1\", \"bit\": 3},"
                + " {\"name\": \"RX2\", \"bit\": 6}]}");
        Path chain = dir.resolve("chain.json");
        // the chain of the worked example in docs/capture-raw.md, taken from the document itself
        String doc = Files.readString(Path.of("..", "docs", "capture-raw.md"));
        int at = doc.indexOf("```json", doc.indexOf("### Worked example: an 8-channel analyser")) + "```json".length();
        Files.writeString(chain, doc.substring(at, doc.indexOf("```", at)));
        Path out = dir.resolve("out");
        SiftTest.Run r = SiftTest.lanesift("run", chain.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        for (int f = 1; f <= 2; f++) {
            SiftTest.assertFrameExact(out.resolve(FramePictures.fileName("panel", f, false)), link.gen.frames.get(0));
        }

        // inspect reads the same file as logic, with the rate and the clock
        SiftTest.Run ins = SiftTest.lanesift("inspect", cap.toString(), "--json");
        assertEquals(0, ins.code(), ins.err());
        var report = org.lanesift.json.JsonReader.parse("inspect", ins.out());
        assertEquals("packed-logic", report.get("format").asString());
        assertEquals("PCLK", report.at("/clocks/0/channel").asString());
        assertEquals(PixelLinkCapture.PIXEL_CLOCK_HZ, report.at("/clocks/0/frequencyHz").asDouble(), 1e3);
    }

    @Test
    void aFileOfHalfAWordAndTooManyChannelsAreRefusedWithOneLine(@TempDir Path dir) throws IOException {
        Path cap = dir.resolve("odd.bin");
        Files.write(cap, new byte[1001]);
        Files.writeString(dir.resolve("odd.bin.json"), "{\"rateHz\": 1e8, \"format\": \"logic16le\", \"channels\": [{\"name\": \"A\", \"bit\": 9}]}");
        SiftTest.Run r = SiftTest.lanesift("inspect", cap.toString());
        assertEquals(2, r.code(), r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().contains("odd.bin: 1001 bytes is not a whole number of logic16le sample words; expected a multiple of 2 bytes"),
                r.err());

        StringBuilder nine = new StringBuilder();
        for (int i = 0; i < 9; i++) {
            nine.append(i == 0 ? "" : ",").append("{\"name\": \"c").append(i).append("\", \"bit\": ").append(i % 8).append('}');
        }
        Files.write(cap, new byte[1000]);
        Files.writeString(dir.resolve("odd.bin.json"), "{\"rateHz\": 1e8, \"format\": \"logic8\", \"channels\": [" + nine + "]}");
        SiftTest.Run many = SiftTest.lanesift("inspect", cap.toString());
        assertEquals(2, many.code(), many.err());
        assertEquals(1, many.err().lines().count(), many.err());
        assertTrue(many.err().contains("odd.bin.json: /channels: 9 channels named; a logic8 sample word holds at most 8"), many.err());
    }
}
