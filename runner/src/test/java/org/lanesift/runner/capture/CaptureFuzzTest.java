package org.lanesift.runner.capture;

import com.code_intelligence.jazzer.api.FuzzedDataProvider;
import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;

/**
 * Jazzer fuzz tests of the capture parsers (issue 18): CSV, VCD and a raw capture's JSON sidecar.
 * Under {@code mvn verify} they replay their seeds and run a short fuzzing session when
 * {@code JAZZER_FUZZ=1} (DEVELOPERS.md, "Fuzz tests"); each accepts only success or a declared
 * input error with one short line.
 */
class CaptureFuzzTest {
    @FuzzTest(maxDuration = "5s")
    void csv(byte[] data) throws Exception {
        FuzzChecks.withFile(data, ".csv", f -> FuzzChecks.capture(f, data.length, FuzzChecks.CSV, CsvSource::new));
    }

    @FuzzTest(maxDuration = "5s")
    void vcd(byte[] data) throws Exception {
        FuzzChecks.withFile(data, ".vcd", f -> FuzzChecks.capture(f, data.length, FuzzChecks.VCD, VcdSource::new));
    }

    @FuzzTest(maxDuration = "5s")
    void rawSidecar(FuzzedDataProvider d) throws Exception {
        rawSidecar(d.consumeBytes(64), d.consumeRemainingAsBytes());
    }

    /** The raw-capture target: a capture file and its JSON sidecar. */
    static void rawSidecar(byte[] capture, byte[] sidecar) throws Exception {
        FuzzChecks.withFile(capture, ".bin", f -> {
            try {
                Files.write(f.resolveSibling(f.getFileName() + ".json"), sidecar);
            } catch (java.io.IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
            FuzzChecks.capture(f, capture.length + sidecar.length, FuzzChecks.RAW, RawSource::new);
        });
    }

    /** The seeds are the corpora: a few shapes of each format, so the fuzzer starts from valid files. */
    static byte[] seed(String s) {
        return s.getBytes(StandardCharsets.UTF_8);
    }
}
