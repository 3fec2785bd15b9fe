package org.lanesift.plugin;

import java.io.PrintStream;
import java.util.Objects;

/**
 * Where a {@link Tool} writes, and the host's global switches.
 *
 * @param out   standard output: the results
 * @param err   standard error: status lines and warnings
 * @param quiet {@code --quiet} was given: no progress or status lines
 * @param debug {@code --debug} was given: the host prints stack traces with errors
 */
public record ToolConsole(PrintStream out, PrintStream err, boolean quiet, boolean debug) {
    /**
     * Checks the streams.
     *
     * @param out   standard output
     * @param err   standard error
     * @param quiet no status lines
     * @param debug stack traces wanted
     */
    public ToolConsole {
        Objects.requireNonNull(out, "out");
        Objects.requireNonNull(err, "err");
    }
}
