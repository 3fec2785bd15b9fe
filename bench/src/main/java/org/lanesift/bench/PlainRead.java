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
}
