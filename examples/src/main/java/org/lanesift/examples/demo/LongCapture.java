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
        PixelLinkScene.Capture tile = PixelLinkScene.render(Impairments.pixelLinkDefaults(), 0, PixelLinkScene.V_TOTAL, false);
        Path one = Files.createTempFile("lanesift-frame", ".bin");
        CaptureFiles.writeRaw(one, tile.channels(), tile.volts(), tile.sampleRateHz(), 50e-6);
        byte[] frame = Files.readAllBytes(one);
        String sidecar = Files.readString(Path.of(one + ".json"));
        Files.delete(one);
        Files.delete(Path.of(one + ".json"));
        long copies = (long) Math.ceil(gb * 1e9 / frame.length);
        try (OutputStream o = new BufferedOutputStream(Files.newOutputStream(file), 1 << 22)) {
            for (long i = 0; i < copies; i++) {
                o.write(frame);
            }
        }
        Files.writeString(Path.of(file + ".json"), sidecar);
        System.out.printf("%s: %d frames, %d bytes, %d samples per channel%n", file, copies, copies * frame.length,
                copies * frame.length / 16);
    }
}
