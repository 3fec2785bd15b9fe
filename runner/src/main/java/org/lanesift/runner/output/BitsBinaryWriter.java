package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Path;
import org.lanesift.data.BitStream;

/**
 * Writes one bit-stream output in the packed binary form of docs/bits-binary.md: after the
 * header (magic {@value #MAGIC}, the unit interval in whole femtoseconds, the bit count) one chunk per
 * block: bit count, first and last clock edge, first and last sample time (fs), then the bit
 * values, the flags and the falling-edge marks, each packed 64 bits to a little-endian word, bit
 * i of the chunk in bit (i mod 64) of word (i / 64), unused bits zero.
 */
final class BitsBinaryWriter implements Closeable {
    /** The file's magic, eight ASCII characters. */
    static final String MAGIC = "LSFTBITS";
    /** Bytes of a chunk's header. */
    static final int CHUNK_HEADER_BYTES = 40;
    private final Path file;
    private BinaryFile out;

    BitsBinaryWriter(Path file) {
        this.file = file;
    }

    void write(BitStream b) throws IOException {
        if (out == null) {
            out = new BinaryFile(file, MAGIC, Math.round(b.unitIntervalFs()));
        }
        int n = b.count();
        if (n == 0) {
            return;
        }
        ByteBuffer bb = out.room(CHUNK_HEADER_BYTES);
        bb.putLong(n).putLong(b.clockEdge()[0]).putLong(b.clockEdge()[n - 1]).putLong(b.timesFs()[0]).putLong(b.timesFs()[n - 1]);
        plane(b.values(), n);
        plane(b.flagged(), n);
        plane(b.falling(), n);
        out.counted(n);
    }

    /** The first n bits of a packed array, whole words, the bits past n cleared. */
    private void plane(long[] bits, int n) throws IOException {
        int words = (n + 63) >>> 6;
        int lastBits = n & 63;
        for (int w = 0; w < words; ) {
            ByteBuffer bb = out.room(8);
            int take = Math.min(words - w, bb.remaining() >>> 3);
            for (int k = 0; k < take; k++, w++) {
                long v = bits[w];
                if (w == words - 1 && lastBits != 0) {
                    v &= (1L << lastBits) - 1;
                }
                bb.putLong(v);
            }
        }
    }

    /** Bits written so far. */
    long bits() {
        return out == null ? 0 : out.count();
    }

    @Override
    public void close() throws IOException {
        if (out == null) {
            out = new BinaryFile(file, MAGIC, 0);
        }
        out.close();
    }
}
