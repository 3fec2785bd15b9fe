package org.lanesift.runner.output;

import java.io.BufferedWriter;
import java.io.Closeable;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.lanesift.data.AnalogBlock;

/**
 * Writes one analog output as CSV: a header {@code time (s),<name> (V)}, then one row per
 * sample with the exact sample time in seconds and the voltage; an invalid (clipped or missing)
 * sample has an empty voltage cell. Streams block by block.
 */
final class AnalogCsvWriter implements Closeable {
    private final Writer out;
    private final StringBuilder sb = new StringBuilder(1 << 16);
    long samples;

    AnalogCsvWriter(Path file, String name) throws IOException {
        out = new BufferedWriter(Files.newBufferedWriter(file, StandardCharsets.UTF_8), 1 << 16);
        out.write("time (s)," + name.replace(',', '_') + " (V)\n");
    }

    void write(AnalogBlock b) throws IOException {
        float[] v = b.volts();
        for (int i = 0; i < b.length(); i++) {
            Texts.seconds(sb, b.timeFs(i));
            sb.append(',');
            if (b.isValid(i)) {
                sb.append(v[i]);
            }
            sb.append('\n');
            if (sb.length() > (1 << 16) - 64) {
                out.append(sb);
                sb.setLength(0);
            }
        }
        out.append(sb);
        sb.setLength(0);
        samples += b.length();
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
