package org.lanesift.plugin;

import java.io.PrintStream;

/**
 * A command-line tool a module contributes to the host, found through
 * {@link java.util.ServiceLoader} (list it in {@code META-INF/services/org.lanesift.plugin.Tool}).
 * The command-line host offers each tool as a subcommand, such as {@code lanesift probe}; the tool
 * parses its own arguments and answers {@code --help}.
 */
public interface Tool {
    /**
     * Subcommand name, lower case.
     *
     * @return for example {@code "probe"}
     */
    String name();

    /**
     * One line for the host's command list.
     *
     * @return the summary
     */
    String summary();

    /**
     * Runs the tool.
     *
     * @param args arguments after the subcommand name
     * @param out  standard output
     * @param err  standard error
     * @return exit code: 0 success, 2 bad input (with one line on {@code err} naming what was wrong), 1 other failure
     */
    int run(String[] args, PrintStream out, PrintStream err);
}
