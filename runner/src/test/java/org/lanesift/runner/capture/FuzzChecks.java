package org.lanesift.runner.capture;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.lanesift.chain.StageFailure;
import org.lanesift.plugin.InputException;

/**
 * What the fuzz tests accept from a parser: success, or bad input reported as an
 * {@link InputException} (directly or as the cause of a stage failure) whose message is one short
 * line. Anything else (an undeclared exception, an error, a hang past Jazzer's limit) is a finding.
 */
final class FuzzChecks {
    private FuzzChecks() {
    }

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

    /** Inspects a capture and runs its source plugin to the end. */
    static void capture(Path file, PluginProviderFactory source) {
        inputErrorsOnly(() -> Inspector.inspect(file, Map.of()));
        inputErrorsOnly(() -> Collected.run(source.make(), Map.of("file", file.toString(), "rateHz", 1e6)));
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
