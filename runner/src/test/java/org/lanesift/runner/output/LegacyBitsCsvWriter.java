package org.lanesift.runner.output;

import java.io.BufferedWriter;
import java.io.Closeable;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;

/**
 * Test oracle only: the bits CSV writer as it was before issue 19 (StringBuilder rows), kept so
 * that the byte-buffer writer is checked byte for byte against it.
 *
 * <p>Writes one bit-stream output as CSV, a row per sampled bit: sample time (s), bit, clock edge
 * number, slot, clock edge direction (rise/fall), setup and hold margins (s, empty when unknown)
 * and whether the sampler flagged it (0/1). Streams block by block.
 */
final class LegacyBitsCsvWriter implements Closeable {
    private final Writer out;
    private final StringBuilder sb = new StringBuilder(1 << 16);
    long bits;

    LegacyBitsCsvWriter(Path file) throws IOException {
        out = new BufferedWriter(Files.newBufferedWriter(file, StandardCharsets.UTF_8), 1 << 16);
        out.write("time (s),bit,clock_edge,slot,edge,setup (s),hold (s),flagged\n");
    }

    void write(BitStream b) throws IOException {
        for (int i = 0; i < b.count(); i++) {
            seconds(sb, b.timesFs()[i]);
            sb.append(',').append(b.bit(i) ? '1' : '0');
            sb.append(',').append(b.clockEdge()[i]);
            sb.append(',').append(b.slot() == null ? 0 : b.slot()[i]);
            sb.append(',').append(BitSets.get(b.falling(), i) ? "fall" : "rise");
            sb.append(',');
            if (b.setupFs()[i] != BitStream.UNKNOWN_MARGIN) {
                seconds(sb, b.setupFs()[i]);
            }
            sb.append(',');
            if (b.holdFs()[i] != BitStream.UNKNOWN_MARGIN) {
                seconds(sb, b.holdFs()[i]);
            }
            sb.append(',').append(BitSets.get(b.flagged(), i) ? '1' : '0').append('\n');
            if (sb.length() > (1 << 16) - 160) {
                out.append(sb);
                sb.setLength(0);
            }
        }
        out.append(sb);
        sb.setLength(0);
        bits += b.count();
    }

    @Override
    public void close() throws IOException {
        out.close();
    }

    /** The old exact femtoseconds-to-seconds text, through Long.toString. */
    static void seconds(StringBuilder sb, long fs) {
        if (fs == Long.MIN_VALUE) {
            sb.append("-9223.372036854775808");
            return;
        }
        if (fs < 0) {
            sb.append('-');
            fs = -fs;
        }
        long whole = fs / 1_000_000_000_000_000L;
        long frac = fs % 1_000_000_000_000_000L;
        sb.append(whole);
        if (frac != 0) {
            sb.append('.');
            String f = Long.toString(frac);
            for (int i = f.length(); i < 15; i++) {
                sb.append('0');
            }
            int end = f.length();
            while (f.charAt(end - 1) == '0') {
                end--;
            }
            sb.append(f, 0, end);
        }
    }
}
