package org.lanesift.testkit;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.LinkedHashMap;
import java.util.Map;
import org.lanesift.plugin.DeviceFailure;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;

/**
 * Runs a {@link Tool} alone, without the command-line host: option values as text go through
 * {@link ToolArgs#of} (the conversion the host uses), and what the tool throws is turned into the
 * exit code the host's contract gives it (an {@link InputException} 2, a {@link DeviceFailure} 1,
 * with the message as the one line on stderr). Anything else propagates, so a bug fails the test.
 * The command line itself (parsing, {@code --help}, the error line) is tested end to end in {@code dist}.
 */
public final class ToolHarness {
    private final Tool tool;
    private String command = "";
    private final Map<String, String> options = new LinkedHashMap<>();
    private boolean quiet;

    private ToolHarness(Tool tool) {
        this.tool = tool;
    }

    /**
     * Starts a run of a tool.
     *
     * @param tool the tool
     * @return the harness
     */
    public static ToolHarness of(Tool tool) {
        return new ToolHarness(tool);
    }

    /**
     * Chooses a subcommand.
     *
     * @param name its name
     * @return this
     */
    public ToolHarness command(String name) {
        command = name;
        return this;
    }

    /**
     * Gives an option, as {@code --name value}; a flag takes {@code "true"}.
     *
     * @param name  option name without dashes
     * @param value value as text
     * @return this
     */
    public ToolHarness option(String name, String value) {
        options.put(name, value);
        return this;
    }

    /**
     * Sets the host's {@code --quiet}.
     *
     * @param q quiet or not
     * @return this
     */
    public ToolHarness quiet(boolean q) {
        quiet = q;
        return this;
    }

    /**
     * Runs the tool.
     *
     * @return exit code and what was printed
     */
    public Result run() {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        PrintStream o = new PrintStream(out, true, StandardCharsets.UTF_8);
        PrintStream e = new PrintStream(err, true, StandardCharsets.UTF_8);
        int code;
        try {
            code = tool.run(ToolArgs.of(tool.spec(), command, options), new ToolConsole(o, e, quiet, false));
        } catch (InputException x) {
            e.println(x.getMessage());
            code = 2;
        } catch (DeviceFailure x) {
            e.println(x.getMessage());
            code = 1;
        }
        return new Result(code, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
    }

    /**
     * The outcome of a run.
     *
     * @param code exit code
     * @param out  standard output
     * @param err  standard error
     */
    public record Result(int code, String out, String err) {
    }
}
