package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.file.Path;
import org.lanesift.data.AnalogBlock;

/**
 * Writes one analog output as CSV: a header {@code time (s),<name> (V)}, then one row per
 * sample with the exact sample time in seconds and the voltage in volts (the shortest decimal that
 * reads back as the same float, {@link Ascii#putFloat}); an invalid (clipped or missing) sample has
 * an empty voltage cell. Streams block by block, straight into the file's byte buffer.
 */
final class AnalogCsvWriter implements Closeable {
    private static final int MAX_ROW = 2 * Ascii.MAX_NUMBER + 4;
    private final AsciiFile out;
    long samples;

    AnalogCsvWriter(Path file, String name) throws IOException {
        out = new AsciiFile(file);
        out.put("time (s)," + name.replace(',', '_') + " (V)\n");
    }

    void write(AnalogBlock b) throws IOException {
        final float[] v = b.volts();
        final int n = b.length();
        for (int i = 0; i < n; i++) {
            out.room(MAX_ROW);
            byte[] d = out.buf;
            int p = Ascii.putSecondsFs(d, out.pos, b.timeFs(i));
            d[p++] = ',';
            if (b.isValid(i)) {
                p = Ascii.putFloat(d, p, v[i]);
            }
            d[p++] = '\n';
            out.pos = p;
        }
        samples += n;
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
