package org.lanesift.plugin;

/**
 * A command a module contributes to the host, found through {@link java.util.ServiceLoader} (list it
 * in {@code META-INF/services/org.lanesift.plugin.Tool}). The command-line host offers each tool
 * as a subcommand, such as {@code lanesift probe}. A tool declares its options in {@link #spec()};
 * the host parses the arguments, answers {@code --help}, converts values with their units and
 * reports bad ones, exactly as for its built-in commands, then calls {@link #run}.
 *
 * <p>Errors: bad input is reported by throwing an {@link InputException} subtype (exit 2, its
 * message as the one line); a failed device by a {@link DeviceFailure} (exit 1, its message).
 * Anything else thrown is a bug: the host prints "internal error" and exits 1.
 */
public interface Tool {
    /**
     * The command-line declaration.
     *
     * @return name, summary, options and help of the command
     */
    ToolSpec spec();

    /**
     * Subcommand name, lower case.
     *
     * @return for example {@code "probe"}
     */
    default String name() {
        return spec().name();
    }

    /**
     * One line for the host's command list.
     *
     * @return the summary
     */
    default String summary() {
        return spec().summary();
    }

    /**
     * Runs the tool.
     *
     * @param args    the parsed options
     * @param console where to write, and the host's {@code --quiet}/{@code --debug}
     * @return exit code: 0 success; a tool may return 1 for a result that failed its own check (such as a mismatch)
     */
    int run(ToolArgs args, ToolConsole console);
}
