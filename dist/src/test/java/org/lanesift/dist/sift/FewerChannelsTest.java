package org.lanesift.dist.sift;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.kit.FramePictures;

/**
 * Recipe 1 of docs/fewer-channels.md, its chain taken from the page itself: the P legs of a
 * generated 7:1 capture (four of its eight legs, with its skews, noise and ringing) decode
 * pixel-exact through differential in mode single.
 */
class FewerChannelsTest {
    static String chainOf(String section) throws IOException {
        String doc = Files.readString(Path.of("..", "docs", "fewer-channels.md"));
        int at = doc.indexOf("```json", doc.indexOf(section)) + "```json".length();
        return doc.substring(at, doc.indexOf("```", at));
    }

    @Test
    void thePLegsOnFourChannelsDecodePixelExact(@TempDir Path dir) throws IOException {
        PixelLinkCapture gen = new PixelLinkCapture();
        gen.write(dir.resolve("p-legs.csv"), new String[] {"PCLK_P", "PCLK_N", "RX0_P", "RX0_N", "RX1_P", "RX1_N", "RX2_P", "RX2_N"}, 61);
        Path chain = dir.resolve("chain.json");
        Files.writeString(chain, chainOf("## 1. Four channels"));
        Path out = dir.resolve("out");
        SiftTest.Run r = SiftTest.lanesift("run", chain.toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        for (int f = 1; f <= 2; f++) {
            SiftTest.assertFrameExact(out.resolve(FramePictures.fileName("panel", f, false)), gen.frames.get(f));
        }
    }
}
