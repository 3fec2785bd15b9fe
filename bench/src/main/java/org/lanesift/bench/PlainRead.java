package org.lanesift.bench;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;

/**
 * The yardstick of the file-reading benchmarks: a plain sequential read of a file through one
 * 1 MiB buffer, every byte folded into a result (longs XORed) so nothing is optimised away.
 * A reader's speed is reported as this read's time divided by the reader's, measured in one run.
 */
public final class PlainRead {
    private PlainRead() {
    }

    /**
     * Reads the whole file once.
     *
     * @param file the file
     * @return the XOR of its longs and trailing bytes
     * @throws IOException on read errors
     */
    public static long xorAll(Path file) throws IOException {
        long x = 0;
        ByteBuffer bb = ByteBuffer.allocate(1 << 20);
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ)) {
            while (ch.read(bb.clear()) > 0) {
                bb.flip();
                while (bb.remaining() >= 8) {
                    x ^= bb.getLong();
                }
                while (bb.hasRemaining()) {
                    x ^= bb.get();
                }
            }
        }
        return x;
    }

    /**
     * The in-memory yardstick of the leg benchmarks: reads the first {@code n} samples of every pair
     * of arrays once, each folded into the result so nothing is optimised away.
     *
     * @param p first legs, one array per block
     * @param q second legs, as many as {@code p}
     * @param n samples per block
     * @return a sum of the samples' bit patterns
     */
    public static int foldLegs(float[][] p, float[][] q, int n) {
        int x = 0;
        for (int k = 0; k < p.length; k++) {
            float[] a = p[k];
            float[] b = q[k];
            for (int i = 0; i < n; i++) {
                x += Float.floatToRawIntBits(a[i]) ^ Float.floatToRawIntBits(b[i]);
            }
        }
        return x;
    }
}
