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
        assertTrue(r.out().contains("Echoes its options (test only)."), r::toString);
    }

    @ParameterizedTest
    @ValueSource(strings = {"run", "plugins", "inspect"})
    void everyCommandAnswersHelp(String cmd) {
        Cli r = Cli.run(cmd, "--help");
        assertEquals(0, r.code(), r::toString);
        assertTrue(r.out().startsWith("Usage: lanesift " + cmd), r::toString);
    }

    @Test
    void theCommandWordPicksTheOneCommandToBuild() {
        assertEquals("run", Main.commandWord(new String[] {"run", "chain.json"}));
        assertEquals("run", Main.commandWord(new String[] {"--debug", "-q", "run", "--help"}));
        assertEquals("fake-tool", Main.commandWord(new String[] {"--quiet", "fake-tool", "--version"}));
        assertEquals("", Main.commandWord(new String[] {"--version"}));
        assertEquals("", Main.commandWord(new String[] {"-q", "-V", "--debug"}));
        // the whole command line: usage, help, an option the root does not know, or version before a command
        assertEquals(null, Main.commandWord(new String[] {}));
        assertEquals(null, Main.commandWord(new String[] {"--debug"}));
        assertEquals(null, Main.commandWord(new String[] {"--help", "run"}));
        assertEquals(null, Main.commandWord(new String[] {"-qV"}));
        assertEquals(null, Main.commandWord(new String[] {"--version", "run"}));
        assertEquals(null, Main.commandWord(new String[] {"--", "run"}));
    }

    /** A command built alone answers exactly as it does inside the whole command line. */
    @ParameterizedTest
    @ValueSource(strings = {"run", "plugins", "inspect", "fake-tool"})
    void aCommandBuiltAloneHelpsAndFailsAsInTheWholeCommandLine(String cmd) {
        java.io.ByteArrayOutputStream o = new java.io.ByteArrayOutputStream();
        java.io.PrintStream ps = new java.io.PrintStream(o, true, java.nio.charset.StandardCharsets.UTF_8);
        Main.Host host = new Main.Host(ps, ps, Main.class.getClassLoader(), false, false);
        var tools = Main.tools(host.loader, ps, false);
        for (String[] args : List.of(new String[] {cmd, "--help"}, new String[] {cmd, "--no-such-option"})) {
            o.reset();
            int whole = Main.commandLine(host, tools, null).execute(args);
            String wholeText = o.toString(java.nio.charset.StandardCharsets.UTF_8);
            o.reset();
            int alone = Main.commandLine(host, tools, cmd).execute(args);
            assertEquals(whole, alone, String.join(" ", args));
            assertEquals(wholeText, o.toString(java.nio.charset.StandardCharsets.UTF_8), String.join(" ", args));
            assertFalse(wholeText.isEmpty());
        }
        Cli r = Cli.run(cmd, "--help");
        assertEquals(0, r.code(), r::toString);
    }

    @Test
    void versionAloneBuildsNoCommandAndSaysTheSame() {
        java.io.ByteArrayOutputStream o = new java.io.ByteArrayOutputStream();
        java.io.PrintStream ps = new java.io.PrintStream(o, true, java.nio.charset.StandardCharsets.UTF_8);
        Main.Host host = new Main.Host(ps, ps, Main.class.getClassLoader(), false, false);
        var none = Main.commandLine(host, java.util.Map.of(), "");
        assertTrue(none.getSubcommands().isEmpty());
        assertEquals(0, none.execute("--version"));
        String alone = o.toString(java.nio.charset.StandardCharsets.UTF_8);
        o.reset();
        assertEquals(0, Main.commandLine(host, Main.tools(host.loader, ps, false), null).execute("--version"));
        assertEquals(o.toString(java.nio.charset.StandardCharsets.UTF_8), alone);
        assertTrue(alone.startsWith("lanesift "), alone);
    }

    @Test
    void noArgumentsPrintsUsage() {
        Cli r = Cli.run();
        assertEquals(0, r.code());
        assertTrue(r.out().startsWith("Usage: lanesift"), r::toString);
    }

    @Test
    void aToolGetsItsDeclaredOptionsTypedWithUnitsAndTheGlobalSwitches() {
        Cli r = Cli.run("fake-tool", "--text", "a=b", "--length", "10cm", "--quiet", "--debug");
        assertEquals(0, r.code(), r::toString);
        assertEquals("text=a=b length=0.1 given=true quiet=true debug=true\n", r.out());
        Cli d = Cli.run("--quiet", "fake-tool", "--shout");
        assertEquals("TEXT=NULL LENGTH=1.0 GIVEN=FALSE QUIET=TRUE DEBUG=FALSE\n", d.out(), d::toString);
        Cli h = Cli.run("fake-tool", "--help");
        assertEquals(0, h.code());
        assertTrue(h.out().startsWith("Usage: lanesift fake-tool"), h::toString);
        assertTrue(h.out().contains("--length=METRES") && h.out().contains("a length, such as 10cm (default 1 m)"), h::toString);
    }

    @Test
    void aBadValueIsTheSameLineForABuiltInAndAContributedCommand() {
        Cli tool = Cli.run("fake-tool", "--length", "far");
        Cli builtIn = Cli.run("run", "x.json", "--jobs", "many");
        assertEquals(2, tool.code());
        assertEquals(2, builtIn.code());
        assertEquals(List.of("lanesift fake-tool: Invalid value for option '--length': expected a number in -100 to 100 m, got 'far'"
                + " (see: lanesift fake-tool --help)"), tool.errLines());
        assertEquals(List.of("lanesift run: Invalid value for option '--jobs': 'many' is not an int (see: lanesift run --help)"),
                builtIn.errLines());
        Cli range = Cli.run("fake-tool", "--length", "1km");
        assertEquals(List.of("lanesift fake-tool: Invalid value for option '--length': 1km is outside the allowed range -100 to 100 m"
                + " (see: lanesift fake-tool --help)"), range.errLines());
        Cli unknown = Cli.run("fake-tool", "--colour", "red");
        assertEquals(2, unknown.code());
        assertEquals(1, unknown.errLines().size());
        Cli missing = Cli.run("fake-tool", "--text");
        assertEquals(List.of("lanesift fake-tool: Missing required parameter for option '--text' (TEXT) (see: lanesift fake-tool --help)"),
                missing.errLines());
    }

    @Test
    void whatAToolThrowsIsReportedByItsType() {
        Cli bug = Cli.run("fake-tool", "--fail", "npe");
        assertEquals(1, bug.code());
        assertEquals(List.of("internal error, please report: java.lang.NullPointerException: fake-tool: a bug (rerun with --debug for the stack trace)"),
                bug.errLines());
        Cli input = Cli.run("fake-tool", "--fail", "input");
        assertEquals(2, input.code(), input::toString);
        assertEquals(List.of("lanesift fake-tool: fake-tool: --text: expected anything else (see: lanesift fake-tool --help)"),
                input.errLines());
        Cli device = Cli.run("fake-tool", "--fail", "device");
        assertEquals(1, device.code());
        assertEquals(List.of("fake-tool: the device went away"), device.errLines());
        Cli traced = Cli.run("--debug", "fake-tool", "--fail", "npe");
        assertEquals(1, traced.code());
        assertTrue(traced.err().contains("\tat org.lanesift.runner.fakes.FakeTool.run"), traced::toString);
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
                new org.lanesift.plugin.OutputException("cannot write output of src.analog in out: No space left on device",
                        new java.io.IOException("No space left on device"))), err, false));
        // by type, not by message: an I/O error whose text looks like a write failure is still a bug
        assertEquals(1, Failures.report(new org.lanesift.chain.StageFailure("src", "src failed",
                new java.io.UncheckedIOException("cannot write output of src.analog", new java.io.IOException("x"))), err, false));
        assertEquals(1, Failures.report(new org.lanesift.chain.StageFailure("rx", "rx failed",
                new NullPointerException("oops")), err, false));
        assertEquals(2, Failures.report(new org.lanesift.chain.StageFailure("rx", "rx failed",
                new org.lanesift.plugin.InputFormatException("cap.csv line 3: expected a number")), err, false));
        String[] lines = b.toString(java.nio.charset.StandardCharsets.UTF_8).split("\n");
        assertEquals(9, lines.length);
        assertEquals("cannot write output of src.analog in out: No space left on device", lines[5]);
        assertTrue(lines[6].startsWith("internal error in instance 'src', please report: java.io.UncheckedIOException"), lines[6]);
        assertEquals("internal error in instance 'rx', please report: java.lang.NullPointerException: oops (rerun with --debug for the stack trace)",
                lines[7]);
        assertEquals("instance 'rx': cap.csv line 3: expected a number", lines[8]);
        assertTrue(lines[0].startsWith("out of memory (maximum heap"), lines[0]);
        assertTrue(lines[1].startsWith("internal error, please report: java.lang.IllegalStateException: boom"), lines[1]);
        assertEquals("a.csv line 7: expected 3 fields, found 2", lines[3]);
        assertTrue(lines[4].startsWith("out of memory"), lines[4]);
        assertFalse(b.toString().contains("\tat "));
    }
}
