package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.lanesift.capture.Captures;

/**
 * Issue 18 item 3: rates, time steps, gains, frame windows and sample values are checked against
 * what the time base holds (femtoseconds in a signed 64-bit count: +/-9,223.37 s, host-api Femtos),
 * and non-finite samples are invalid as docs/capture-raw.md and docs/capture-csv.md say.
 */
class RangeTest {
    @TempDir
    Path tmp;

    private Path raw(String sidecar, int bytes) throws Exception {
        Path f = tmp.resolve("r.bin");
        Files.write(f, new byte[bytes]);
        Files.writeString(tmp.resolve("r.bin.json"), sidecar);
        return f;
    }

    private static CaptureFormatException refused(Path f, Map<String, Object> extra) {
        Map<String, Object> o = new java.util.HashMap<>(extra);
        o.put("file", f.toString());
        RuntimeException e = assertThrows(RuntimeException.class, () -> Collected.run(
                Captures.pluginFor(f).equals("csv") ? new CsvSource() : new RawSource(), o));
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof CaptureFormatException c) {
                return c;
            }
        }
        throw new AssertionError("expected a CaptureFormatException, got " + e, e);
    }

    @ParameterizedTest
    @ValueSource(strings = {"1e16", "1e300"})
    void aRawRateAboveOneSamplePerFemtosecondIsRefused(String rate) throws Exception {
        Path f = raw("{\"rateHz\": " + rate + ", \"format\": \"uint8\", \"channels\": [{\"name\": \"a\"}]}", 4);
        CaptureFormatException e = refused(f, Map.of());
        assertTrue(e.getMessage().startsWith("r.bin.json: /rateHz: found " + rate), e.getMessage());
        assertTrue(e.getMessage().contains("expected at most 1e15 samples per second"), e.getMessage());
    }

    @Test
    void aRawCaptureLongerThanTheTimeBaseIsRefused() throws Exception {
        // 20 frames at 0.001 samples per second last 20,000 s, past 9,223 s
        Path f = raw("{\"rateHz\": 0.001, \"format\": \"uint8\", \"channels\": [{\"name\": \"a\"}]}", 20);
        CaptureFormatException e = refused(f, Map.of());
        assertTrue(e.getMessage().startsWith("r.bin.json: /rateHz: 20 frames at 0.001 samples per second last 2.000e+04 s"), e.getMessage());
        // 9 frames (8,000 s) fit
        Path g = raw("{\"rateHz\": 0.001, \"format\": \"uint8\", \"channels\": [{\"name\": \"a\"}]}", 9);
        assertEquals(9, Collected.run(new RawSource(), Map.of("file", g.toString())).analog("a").length);
    }

    @Test
    void aRawGainThatOverflowsTheSamplesIsRefused() throws Exception {
        Path f = raw("{\"rateHz\": 1e6, \"format\": \"int16le\", \"channels\": [{\"name\": \"a\", \"gain\": 1e300}]}", 4);
        CaptureFormatException e = refused(f, Map.of());
        assertTrue(e.getMessage().startsWith("r.bin.json: /channels/0/gain: found 1.0E300; expected volts per code"), e.getMessage());
    }

    @Test
    void theLargestFrameCountMeansToTheEnd() throws Exception {
        Path f = raw("{\"rateHz\": 1e6, \"format\": \"uint8\", \"channels\": [{\"name\": \"a\"}]}", 10);
        Collected c = Collected.run(new RawSource(), Map.of("file", f.toString(), "frameCount", Long.MAX_VALUE, "firstFrame", 3L));
        assertEquals(7, c.analog("a").length);
    }

    @Test
    void aCsvTimeStepBelowOneFemtosecondIsRefused() throws Exception {
        Path f = tmp.resolve("fine.csv");
        Files.writeString(f, "Time (s),CH1 (V)\n0,1\n1e-19,2\n2e-19,3\n");
        CaptureFormatException e = refused(f, Map.of());
        assertTrue(e.getMessage().startsWith("fine.csv line 2: a time step of 1.00000000e-19 s is below 1 fs"), e.getMessage());
    }

    @Test
    void csvTimesBeyondTheTimeBaseAreRefusedNamingFileAndLine() throws Exception {
        Path f = tmp.resolve("late.csv");
        Files.writeString(f, "Time (s),CH1 (V)\n9300,1\n9301,2\n");
        CaptureFormatException e = refused(f, Map.of());
        assertTrue(e.getMessage().startsWith("late.csv line 2: time 9300 s is beyond +/-9223 s"), e.getMessage());
        CaptureFormatException i = assertThrows(CaptureFormatException.class, () -> Inspector.inspect(f, Map.of()));
        assertEquals(e.getMessage(), i.getMessage());
        Path g = tmp.resolve("walks-out.csv");
        Files.writeString(g, "Time (s),CH1 (V)\n9222,1\n9223,2\n9224,3\n");
        CaptureFormatException w = refused(g, Map.of());
        assertTrue(w.getMessage().startsWith("walks-out.csv line 4: time 9224 s is beyond +/-9223 s"), w.getMessage());
    }

    @Test
    void infiniteAndOutOfRangeSamplesAreInvalid() throws Exception {
        Path f = tmp.resolve("inf.csv");
        Files.writeString(f, "Time (s),CH1 (V)\n0,1\n1e-9,inf\n2e-9,-inf\n3e-9,1e309\n4e-9,1e39\n5e-9,2\n");
        double[] a = Collected.run(new CsvSource(), Map.of("file", f.toString())).analog("CH1");
        assertArrayEquals(new double[] {1, Double.NaN, Double.NaN, Double.NaN, Double.NaN, 2}, a, 0);
        Path r = raw("{\"rateHz\": 1e6, \"format\": \"float32le\", \"channels\": [{\"name\": \"a\", \"gain\": 1e6}]}", 0);
        java.nio.ByteBuffer bb = java.nio.ByteBuffer.allocate(12).order(java.nio.ByteOrder.LITTLE_ENDIAN);
        bb.putFloat(1f).putFloat(Float.POSITIVE_INFINITY).putFloat(1e38f);
        Files.write(r, bb.array());
        assertArrayEquals(new double[] {1e6, Double.NaN, Double.NaN}, Collected.run(new RawSource(), Map.of("file", r.toString())).analog("a"), 0);
    }
}
