package org.lanesift.kit;

import java.awt.image.BufferedImage;
import java.awt.image.DataBufferInt;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.Iterator;
import java.util.Locale;
import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import javax.imageio.stream.MemoryCacheImageOutputStream;
import org.lanesift.data.Artifact;
import org.lanesift.data.Frame;

/**
 * The one picture writer: turns a decoded frame, or any drawn image, into PNG bytes (8 bits per
 * colour, no alpha; PNG is ISO/IEC 15948) and names frame pictures the one way documented in
 * {@code docs/outputs.md}: {@code <id>-frame-NNNN.png}, the frame index in at least four digits,
 * and {@code <id>-frame-NNNN-partial.png} for a frame the capture cut short. Works headless.
 */
public final class FramePictures {
    private FramePictures() {
    }

    /**
     * The file name of a frame picture.
     *
     * @param id      the stage instance id
     * @param index   frame index, from 0
     * @param partial whether the frame is incomplete
     * @return the name
     */
    public static String fileName(String id, long index, boolean partial) {
        return String.format(Locale.ROOT, "%s-frame-%04d%s.png", id, index, partial ? "-partial" : "");
    }

    /**
     * A frame as a PNG artifact under {@link #fileName}, spanning the frame's time.
     *
     * @param id the stage instance id (also the artifact's channel)
     * @param f  the frame, at least one pixel wide and high
     * @return the artifact
     */
    public static Artifact artifact(String id, Frame f) {
        return new Artifact(id, f.startFs(), f.endFs(), fileName(id, f.index(), f.partial()), "image/png",
                png(f.width(), f.height(), f.rgb()));
    }

    /**
     * Encodes packed 0xRRGGBB pixels, row by row from the top left, as PNG.
     *
     * @param widthPixels  width, at least 1
     * @param heightPixels height, at least 1
     * @param rgb          pixels, at least width times height
     * @return the PNG bytes
     */
    public static byte[] png(int widthPixels, int heightPixels, int[] rgb) {
        if (widthPixels < 1 || heightPixels < 1) {
            throw new IllegalArgumentException("a picture needs at least one pixel, got " + widthPixels + " x " + heightPixels);
        }
        BufferedImage img = new BufferedImage(widthPixels, heightPixels, BufferedImage.TYPE_INT_RGB);
        int[] dst = ((DataBufferInt) img.getRaster().getDataBuffer()).getData();
        int n = widthPixels * heightPixels;
        for (int i = 0; i < n; i++) {
            dst[i] = rgb[i] & 0xFFFFFF;
        }
        return png(img);
    }

    /**
     * Encodes a drawn image as PNG.
     *
     * @param img the image
     * @return the PNG bytes
     */
    public static byte[] png(BufferedImage img) {
        ByteArrayOutputStream bos = new ByteArrayOutputStream();
        Iterator<ImageWriter> writers = ImageIO.getImageWritersByFormatName("png");
        if (!writers.hasNext()) {
            throw new IllegalStateException("no PNG writer in this Java runtime");
        }
        ImageWriter w = writers.next();
        // in memory, never through ImageIO's disk cache: that cache registers a shutdown hook when it
        // opens, which fails while the JVM shuts down (Ctrl-C), and the picture would be lost
        try (ImageOutputStream ios = new MemoryCacheImageOutputStream(bos)) {
            w.setOutput(ios);
            w.write(null, new IIOImage(img, null, null), null);
        } catch (IOException e) {
            throw new UncheckedIOException("PNG encoding failed: " + e.getMessage(), e);
        } finally {
            w.dispose();
        }
        return bos.toByteArray();
    }
}
