package org.lanesift.examples.demo;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.lanesift.json.JsonWriter;

/**
 * Writes demo captures in the two shapes an instrument export commonly takes: a CSV with a few
 * metadata lines (keys of our own, listed in docs/capture-csv.md), a header with units, a time
 * column in seconds and one column per channel in volts; or interleaved signed 16-bit
 * little-endian codes with a JSON sidecar (see docs/capture-raw.md).
 */
public final class CaptureFiles {
    /** The invented device of the demo scenario (docs/demo-scenario.md); no real product. */
    public static final String DEVICE = "Siftlet-64";

    private CaptureFiles() {
    }

    /**
     * Writes a CSV capture.
     *
     * @param file         destination
     * @param channels     channel names
     * @param volts        samples per channel, all the same length
     * @param sampleRateHz sample rate
     * @param startS       time of sample 0, seconds (scopes put the trigger at 0, so this is often negative)
     * @throws IOException on write failure
     */
    public static void writeCsv(Path file, String[] channels, float[][] volts, double sampleRateHz, double startS)
            throws IOException {
        int n = volts[0].length;
        double periodPs = 1e12 / sampleRateHz;
        long startPs = Math.round(startS * 1e12);
        try (OutputStream o = new BufferedOutputStream(Files.newOutputStream(file), 1 << 20)) {
            StringBuilder h = new StringBuilder();
            h.append("generator,lanesift demo scenario (simulated capture)\n");
            h.append("device,").append(DEVICE).append(" (invented)\n");
            h.append("samples,").append(n).append('\n');
            h.append(String.format(Locale.ROOT, "sample-period-s,%.6e%n%n", 1 / sampleRateHz));
            h.append("Time (s)");
            for (String c : channels) {
                h.append(',').append(c).append(" (V)");
            }
            h.append('\n');
            o.write(h.toString().getBytes(StandardCharsets.US_ASCII));
            byte[] line = new byte[32 + channels.length * 16];
            for (int i = 0; i < n; i++) {
                int p = 0;
                long tPs = startPs + Math.round(i * periodPs);
                p = fixed(line, p, tPs, 12);
                for (float[] v : volts) {
                    line[p++] = ',';
                    p = fixed(line, p, Math.round(v[i] * 1e5), 5);
                }
                line[p++] = '\n';
                o.write(line, 0, p);
            }
        }
    }

    /** Writes {@code value / 10^decimals} in fixed point. */
    private static int fixed(byte[] b, int p, long value, int decimals) {
        if (value < 0) {
            b[p++] = '-';
            value = -value;
        }
        long scale = 1;
        for (int i = 0; i < decimals; i++) {
            scale *= 10;
        }
        long ip = value / scale;
        long fp = value % scale;
        p = digits(b, p, ip);
        b[p++] = '.';
        for (long s = scale / 10; s > 0; s /= 10) {
            b[p++] = (byte) ('0' + (fp / s) % 10);
        }
        return p;
    }

    private static int digits(byte[] b, int p, long v) {
        if (v == 0) {
            b[p++] = '0';
            return p;
        }
        int start = p;
        while (v > 0) {
            b[p++] = (byte) ('0' + v % 10);
            v /= 10;
        }
        for (int i = start, j = p - 1; i < j; i++, j--) {
            byte t = b[i];
            b[i] = b[j];
            b[j] = t;
        }
        return p;
    }

    /**
     * Writes a raw capture: interleaved int16 little-endian codes, {@code volts = code * gain},
     * and a sidecar {@code FILE.json} with rate, format, start time and channels.
     *
     * @param file         destination of the samples
     * @param channels     channel names
     * @param volts        samples per channel
     * @param sampleRateHz sample rate
     * @param gainVolts    volts per code
     * @throws IOException on write failure
     */
    public static void writeRaw(Path file, String[] channels, float[][] volts, double sampleRateHz, double gainVolts)
            throws IOException {
        int n = volts[0].length;
        int c = channels.length;
        try (OutputStream o = new BufferedOutputStream(Files.newOutputStream(file), 1 << 20)) {
            ByteBuffer buf = ByteBuffer.allocate(4096 * c * 2).order(ByteOrder.LITTLE_ENDIAN);
            for (int i = 0; i < n; i++) {
                for (int k = 0; k < c; k++) {
                    long code = Math.round(volts[k][i] / gainVolts);
                    buf.putShort((short) Math.max(-32768, Math.min(32767, code)));
                }
                if (!buf.hasRemaining()) {
                    o.write(buf.array(), 0, buf.position());
                    buf.clear();
                }
            }
            o.write(buf.array(), 0, buf.position());
        }
        JsonWriter s = JsonWriter.pretty().beginObject();
        s.field("rateHz", sampleRateHz).field("format", "int16le").field("startTimeS", 0);
        s.name("channels").beginArray();
        for (int k = 0; k < c; k++) {
            s.beginObjectInline().field("name", channels[k]).field("gain", gainVolts).field("offset", 0).endObject();
        }
        s.endArray().endObject();
        Files.writeString(Path.of(file.toString() + ".json"), s.finish() + "\n", StandardCharsets.UTF_8);
    }
}
