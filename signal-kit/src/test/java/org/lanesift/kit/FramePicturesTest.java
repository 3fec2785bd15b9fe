package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.util.Random;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.lanesift.data.Artifact;
import org.lanesift.data.Frame;

class FramePicturesTest {
    @Test
    void oneNamingScheme() {
        assertEquals("panel-frame-0000.png", FramePictures.fileName("panel", 0, false));
        assertEquals("dsi-frame-0042-partial.png", FramePictures.fileName("dsi", 42, true));
        assertEquals("x-frame-123456.png", FramePictures.fileName("x", 123456, false));
    }

    @Test
    void pixelsSurviveTheRoundTrip() throws IOException {
        Random r = new Random(4);
        int w = 37;
        int h = 11;
        int[] rgb = new int[w * h];
        for (int i = 0; i < rgb.length; i++) {
            rgb[i] = r.nextInt(); // the top byte is not a colour and must not matter
        }
        byte[] png = FramePictures.png(w, h, rgb);
        // Source: the JDK's own PNG reader (javax.imageio) decodes what we wrote
        BufferedImage back = ImageIO.read(new ByteArrayInputStream(png));
        assertEquals(w, back.getWidth());
        assertEquals(h, back.getHeight());
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                assertEquals(rgb[y * w + x] & 0xFFFFFF, back.getRGB(x, y) & 0xFFFFFF, "pixel " + x + "," + y);
            }
        }
        // PNG signature (ISO/IEC 15948 clause 5.2): 137 80 78 71 13 10 26 10
        assertEquals((byte) 137, png[0]);
        assertEquals('P', png[1]);
        assertEquals('N', png[2]);
        assertEquals('G', png[3]);
    }

    @Test
    void frameArtifactIsNamedAndTimed() throws IOException {
        int[] rgb = {0xFF0000, 0x00FF00, 0x0000FF, 0xFFFFFF};
        Frame f = new Frame("panel", 1_000, 9_000, 3, 2, 2, rgb, false, false);
        Artifact a = FramePictures.artifact("panel", f);
        assertEquals("panel-frame-0003.png", a.fileName());
        assertEquals("image/png", a.mediaType());
        assertEquals(1_000, a.startFs());
        BufferedImage back = ImageIO.read(new ByteArrayInputStream(a.content()));
        assertEquals(0x0000FF, back.getRGB(0, 1) & 0xFFFFFF);
    }

    @Test
    void anEmptyPictureIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> FramePictures.png(0, 5, new int[0]));
    }

    /**
     * Ctrl-C runs the JVM's shutdown hooks; a picture encoded then must still be made (ImageIO's disk
     * cache would register a hook of its own and fail with "Shutdown in progress").
     */
    @Test
    void encodesWhileTheJvmShutsDown() throws Exception {
        String javaBin = java.nio.file.Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process p = new ProcessBuilder(javaBin, "-Djava.awt.headless=true", "-cp", System.getProperty("java.class.path"),
                PictureAtShutdown.class.getName()).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8).trim();
        assertEquals(true, p.waitFor(60, java.util.concurrent.TimeUnit.SECONDS));
        assertEquals(true, out.startsWith("png "), out);
    }
}
