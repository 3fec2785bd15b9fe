package org.lanesift.runner.chainfile;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.file.Files;
import java.nio.file.Path;
import org.lanesift.chain.ChainFileReader;
import org.lanesift.plugin.InputException;
import org.lanesift.testkit.AllocationBound;

/**
 * Jazzer fuzz test of the chain-file reader (issue 18): arbitrary bytes give a chain or a declared
 * input error with one short line, never another exception, and allocates no more than the
 * {@link AllocationBound} allows.
 */
class ChainFileFuzzTest {
    /**
     * The chain file is read whole (at most 4 MiB, docs/json.md) and parsed into a tree: 8 MiB for
     * any input and 64 bytes per input byte for the tree. Seen in the seeded mutations: about
     * 1.5 MiB for 200 kB.
     */
    static final AllocationBound BOUND = new AllocationBound("chain file", 8L << 20, 64);

    @FuzzTest(maxDuration = "5s")
    void chainFile(byte[] data) throws Exception {
        Path dir = Files.createTempDirectory("lanesift-fuzz");
        Path f = dir.resolve("chain.json");
        try {
            Files.write(f, data);
            BOUND.check(data.length, () -> {
                try {
                    new ChainFileReader().read(f, "chain.json");
                } catch (InputException e) {
                    String m = e.getMessage();
                    if (m == null || m.isBlank() || m.indexOf('\n') >= 0 || m.length() > 2000) {
                        throw new AssertionError("bad input must give one short line, got: " + m, e);
                    }
                }
            });
        } finally {
            Files.deleteIfExists(f);
            Files.deleteIfExists(dir);
        }
    }
}
