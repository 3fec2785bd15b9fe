package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Path;
import org.lanesift.data.WordStream;

/**
 * Writes one word-stream output in the fixed-record binary form of docs/bits-binary.md: after the
 * header (magic {@value #MAGIC}, record length, word count) one {@value #RECORD_BYTES}-byte
 * little-endian record per word: value, start and end time (fs), lane, flags, width in bits.
 */
final class WordsBinaryWriter implements Closeable {
    /** The file's magic, eight ASCII characters. */
    static final String MAGIC = "LSFTWRDS";
    /** Bytes of one word's record. */
    static final int RECORD_BYTES = 32;
    private final BinaryFile out;

    WordsBinaryWriter(Path file) throws IOException {
        out = new BinaryFile(file, MAGIC, RECORD_BYTES);
    }

    void write(WordStream w) throws IOException {
        for (int i = 0; i < w.count(); i++) {
            ByteBuffer bb = out.room(RECORD_BYTES);
            bb.putLong(w.values()[i]).putLong(w.wordStartFs()[i]).putLong(w.wordEndFs()[i])
                    .putShort((short) w.lane()[i]).put(w.flags()[i]).put((byte) w.widthBits()).putInt(0);
        }
        out.counted(w.count());
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
