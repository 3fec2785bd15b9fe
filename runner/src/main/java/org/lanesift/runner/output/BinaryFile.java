package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;

/**
 * The shared frame of the packed binary outputs (docs/bits-binary.md): a 32-byte little-endian
 * header (8-byte magic, version, header length, one format field, a count written at close and
 * -1 until then) followed by what the format appends, through one reused 1 MiB buffer.
 */
final class BinaryFile implements Closeable {
    /** Header length in bytes. */
    static final int HEADER_BYTES = 32;
    /** Format version written in the header. */
    static final int VERSION = 1;
    private static final int COUNT_AT = 24;
    private final FileChannel ch;
    private final ByteBuffer buf = ByteBuffer.allocateDirect(1 << 20).order(ByteOrder.LITTLE_ENDIAN);
    private long count;
    private boolean closed;

    /**
     * Creates the file and writes its header.
     *
     * @param file        the file
     * @param magic       eight ASCII characters
     * @param formatField the format's own header field at byte 16 (8 bytes)
     */
    BinaryFile(Path file, String magic, long formatField) throws IOException {
        byte[] m = magic.getBytes(StandardCharsets.US_ASCII);
        if (m.length != 8) {
            throw new IllegalArgumentException("magic must be 8 ASCII characters: " + magic);
        }
        ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.TRUNCATE_EXISTING, StandardOpenOption.WRITE);
        buf.put(m).putInt(VERSION).putInt(HEADER_BYTES).putLong(formatField).putLong(-1L);
    }

    /** Room for at least {@code bytes} more bytes in the buffer (at most the buffer's size). */
    ByteBuffer room(int bytes) throws IOException {
        if (buf.remaining() < bytes) {
            drain();
        }
        return buf;
    }

    /** Adds to the count written into the header at close. */
    void counted(long n) {
        count += n;
    }

    /** The items counted so far. */
    long count() {
        return count;
    }

    private void drain() throws IOException {
        buf.flip();
        while (buf.hasRemaining()) {
            ch.write(buf);
        }
        buf.clear();
    }

    @Override
    public void close() throws IOException {
        if (closed) {
            return;
        }
        closed = true;
        try (FileChannel c = ch) {
            drain();
            ByteBuffer n = ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN).putLong(0, count);
            while (n.hasRemaining()) {
                c.write(n, COUNT_AT + n.position());
            }
        }
    }
}
