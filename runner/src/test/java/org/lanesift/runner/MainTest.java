package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** The top-level command line: help, version, tools, and mapping of failures to exit codes. */
class MainTest {
    @TempDir
    Path tmp;

    @Test
    void versionPrintsTheProgramAndJava() {
        Cli r = Cli.run("--version");
        assertEquals(0, r.code());
        assertTrue(r.out().startsWith("lanesift "), r::toString);
        assertTrue(r.out().contains("Java 17") || r.out().contains("Java "), r::toString);
    }

    @Test
    void helpListsBuiltInCommandsDiscoveredToolsAndTheCautions() {
        Cli r = Cli.run("--help");
        assertEquals(0, r.code());
        for (String c : List.of("run", "plugins", "inspect", "fake-tool", "--debug", "--quiet", "50 ohm", "mains")) {
            assertTrue(r.out().contains(c), () -> "help should mention " + c + ":\n" + r.out());
        }
        assertTrue(r.out().contains("Echoes its arguments (test only)."), r::toString);
    }

    @ParameterizedTest
    @ValueSource(strings = {"run", "plugins", "inspect"})
    void everyCommandAnswersHelp(String cmd) {
        Cli r = Cli.run(cmd, "--help");
        assertEquals(0, r.code(), r::toString);
        assertTrue(r.out().startsWith("Usage: lanesift " + cmd), r::toString);
    }

    @Test
    void noArgumentsPrintsUsage() {
        Cli r = Cli.run();
        assertEquals(0, r.code());
        assertTrue(r.out().startsWith("Usage: lanesift"), r::toString);
    }

    @Test
    void aToolGetsItsArgumentsVerbatimIncludingHelp() {
        Cli r = Cli.run("--quiet", "fake-tool", "--help", "a=b", "--json");
        assertEquals(0, r.code(), r::toString);
        assertEquals("--help\na=b\n--json\n", r.out());
        Cli bad = Cli.run("fake-tool", "bad");
        assertEquals(2, bad.code());
        assertEquals(1, bad.errLines().size());
    }

    @Test
    void usageErrorsAreOneLineWithExitTwo() {
        for (String[] args : List.of(new String[] {"frobnicate"}, new String[] {"run"}, new String[] {"run", "a.json", "--bogus"},
                new String[] {"plugins", "extra"}, new String[] {"inspect"})) {
            Cli r = Cli.run(args);
            assertEquals(2, r.code(), r::toString);
            assertEquals(1, r.errLines().size(), r::toString);
            assertTrue(r.errLines().get(0).startsWith("lanesift"), r::toString);
            assertTrue(r.errLines().get(0).contains("--help"), r::toString);
        }
        assertEquals(List.of("lanesift: Unmatched argument at index 0: 'frobnicate' (see: lanesift --help)"),
                Cli.run("frobnicate").errLines());
        assertEquals(List.of("lanesift run: Missing required parameter: 'CHAIN.json' (see: lanesift run --help)"),
                Cli.run("run").errLines());
    }

    @Test
    void aMissingChainFileIsNamed() {
        Path p = tmp.resolve("nothere.json");
        Cli r = Cli.run("run", p.toString());
        assertEquals(2, r.code());
        assertEquals(List.of(p + ": no such file (expected a JSON chain file)"), r.errLines());
    }

    @Test
    void inspectOfAMissingFileIsBadInput() {
        Path p = tmp.resolve("nothere.csv");
        Cli r = Cli.run("inspect", p.toString());
        assertEquals(2, r.code());
        assertEquals(1, r.errLines().size());
        assertTrue(r.errLines().get(0).startsWith(p + ": no such file"), r::toString);
    }

    @Test
    void inspectRejectsABadRate() throws Exception {
        Path f = tmp.resolve("c.csv");
        Files.writeString(f, "time (s),CH1 (V)\n0,1\n");
        Cli r = Cli.run("inspect", f.toString(), "--rate", "-5");
        assertEquals(2, r.code());
        assertEquals(List.of("--rate -5: expected a positive sample rate in Hz"), r.errLines());
    }

    @Test
    void failuresMapToExitCodes() {
        java.io.ByteArrayOutputStream b = new java.io.ByteArrayOutputStream();
        java.io.PrintStream err = new java.io.PrintStream(b, true, java.nio.charset.StandardCharsets.UTF_8);
        assertEquals(1, Failures.report(new OutOfMemoryError("Java heap space"), err, false));
        assertEquals(1, Failures.report(new IllegalStateException("boom"), err, false));
        assertEquals(2, Failures.report(new org.lanesift.plugin.OptionException("x", "option 'x': expected a number"), err, false));
        assertEquals(2, Failures.report(new org.lanesift.runner.capture.CaptureFormatException(Path.of("a.csv"), 7,
                "expected 3 fields, found 2"), err, false));
        assertEquals(1, Failures.report(new org.lanesift.chain.StageFailure("rx", "rx failed",
                new RuntimeException(new OutOfMemoryError("Java heap space"))), err, false));
        assertEquals(2, Failures.report(new org.lanesift.chain.StageFailure("src", "src failed",
                new java.io.UncheckedIOException("cannot write output of src.analog in out: No space left on device",
                        new java.io.IOException("No space left on device"))), err, false));
        String[] lines = b.toString(java.nio.charset.StandardCharsets.UTF_8).split("\n");
        assertEquals(6, lines.length);
        assertEquals("cannot write output of src.analog in out: No space left on device", lines[5]);
        assertTrue(lines[0].startsWith("out of memory (maximum heap"), lines[0]);
        assertTrue(lines[1].startsWith("internal error: java.lang.IllegalStateException: boom"), lines[1]);
        assertEquals("a.csv line 7: expected 3 fields, found 2", lines[3]);
        assertTrue(lines[4].startsWith("out of memory"), lines[4]);
        assertFalse(b.toString().contains("\tat "));
    }
}
