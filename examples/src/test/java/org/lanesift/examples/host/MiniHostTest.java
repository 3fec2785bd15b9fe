package org.lanesift.examples.host;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.examples.demo.CaptureFiles;
import org.lanesift.examples.demo.Impairments;
import org.lanesift.examples.demo.PixelLinkScene;

class MiniHostTest {
    @Test
    void decodesTheDemoClockPair(@TempDir Path dir) throws Exception {
        PixelLinkScene.Capture c = PixelLinkScene.render(Impairments.pixelLinkDefaults());
        Path file = dir.resolve("pixel-link.bin");
        CaptureFiles.writeRaw(file, c.channels(), c.volts(), c.sampleRateHz(), 50e-6);
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream old = System.out;
        System.setOut(new PrintStream(buf, true, StandardCharsets.UTF_8));
        try {
            MiniHost.main(new String[] {file.toString(), "2.5e9", "8", "0", "1"});
        } finally {
            System.setOut(old);
        }
        String out = buf.toString(StandardCharsets.UTF_8);
        Matcher m = Pattern.compile("(\\d+) samples per leg, (\\d+) edges").matcher(out);
        assertTrue(m.find(), out);
        assertEquals(c.volts()[0].length, Long.parseLong(m.group(1)));
        // the clock lane toggles twice per pixel clock: 124 lines x 88 pixels
        long expected = 2L * PixelLinkScene.LINES * PixelLinkScene.H_TOTAL;
        assertEquals(expected, Long.parseLong(m.group(2)), 2, out);
    }
}
