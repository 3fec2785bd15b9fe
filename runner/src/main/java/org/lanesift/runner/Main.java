package org.lanesift.runner;

import java.io.PrintStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.ServiceConfigurationError;
import java.util.ServiceLoader;
import java.util.concurrent.Callable;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Tool;
import picocli.CommandLine;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.ScopeType;

/**
 * The {@code lanesift} command line: {@code run}, {@code plugins}, {@code inspect}, plus every
 * {@link Tool} found through {@link ServiceLoader} as a subcommand of its own name. Exit codes:
 * 0 success, 2 bad input (one line on stderr naming the file, line, pointer or option), 1 internal
 * error. Stack traces appear only with {@code --debug}. Only the command that is run is built
 * (see {@link #commandWord}), and the root and {@code run} are declared in code rather than by
 * annotations: both cut the fixed cost of every run (DEVELOPERS.md, "Cold start").
 */
public final class Main implements Callable<Integer> {
    private static final String DESCRIPTION = "Turns raw captures of fast differential links (LVDS 7:1 pixel links, MIPI "
            + "D-PHY/DSI-like packet links) into checked bits, pixels, timings and commands.";
    private static final String[] FOOTER = {
        "Exit codes: 0 done, 2 bad input (one line on stderr says what and where), 1 internal error.",
        "Safety: a scope input is 50 ohm and earthed; never probe mains-referenced circuits with it, respect its "
                + "voltage and power limits, and guard display flex cables against ESD. Follow local codes and "
                + "licensed practice.",
        "Documentation: README.md and docs/ in the source tree."};

    private final Host host;
    private CommandLine commandLine;

    private Main(Host host) {
        this.host = host;
    }

    /** Shared by the commands of one invocation. */
    static final class Host {
        final PrintStream out;
        final PrintStream err;
        final ClassLoader loader;
        final boolean debug;
        final boolean quiet;
        private PluginRegistry registry;

        Host(PrintStream out, PrintStream err, ClassLoader loader, boolean debug, boolean quiet) {
            this.out = out;
            this.err = err;
            this.loader = loader;
            this.debug = debug;
            this.quiet = quiet;
        }

        PluginRegistry registry() {
            if (registry == null) {
                try {
                    registry = PluginRegistry.discover(loader);
                } catch (ServiceConfigurationError e) {
                    throw new CliError("a plugin on the class path cannot be loaded: " + e.getMessage(), e);
                }
            }
            return registry;
        }
    }

    @Override
    public Integer call() {
        commandLine.usage(host.out);
        return 0;
    }

    /**
     * Runs the command line and exits with its code.
     *
     * @param args the arguments
     */
    public static void main(String[] args) {
        PrintStream out = new PrintStream(new java.io.FileOutputStream(java.io.FileDescriptor.out), true, StandardCharsets.UTF_8);
        PrintStream err = new PrintStream(new java.io.FileOutputStream(java.io.FileDescriptor.err), true, StandardCharsets.UTF_8);
        int code = run(args, out, err);
        out.flush();
        err.flush();
        System.exit(code);
    }

    /**
     * Runs the command line without exiting, for tests and embedding.
     *
     * @param args the arguments
     * @param out  standard output
     * @param err  standard error
     * @return the exit code
     */
    public static int run(String[] args, PrintStream out, PrintStream err) {
        boolean debug = false;
        boolean quiet = false;
        for (String a : args) {
            if (a.equals("--")) {
                break;
            }
            debug |= a.equals("--debug");
            quiet |= a.equals("--quiet") || a.equals("-q");
        }
        try {
            Host host = new Host(out, err, Main.class.getClassLoader(), debug, quiet);
            String word = commandWord(args);
            Map<String, Tool> tools = word != null && (word.isEmpty() || BUILT_IN.contains(word)) ? Map.of()
                    : tools(host.loader, err, debug);
            if (word != null && !word.isEmpty() && !BUILT_IN.contains(word) && !tools.containsKey(word)) {
                word = null; // not a command: the whole command line, for picocli's error and suggestions
            }
            CommandLine cl = commandLine(host, tools, word);
            return cl.execute(args);
        } catch (Throwable t) {
            return Failures.report(t, err, debug);
        }
    }

    /** The commands built into the runner (a tool cannot take these names). */
    private static final List<String> BUILT_IN = List.of("run", "plugins", "inspect");

    /**
     * The one command an invocation runs, so only that one is built (building the picocli model of
     * every command costs more than most runs; DEVELOPERS.md "Cold start"): the first argument
     * after the root's own switches ({@code --debug}, {@code -q}, {@code --quiet}); the empty
     * string when the arguments are only those switches and {@code --version} or {@code -V} (no
     * command needed); null when the whole command line is needed (no command, {@code --help}, any
     * other option before the command).
     *
     * @param args the arguments
     * @return the command's name, "", or null
     */
    static String commandWord(String[] args) {
        boolean version = false;
        for (String a : args) {
            switch (a) {
                case "--debug", "-q", "--quiet" -> {
                }
                case "--version", "-V" -> version = true;
                default -> {
                    return version || a.startsWith("-") ? null : a;
                }
            }
        }
        return version ? "" : null;
    }

    /**
     * The command line.
     *
     * @param host  the invocation's streams and switches
     * @param tools the contributed commands by name
     * @param only  the one command to build (see {@link #commandWord}), "" for none, null for all
     * @return the root command
     */
    static CommandLine commandLine(Host host, Map<String, Tool> tools, String only) {
        Main main = new Main(host);
        CommandSpec cs = CommandSpec.wrapWithoutInspection(main).name("lanesift").versionProvider(new Version());
        cs.usageMessage().sortOptions(false).autoWidth(true).description(DESCRIPTION, "").footerHeading("%n").footer(FOOTER);
        cs.addOption(OptionSpec.builder("--debug").scopeType(ScopeType.INHERIT).arity("0").type(boolean.class)
                .description("Print stack traces with errors.").build());
        cs.addOption(OptionSpec.builder("-q", "--quiet").scopeType(ScopeType.INHERIT).arity("0").type(boolean.class)
                .description("No progress bar, no summary.").build());
        cs.addOption(ToolCommand.helpOption());
        cs.addOption(ToolCommand.versionOption());
        CommandLine cl = new CommandLine(cs);
        main.commandLine = cl;
        if (only == null || only.equals("run")) {
            cl.addSubcommand("run", RunCommand.commandLine(new RunCommand(host)));
        }
        if (only == null || only.equals("plugins")) {
            cl.addSubcommand("plugins", new PluginsCommand(host));
        }
        if (only == null || only.equals("inspect")) {
            cl.addSubcommand("inspect", new InspectCommand(host));
        }
        for (Tool t : tools.values()) {
            if (only == null || only.equals(t.name())) {
                cl.addSubcommand(t.name(), ToolCommand.of(t, host));
            }
        }
        cl.setOut(new PrintWriter(host.out, true));
        cl.setErr(new PrintWriter(host.err, true));
        cl.setParameterExceptionHandler((ex, a) -> Failures.report(ex, host.err, host.debug));
        cl.setExecutionExceptionHandler((ex, c, parsed) -> Failures.report(ex, host.err, host.debug));
        return cl;
    }

    /** Tools by name, built-in command names excluded; a tool that fails to load is reported and skipped. */
    static Map<String, Tool> tools(ClassLoader loader, PrintStream err, boolean debug) {
        Map<String, Tool> byName = new LinkedHashMap<>();
        java.util.Iterator<Tool> it = ServiceLoader.load(Tool.class, loader).iterator();
        List<Tool> found = new ArrayList<>();
        while (true) {
            try {
                if (!it.hasNext()) {
                    break;
                }
                found.add(it.next());
            } catch (ServiceConfigurationError e) {
                if (debug) {
                    err.println("warning: a tool cannot be loaded: " + Failures.oneLine(String.valueOf(e.getMessage())));
                }
            }
        }
        found.sort((a, b) -> a.name().compareTo(b.name()));
        for (Tool t : found) {
            String n = t.name();
            if (n != null && n.matches("[a-z][a-z0-9-]*") && !BUILT_IN.contains(n) && !n.equals("help")) {
                byName.putIfAbsent(n, t);
            }
        }
        return byName;
    }
}
