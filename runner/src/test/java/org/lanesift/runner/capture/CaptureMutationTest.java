package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.SeededMutations;

/**
 * The short fuzzing session of plain {@code mvn verify} for the capture parsers (issue 18 item 8):
 * the targets of {@link CaptureFuzzTest} over seeded mutations of their seed corpora
 * ({@link SeededMutations}). The longer, coverage-guided run is {@code -Pfuzz} (DEVELOPERS.md).
 */
class CaptureMutationTest {
    static final Path SEEDS = Path.of("src/test/resources/org/lanesift/runner/capture/CaptureFuzzTestInputs");
    static final int PER_SEED = 8;

    @Test
    void csv() throws Exception {
        int n = SeededMutations.run(SEEDS.resolve("csv"), PER_SEED, 18_001,
                d -> new CaptureFuzzTest().csv(d));
        System.out.println("csv: " + n + " mutated inputs; " + FuzzChecks.CSV.summary());
    }

    @Test
    void vcd() throws Exception {
        int n = SeededMutations.run(SEEDS.resolve("vcd"), PER_SEED, 18_002,
                d -> new CaptureFuzzTest().vcd(d));
        System.out.println("vcd: " + n + " mutated inputs; " + FuzzChecks.VCD.summary());
    }

    @Test
    void rawSidecar() throws Exception {
        // the seeds are sidecars; the capture beside each is 0 to 64 bytes drawn from the mutated sidecar's hash
        int n = SeededMutations.run(SEEDS.resolve("rawSidecar"), PER_SEED * 2, 18_003, d -> {
            java.util.SplittableRandom r = new java.util.SplittableRandom(java.util.Arrays.hashCode(d));
            byte[] capture = new byte[r.nextInt(65)];
            r.nextBytes(capture);
            CaptureFuzzTest.rawSidecar(capture, d);
        });
        System.out.println("raw sidecar: " + n + " mutated inputs; " + FuzzChecks.RAW.summary());
    }

    @Test
    void mutationsAreDeterministicAndChangeTheInput() {
        byte[] seed = "Time (s),CH1 (V)\n0,1\n1e-9,0\n".getBytes(java.nio.charset.StandardCharsets.UTF_8);
        int changed = 0;
        java.util.SplittableRandom a = new java.util.SplittableRandom(7);
        java.util.SplittableRandom b = new java.util.SplittableRandom(7);
        for (int i = 0; i < 100; i++) {
            byte[] x = SeededMutations.mutate(seed, seed, a);
            assertEquals(java.util.Arrays.toString(x), java.util.Arrays.toString(SeededMutations.mutate(seed, seed, b)));
            if (!java.util.Arrays.equals(x, seed)) {
                changed++;
            }
        }
        org.junit.jupiter.api.Assertions.assertTrue(changed > 80, "most mutations change the input: " + changed);
    }
}
