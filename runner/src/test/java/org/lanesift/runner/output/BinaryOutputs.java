package org.lanesift.runner.output;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.BitSets;

/**
 * Test-side reader of the packed binary outputs, written from docs/bits-binary.md (not from the
 * writers): checks the header and reads every chunk or record.
 */
public final class BinaryOutputs {
    private BinaryOutputs() {
    }

    /** One chunk's header fields. */
    public record Chunk(long count, long firstClockEdge, long lastClockEdge, long firstTimeFs, long lastTimeFs) {
    }

    /** A whole .bits file: the header and the three planes joined, bit i of the file at index i. */
    public record Bits(long unitIntervalFs, long headerCount, int count, long[] values, long[] flagged, long[] falling,
                       List<Chunk> chunks) {
    }

    /** One word record. */
    public record Word(long value, long startFs, long endFs, int lane, int flags, int widthBits) {
    }

    private static ByteBuffer open(Path file, String magic) throws IOException {
        ByteBuffer b = ByteBuffer.wrap(Files.readAllBytes(file)).order(ByteOrder.LITTLE_ENDIAN);
        byte[] m = new byte[8];
        b.get(m);
        if (!new String(m, StandardCharsets.US_ASCII).equals(magic)) {
            throw new IllegalStateException(file + ": magic " + new String(m, StandardCharsets.US_ASCII) + ", expected " + magic);
        }
        int version = b.getInt();
        int header = b.getInt();
        if (version != 1 || header < 32) {
            throw new IllegalStateException(file + ": version " + version + ", header " + header);
        }
        return b;
    }

    /** Reads a .bits file. */
    public static Bits bits(Path file) throws IOException {
        ByteBuffer b = open(file, "LSFTBITS");
        long ui = b.getLong(16);
        long total = b.getLong(24);
        b.position(b.getInt(12));
        List<Chunk> chunks = new ArrayList<>();
        int n = 0;
        int cap = 1024;
        long[] v = new long[BitSets.words(cap)];
        long[] f = new long[BitSets.words(cap)];
        long[] d = new long[BitSets.words(cap)];
        while (b.remaining() > 0) {
            Chunk c = new Chunk(b.getLong(), b.getLong(), b.getLong(), b.getLong(), b.getLong());
            int cn = Math.toIntExact(c.count());
            int w = (cn + 63) / 64;
            long[][] planes = new long[3][w];
            for (long[] plane : planes) {
                for (int k = 0; k < w; k++) {
                    plane[k] = b.getLong();
                }
            }
            while (n + cn > cap) {
                cap *= 2;
                v = java.util.Arrays.copyOf(v, BitSets.words(cap));
                f = java.util.Arrays.copyOf(f, BitSets.words(cap));
                d = java.util.Arrays.copyOf(d, BitSets.words(cap));
            }
            for (int i = 0; i < cn; i++) {
                BitSets.set(v, n + i, BitSets.get(planes[0], i));
                BitSets.set(f, n + i, BitSets.get(planes[1], i));
                BitSets.set(d, n + i, BitSets.get(planes[2], i));
            }
            for (long[] plane : planes) {
                if ((cn & 63) != 0 && (plane[w - 1] >>> (cn & 63)) != 0) {
                    throw new IllegalStateException(file + ": bits past the chunk's count are not zero");
                }
            }
            n += cn;
            chunks.add(c);
        }
        return new Bits(ui, total, n, v, f, d, chunks);
    }

    /** Reads a .words file. */
    public static List<Word> words(Path file) throws IOException {
        ByteBuffer b = open(file, "LSFTWRDS");
        int record = (int) b.getLong(16);
        long total = b.getLong(24);
        b.position(b.getInt(12));
        List<Word> out = new ArrayList<>();
        while (b.remaining() >= record) {
            int at = b.position();
            out.add(new Word(b.getLong(), b.getLong(), b.getLong(), Short.toUnsignedInt(b.getShort()), Byte.toUnsignedInt(b.get()),
                    Byte.toUnsignedInt(b.get())));
            b.position(at + record);
        }
        if (out.size() != total) {
            throw new IllegalStateException(file + ": header says " + total + " words, file holds " + out.size());
        }
        return out;
    }
}
