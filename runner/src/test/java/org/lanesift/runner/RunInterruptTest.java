package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.runner.output.OutputFolder;
import org.lanesift.testkit.Poll;
import picocli.CommandLine;

/**
 * Issue 18 item 7, the moment before {@code run} is under way: the Ctrl-C handler must be in place
 * before the first file is written, and stay until the report is, so that an interrupt at any
 * moment either finds nothing written or ends in a report saying {@code cancelled}. The JVM's
 * shutdown hooks are replaced by a stand-in that records what {@code --out} held when the handler
 * came and went, and that can run the handler at once, as SIGINT would.
 */
class RunInterruptTest {
    @TempDir
    Path tmp;

    /** Records the state of {@code --out} when the handler is added and removed; optionally fires it at once. */
    private static final class Recorder implements RunCommand.Interrupts {
        final Path out;
        final boolean fire;
        final List<String> events = new ArrayList<>();
        Thread fired;

        Recorder(Path out, boolean fire) {
            this.out = out;
            this.fire = fire;
        }

        @Override
        public void add(Thread hook) {
            events.add("add: " + listing(out));
            if (fire) {
                // Ctrl-C right now: the JVM starts the hook thread, which cancels and waits for the report
                fired = hook;
                hook.start();
                try {
                    Poll.until(Duration.ofSeconds(30), "the handler to cancel and wait for the report",
                            () -> hook.getState() == Thread.State.TIMED_WAITING || !hook.isAlive());
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            }
        }

        @Override
        public void remove(Thread hook) {
            events.add("remove: " + listing(out));
        }
    }

    private static String listing(Path out) {
        if (!Files.exists(out)) {
            return "(no folder)";
        }
        try (Stream<Path> s = Files.list(out)) {
            return String.join(" ", s.map(p -> p.getFileName().toString().startsWith(OutputFolder.WORK_PREFIX)
                    ? OutputFolder.WORK_PREFIX + "*" : p.getFileName().toString()).sorted().toList());
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    private static int run(RunCommand.Interrupts interrupts, String... args) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        PrintStream ps = new PrintStream(o, true, StandardCharsets.UTF_8);
        Main.Host host = new Main.Host(ps, ps, Main.class.getClassLoader(), false, true);
        CommandLine cl = RunCommand.commandLine(new RunCommand(host, interrupts));
        cl.setExecutionExceptionHandler((ex, c, parsed) -> Failures.report(ex, ps, false));
        return cl.execute(args);
    }

    @Test
    void theHandlerComesBeforeTheFirstFileAndGoesAfterTheReport() throws Exception {
        Path out = tmp.resolve("out");
        Recorder r = new Recorder(out, false);
        assertEquals(0, run(r, RunCommandTest.chain("all-kinds.json").toString(), "--out", out.toString()));
        assertEquals(2, r.events.size(), r.events::toString);
        // nothing written yet when the handler arrives: an interrupt before it leaves no trace
        assertEquals("add: (no folder)", r.events.get(0));
        // the report is published and the work folder gone before the handler leaves
        assertTrue(r.events.get(1).contains(" report.md"), r.events::toString);
        assertFalse(r.events.get(1).contains(OutputFolder.WORK_PREFIX), r.events::toString);
    }

    @Test
    void anInterruptAsSoonAsTheHandlerIsInPlaceEndsInACancelledReport() throws Exception {
        Path out = tmp.resolve("out");
        Recorder r = new Recorder(out, true);
        assertEquals(0, run(r, RunCommandTest.chain("all-kinds.json").toString(), "--out", out.toString()));
        assertNotNull(r.fired);
        r.fired.join(30_000);
        assertFalse(r.fired.isAlive(), "the handler ends once the report is written");
        String report = Files.readString(out.resolve("report.md"), StandardCharsets.UTF_8);
        assertTrue(report.contains("- status: cancelled"), report);
        assertFalse(listing(out).contains(OutputFolder.WORK_PREFIX), listing(out));
    }
}
