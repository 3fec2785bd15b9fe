package org.lanesift.runner.chainfile;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.SeededMutations;

/** The short fuzzing session of plain {@code mvn verify} for the chain-file reader (issue 18 item 8). */
class ChainFileMutationTest {
    @Test
    void chainFile() throws Exception {
        int n = SeededMutations.run(Path.of("src/test/resources/org/lanesift/runner/chainfile/ChainFileFuzzTestInputs/chainFile"),
                20, 18_004, d -> new ChainFileFuzzTest().chainFile(d));
        System.out.println("chain file: " + n + " mutated inputs; " + ChainFileFuzzTest.BOUND.summary());
    }
}
