package org.lanesift.examples.demo;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Writes a long raw capture for the bounded-memory check: one frame of the demo pixel link,
 * rendered once, laid end to end until the file reaches the requested size (a frame is exactly
 * 528000 samples, so the copies join without a seam in the timing).
 *
 * <p>Usage: {@code LongCapture FILE GIGABYTES}.
 */
public final class LongCapture {
    private LongCapture() {
    }

    /**
     * Writes the file and its sidecar.
     *
     * @param args destination and size in GB (10^9 bytes)
     * @throws IOException on write failure
     */
    public static void main(String[] args) throws IOException {
        if (args.length != 2) {
            System.err.println("usage: LongCapture FILE GIGABYTES");
            System.exit(2);
        }
        Path file = Path.of(args[0]);
        double gb = Double.parseDouble(args[1]);
        long bytes = write(file, gb * 1e9);
        long copies = bytes / FRAME_BYTES;
        System.out.printf("%s: %d frames, %d bytes, %d samples per channel%n", file, copies, bytes, bytes / 16);
    }

    /** Bytes of one picture frame of the demo pixel link: 528000 samples of 8 int16 channels. */
    public static final long FRAME_BYTES = 528_000L * 16;

    /**
     * Writes whole copies of one rendered picture frame until the file holds at least the given size.
     *
     * @param file  destination; its sidecar is {@code file + ".json"}
     * @param bytes minimum size
     * @return bytes written
     * @throws IOException on write failure
     */
    public static long write(Path file, double bytes) throws IOException {
        PixelLinkScene.Capture tile = PixelLinkScene.render(Impairments.pixelLinkDefaults(), 0, PixelLinkScene.V_TOTAL, false);
        Path one = Files.createTempFile("lanesift-frame", ".bin");
        CaptureFiles.writeRaw(one, tile.channels(), tile.volts(), tile.sampleRateHz(), 50e-6);
        byte[] frame = Files.readAllBytes(one);
        String sidecar = Files.readString(Path.of(one + ".json"));
        Files.delete(one);
        Files.delete(Path.of(one + ".json"));
        if (frame.length != FRAME_BYTES) {
            throw new IllegalStateException("a rendered frame has " + frame.length + " bytes, expected " + FRAME_BYTES);
        }
        long copies = Math.max(1, (long) Math.ceil(bytes / frame.length));
        try (OutputStream o = new BufferedOutputStream(Files.newOutputStream(file), 1 << 22)) {
            for (long i = 0; i < copies; i++) {
                o.write(frame);
            }
        }
        Files.writeString(Path.of(file + ".json"), sidecar);
        return copies * frame.length;
    }
}
