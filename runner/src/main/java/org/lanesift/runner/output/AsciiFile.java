package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;

/**
 * A text file written through one reusable 64 KiB byte buffer: the writers put primitive values
 * into {@link #buf} with {@link Ascii} after {@link #room(int)}, and whole buffers go to the file's
 * channel. Nothing is allocated per value.
 */
final class AsciiFile implements Closeable {
    /** Buffer size in bytes. */
    static final int SIZE = 1 << 16;
    private final FileChannel ch;
    private final ByteBuffer wrap;
    /** The buffer; valid bytes are {@code [0, pos)}. */
    final byte[] buf = new byte[SIZE];
    /** Next free position in {@link #buf}. */
    int pos;

    /**
     * Creates (or truncates) a file.
     *
     * @param file the file
     * @throws IOException if it cannot be opened
     */
    AsciiFile(Path file) throws IOException {
        ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE, StandardOpenOption.TRUNCATE_EXISTING);
        wrap = ByteBuffer.wrap(buf);
    }

    /**
     * Makes room for {@code n} more bytes (at most {@link #SIZE}), writing out the buffer if needed.
     *
     * @param n bytes about to be put
     * @throws IOException if writing fails
     */
    void room(int n) throws IOException {
        if (pos + n > SIZE) {
            flush();
        }
    }

    /** Writes out what the buffer holds. */
    void flush() throws IOException {
        wrap.clear().limit(pos);
        while (wrap.hasRemaining()) {
            ch.write(wrap);
        }
        pos = 0;
    }

    /**
     * Puts text as UTF-8 (headers, names), whatever its length.
     *
     * @param s the text
     */
    void put(String s) throws IOException {
        byte[] b = s.getBytes(StandardCharsets.UTF_8);
        put(b, 0, b.length);
    }

    /** Puts bytes, whatever their number. */
    void put(byte[] b, int off, int len) throws IOException {
        while (len > 0) {
            room(Math.min(len, SIZE));
            int n = Math.min(len, SIZE - pos);
            System.arraycopy(b, off, buf, pos, n);
            pos += n;
            off += n;
            len -= n;
        }
    }

    /**
     * The channel, positioned after what was flushed (for appending a file with
     * {@link FileChannel#transferFrom}).
     *
     * @return the channel
     */
    FileChannel channel() throws IOException {
        flush();
        return ch;
    }

    @Override
    public void close() throws IOException {
        try {
            flush();
        } finally {
            ch.close();
        }
    }
}
