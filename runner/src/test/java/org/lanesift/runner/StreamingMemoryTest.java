package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The writers stream: a run whose VCD holds millions of value changes completes in a child JVM
 * with a 20 MB heap, far less than keeping the changes in memory would take (this is a memory
 * bound, not a speed measurement).
 */
class StreamingMemoryTest {
    @TempDir
    Path tmp;

    @Test
    void millionsOfChangesInA20MegabyteHeap() throws Exception {
        Path chain = tmp.resolve("big.json");
        Files.writeString(chain, "{\"nodes\": [{\"id\": \"src\", \"plugin\": \"fake-wave\", \"options\": "
                + "{\"samples\": 3000000, \"blockSamples\": 65536, \"logicOnly\": true}}]}");
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-Xmx20m", "-XX:+UseSerialGC", "-cp", System.getProperty("java.class.path"), "org.lanesift.runner.Main",
                "run", chain.toString(), "--out", tmp.resolve("out").toString(), "-q"));
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(tmp.resolve("log.txt").toFile()).start();
        assertTrue(p.waitFor(300, TimeUnit.SECONDS), "timed out");
        assertEquals(0, p.exitValue(), () -> IcarusVcdTest.read(tmp.resolve("log.txt")));
        // 3e6 samples: the logic toggles every 3 samples (1e6), the edges every 5 (6e5), a word every 8 (3.75e5)
        long lines;
        try (var s = Files.lines(tmp.resolve("out/signals.vcd"))) {
            lines = s.filter(l -> !l.startsWith("#") && !l.startsWith("$")).count();
        }
        assertTrue(lines >= 1_975_000, "value changes: " + lines);
    }
}
