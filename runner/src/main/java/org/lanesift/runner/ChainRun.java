package org.lanesift.runner;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * The Java way to do what {@code lanesift run} does: run a chain file over its captures and write
 * every output. Commands that run a chain (such as {@code live} and {@code demo}) use this instead
 * of building an argument list. Failures are reported exactly as on the command line: one line on
 * {@code err} and the exit code.
 *
 * <pre>{@code
 * int code = ChainRun.of(chainFile).out(dir).set("dev", "follow", "true").run(System.out, System.err);
 * }</pre>
 */
public final class ChainRun {
    private final Path chain;
    private Path outDir = Path.of("lanesift-out");
    private final List<String> overrides = new ArrayList<>();
    private boolean quiet = true;
    private boolean debug;

    private ChainRun(Path chain) {
        this.chain = Objects.requireNonNull(chain, "chain");
    }

    /**
     * Starts a run of a chain file.
     *
     * @param chain the chain file (docs/chain-file.md)
     * @return the run, quiet by default
     */
    public static ChainRun of(Path chain) {
        return new ChainRun(chain);
    }

    /**
     * Sets the output directory (default {@code lanesift-out}).
     *
     * @param dir the directory
     * @return this
     */
    public ChainRun out(Path dir) {
        outDir = Objects.requireNonNull(dir, "dir");
        return this;
    }

    /**
     * Overrides one option of one instance, as {@code --set NODE.OPTION=VALUE} does.
     *
     * @param instance the instance id
     * @param option   the option name
     * @param value    the value as text
     * @return this
     */
    public ChainRun set(String instance, String option, String value) {
        overrides.add(instance + "." + option + "=" + value);
        return this;
    }

    /**
     * Whether to show the progress bar and the closing summary (default: quiet).
     *
     * @param q true for neither
     * @return this
     */
    public ChainRun quiet(boolean q) {
        quiet = q;
        return this;
    }

    /**
     * Whether a failure prints its stack trace (default: no).
     *
     * @param d true for stack traces
     * @return this
     */
    public ChainRun debug(boolean d) {
        debug = d;
        return this;
    }

    /**
     * Runs the chain.
     *
     * @param out standard output (the summary, unless quiet)
     * @param err standard error (the one line of a failure)
     * @return 0 done, 2 bad input, 1 internal error
     */
    public int run(PrintStream out, PrintStream err) {
        Main.Host host = new Main.Host(out, err, ChainRun.class.getClassLoader(), debug, quiet);
        RunCommand rc = new RunCommand(host);
        rc.chain = chain;
        rc.outDir = outDir;
        rc.inputs = new ArrayList<>();
        rc.sets = new ArrayList<>(overrides);
        rc.jobs = 1;
        rc.segmentFrames = 0;
        try {
            return rc.call();
        } catch (Throwable t) {
            return Failures.report(t, err, debug);
        }
    }
}
