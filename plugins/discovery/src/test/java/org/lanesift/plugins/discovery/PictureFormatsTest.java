package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Comparator;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Every candidate pixel format, red-first and blue-first, byte-swapped 16-bit included: a smooth
 * picture sent in that format is found with its line length, among the first two candidates
 * (smoothness cannot tell a picture from its red/blue twin, which is the other of the two), and
 * loosely packed 18-bit colour is told from 24-bit colour by its padding bits. Invented pictures.
 */
class PictureFormatsTest {
    static final int WIDTH = 53;
    static final int HEIGHT = 30;

    @Test
    void everyFormatIsFoundWithItsLineLengthAmongTheFirstTwoCandidates() {
        for (PixelFormat f : PixelFormat.values()) {
            int[] want = new int[WIDTH * HEIGHT];
            long[] data = encode(f, want);
            List<PictureCandidate> c = PictureFinder.candidates(data, WIDTH * HEIGHT * f.bitsPerPixel, "test");
            c.sort(Comparator.comparingDouble(PictureCandidate::smoothness).reversed());
            assertTrue(c.size() >= 2, f.label);
            PictureCandidate hit = c.get(0).format() == f ? c.get(0) : c.get(1);
            assertEquals(f, hit.format(), () -> f.label + ": first two " + c.get(0).format().label + ", " + c.get(1).format().label);
            assertEquals(f.twin(), (hit == c.get(0) ? c.get(1) : c.get(0)).format(), f.label);
            assertEquals(WIDTH, hit.lineLength(), f.label);
            for (int i = 0; i < hit.rgb().length; i++) {
                assertEquals(want[i], hit.rgb()[i], f.label + " pixel " + i);
            }
        }
    }

    @Test
    void twinsSwapRedAndBlueAndByteSwappingExchangesTheBytesOfA16BitPixel() {
        // 0xF800 is full red in rgb565 (red in the top 5 bits); the byte-swapped pixel sends 0x00F8
        assertEquals(0xFF0000, PixelFormat.RGB565.rgb(0xF800));
        assertEquals(0x0000FF, PixelFormat.BGR565.rgb(0xF800));
        assertEquals(0xFF0000, PixelFormat.RGB565_BYTE_SWAPPED.rgb(0x00F8));
        assertEquals(0x00F8L, PixelFormat.RGB565_BYTE_SWAPPED.raw(31, 0, 0));
        assertEquals(0x0000FF, PixelFormat.BGR888.rgb(0xFF0000));
        for (PixelFormat f : PixelFormat.values()) {
            assertEquals(f, f.twin().twin());
            assertFalse(f.twin() == f);
        }
    }

    /** A smooth picture (two gradients and a round blob per component) in format {@code f}, MSB first; {@code rgb} gets what it shows. */
    static long[] encode(PixelFormat f, int[] rgb) {
        int[] d = f.depths();
        int bpp = f.bitsPerPixel;
        long[] out = new long[(WIDTH * HEIGHT * bpp + 63) / 64 + 1];
        int n = 0;
        for (int y = 0; y < HEIGHT; y++) {
            for (int x = 0; x < WIDTH; x++) {
                int[] c = new int[3];
                for (int ch = 0; ch < 3; ch++) {
                    double cx = WIDTH * (0.2 + 0.3 * ch);
                    double cy = HEIGHT * (0.7 - 0.2 * ch);
                    double v = 0.2 + 0.3 * x / WIDTH * (ch + 1) / 3 + 0.2 * y / HEIGHT
                            + 0.3 * Math.exp(-((x - cx) * (x - cx) + (y - cy) * (y - cy)) / 60.0);
                    int max = (1 << d[ch]) - 1;
                    c[ch] = (int) Math.round(Math.min(1, v) * max);
                }
                long raw = f.raw(c[0], c[1], c[2]);
                rgb[y * WIDTH + x] = f.rgb(raw);
                for (int j = bpp - 1; j >= 0; j--) {
                    if ((raw >>> j & 1L) != 0) {
                        out[n >>> 6] |= 1L << n;
                    }
                    n++;
                }
            }
        }
        return out;
    }
}
