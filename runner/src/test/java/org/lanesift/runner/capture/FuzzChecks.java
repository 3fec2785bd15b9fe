package org.lanesift.runner.capture;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.lanesift.chain.StageFailure;
import org.lanesift.plugin.InputException;
import org.lanesift.testkit.AllocationBound;

/**
 * What the fuzz tests accept from a parser: success, or bad input reported as an
 * {@link InputException} (directly or as the cause of a stage failure) whose message is one short
 * line. Anything else (an undeclared exception, an error, a hang past Jazzer's limit, an allocation
 * beyond the parser's {@link AllocationBound}) is a finding.
 */
final class FuzzChecks {
    private FuzzChecks() {
    }

    /** Bytes any input may make a parser allocate per byte it holds (samples, edges, names, copies). */
    static final long PER_INPUT_BYTE = 64;
    /**
     * CSV: the line buffer ({@code CsvReader.MAX_LINE}, 1 MiB) and one block at its cap
     * ({@code CsvReader.MAX_SPAN_VALUES}, 16 Mi float32 values, 64 MiB, with 2 MiB of invalid-sample
     * bits), plus 13 MiB for inspect's statistics and first-use class loading. Seen in the seeded
     * mutations: at most about 12 MiB.
     */
    static final AllocationBound CSV = new AllocationBound("csv", 80L << 20, PER_INPUT_BYTE);
    /**
     * VCD: no block is sized from the header (edges grow with what is read); 16 MiB for the token
     * buffer ({@code VcdTokens.MAX_TOKEN}), the signal table and first-use class loading. Seen: at
     * most about 0.5 MiB.
     */
    static final AllocationBound VCD = new AllocationBound("vcd", 16L << 20, PER_INPUT_BYTE);
    /**
     * Raw: one block at its cap (16 Mi values of all channels, docs/capture-raw.md, 64 MiB and
     * 2 MiB of invalid bits) and the sidecar read (at most 4 MiB, docs/json.md), plus 10 MiB for
     * inspect and class loading. Seen: at most about 3.5 MiB.
     */
    static final AllocationBound RAW = new AllocationBound("raw", 80L << 20, PER_INPUT_BYTE);

    /** Writes the bytes to a temporary file with the suffix, runs the check, removes the file. */
    static void withFile(byte[] data, String suffix, java.util.function.Consumer<Path> check) throws Exception {
        Path dir = Files.createTempDirectory("lanesift-fuzz");
        Path f = dir.resolve("input" + suffix);
        try {
            Files.write(f, data);
            check.accept(f);
        } finally {
            try (var l = Files.list(dir)) {
                for (Path p : l.toList()) {
                    Files.deleteIfExists(p);
                }
            }
            Files.deleteIfExists(dir);
        }
    }

    /**
     * Inspects a capture and runs its source plugin to the end, each within the parser's allocation
     * bound for an input of the given size.
     */
    static void capture(Path file, long inputBytes, AllocationBound bound, PluginProviderFactory source) {
        try {
            bound.check(inputBytes, () -> inputErrorsOnly(() -> Inspector.inspect(file, Map.of())));
            bound.check(inputBytes, () -> inputErrorsOnly(() -> Collected.run(source.make(), Map.of("file", file.toString(), "rateHz", 1e6))));
        } catch (RuntimeException | Error e) {
            throw e;
        } catch (Exception e) {
            throw new AssertionError(e);
        }
    }

    /** Makes a fresh source plugin. */
    interface PluginProviderFactory {
        org.lanesift.plugin.PluginProvider make();
    }

    static void inputErrorsOnly(Runnable r) {
        try {
            r.run();
        } catch (StageFailure e) {
            // a stage failure is bad input only when its cause is (a bug inside a stage is exit 1)
            if (!(e.getCause() instanceof InputException ie)) {
                throw e;
            }
            checkLine(ie);
        } catch (InputException e) {
            checkLine(e);
        }
    }

    private static void checkLine(InputException e) {
        String m = e.getMessage();
        if (m == null || m.isBlank() || m.indexOf('\n') >= 0 || m.length() > 2000) {
            throw new AssertionError("bad input must give one short line, got: " + m, e);
        }
    }
}
