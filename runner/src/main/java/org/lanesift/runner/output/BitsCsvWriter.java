package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.file.Path;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;

/**
 * Writes one bit-stream output as CSV, a row per sampled bit: sample time (s), bit, clock edge
 * number, slot, clock edge direction (rise/fall), setup and hold margins (s, empty when unknown)
 * and whether the sampler flagged it (0/1). Streams block by block; every number is put as ASCII
 * straight into the file's byte buffer ({@link Ascii}).
 */
final class BitsCsvWriter implements Closeable {
    /** The longest row: three times, two longs and the fixed text. */
    private static final int MAX_ROW = 5 * Ascii.MAX_NUMBER + 16;
    private static final byte[] RISE = {',', 'r', 'i', 's', 'e', ','};
    private static final byte[] FALL = {',', 'f', 'a', 'l', 'l', ','};
    private final AsciiFile out;
    long bits;

    BitsCsvWriter(Path file) throws IOException {
        out = new AsciiFile(file);
        out.put("time (s),bit,clock_edge,slot,edge,setup (s),hold (s),flagged\n");
    }

    void write(BitStream b) throws IOException {
        final long[] times = b.timesFs();
        final long[] edges = b.clockEdge();
        final byte[] slots = b.slot();
        final long[] setup = b.setupFs();
        final long[] hold = b.holdFs();
        final long[] falling = b.falling();
        final long[] flagged = b.flagged();
        final int n = b.count();
        for (int i = 0; i < n; i++) {
            out.room(MAX_ROW);
            byte[] d = out.buf;
            int p = Ascii.putSecondsFs(d, out.pos, times[i]);
            d[p++] = ',';
            d[p++] = b.bit(i) ? (byte) '1' : (byte) '0';
            d[p++] = ',';
            p = Ascii.putLong(d, p, edges[i]);
            d[p++] = ',';
            p = Ascii.putLong(d, p, slots == null ? 0 : slots[i]);
            byte[] edge = BitSets.get(falling, i) ? FALL : RISE;
            System.arraycopy(edge, 0, d, p, 6);
            p += 6;
            if (setup[i] != BitStream.UNKNOWN_MARGIN) {
                p = Ascii.putSecondsFs(d, p, setup[i]);
            }
            d[p++] = ',';
            if (hold[i] != BitStream.UNKNOWN_MARGIN) {
                p = Ascii.putSecondsFs(d, p, hold[i]);
            }
            d[p++] = ',';
            d[p++] = BitSets.get(flagged, i) ? (byte) '1' : (byte) '0';
            d[p++] = '\n';
            out.pos = p;
        }
        bits += n;
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
