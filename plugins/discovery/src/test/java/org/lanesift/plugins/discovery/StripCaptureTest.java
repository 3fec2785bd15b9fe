package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The bundled sample capture is what {@link StripCapture} writes (apart from the VCD's {@code $date}), and stays small. */
class StripCaptureTest {
    static final Path BUNDLED = Path.of("..", "..", "examples", "strip", "strip.vcd");

    @TempDir
    Path tmp;

    @Test
    void theBundledCaptureIsWhatTheGeneratorWrites() throws Exception {
        Path fresh = tmp.resolve("strip.vcd");
        StripCapture.write(fresh);
        assertTrue(Files.size(BUNDLED) < 600_000, "bundled capture too large: " + Files.size(BUNDLED));
        assertEquals(withoutDate(Files.readAllLines(fresh)), withoutDate(Files.readAllLines(BUNDLED)),
                "examples/strip/strip.vcd differs from what StripCapture writes; regenerate it (see StripCapture)");
    }

    private static List<String> withoutDate(List<String> lines) {
        int at = lines.indexOf("$date");
        return at < 0 ? lines : java.util.stream.Stream.concat(lines.subList(0, at).stream(), lines.subList(at + 3, lines.size()).stream()).toList();
    }
}
