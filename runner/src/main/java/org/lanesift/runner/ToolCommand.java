package org.lanesift.runner;

import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.Callable;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolOption;
import org.lanesift.plugin.ToolSpec;
import picocli.CommandLine;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.OptionSpec;

/**
 * A contributed {@link Tool} as a picocli command, built from its {@link ToolSpec}: the options,
 * {@code --help}, value conversion through {@link org.lanesift.plugin.OptionSpec#convert} (units and
 * SI prefixes included) and the error line are those of the built-in commands. Subcommands of
 * the spec become picocli subcommands; running one hands the tool its name in
 * {@link ToolArgs#command()}.
 */
final class ToolCommand implements Callable<Integer> {
    private final Tool tool;
    private final ToolSpec spec;
    private final String subcommand;
    private final Main.Host host;
    private CommandLine commandLine;

    private ToolCommand(Tool tool, ToolSpec spec, String subcommand, Main.Host host) {
        this.tool = tool;
        this.spec = spec;
        this.subcommand = subcommand;
        this.host = host;
    }

    /**
     * The command line of a tool.
     *
     * @param tool the tool
     * @param host the invocation's streams and switches
     * @return a picocli command, ready to add as a subcommand
     */
    static CommandLine of(Tool tool, Main.Host host) {
        ToolSpec ts = tool.spec();
        CommandLine cl = build(tool, ts, "", host);
        for (ToolSpec sub : ts.subcommands()) {
            cl.addSubcommand(sub.name(), build(tool, sub, sub.name(), host));
        }
        return cl;
    }

    private static CommandLine build(Tool tool, ToolSpec ts, String subcommand, Main.Host host) {
        ToolCommand cmd = new ToolCommand(tool, ts, subcommand, host);
        CommandSpec cs = CommandSpec.wrapWithoutInspection(cmd);
        cs.name(ts.name());
        // the summary first: it is the line the parent's command list shows
        java.util.List<String> d = new java.util.ArrayList<>(java.util.List.of(literal(ts.summary())));
        if (!ts.description().isEmpty()) {
            d.add("");
            d.add(literal(String.join(" ", ts.description()))); // one paragraph: the help wraps it to the terminal
        }
        cs.usageMessage().description(d.toArray(String[]::new));
        cs.usageMessage().sortOptions(false);
        cs.usageMessage().autoWidth(true);
        if (!ts.footer().isEmpty()) {
            cs.usageMessage().footerHeading("%n").footer(ts.footer().stream().map(ToolCommand::literal).toArray(String[]::new));
        }
        cs.addOption(helpOption());
        for (ToolOption o : ts.options()) {
            cs.addOption(option(o));
        }
        CommandLine cl = new CommandLine(cs);
        cmd.commandLine = cl;
        return cl;
    }

    private static OptionSpec option(ToolOption o) {
        org.lanesift.plugin.OptionSpec s = o.spec();
        OptionSpec.Builder b = OptionSpec.builder("--" + s.name()).required(o.required());
        if (o.isFlag()) {
            return b.arity("0").type(boolean.class).description(literal(s.help())).build();
        }
        StringBuilder d = new StringBuilder(s.help());
        if (s.defaultValue() != null && !s.defaultValue().toString().isEmpty() && !o.required()) {
            d.append(" (default ").append(s.defaultValue() instanceof Double v ? fmtDefault(v) : String.valueOf(s.defaultValue()))
                    .append(s.type() == org.lanesift.plugin.OptionSpec.Type.NUMBER && !s.unit().isEmpty() ? " " + s.unit() : "")
                    .append(')');
        }
        return b.arity("1").paramLabel(o.label()).type(Object.class).description(literal(d.toString()))
                .converters(raw -> {
                    try {
                        return s.convert(raw);
                    } catch (OptionException e) {
                        throw new CommandLine.TypeConversionException(e.getMessage());
                    }
                }).build();
    }

    /**
     * Text shown as written: the help formats descriptions as format strings, so a '%' of our own
     * (such as "10-90 % rise time") is doubled.
     */
    static String literal(String text) {
        return text.replace("%", "%%");
    }

    private static String fmtDefault(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }

    @Override
    public Integer call() {
        if (!spec.subcommands().isEmpty()) {
            throw new CommandLine.ParameterException(commandLine, "missing subcommand: expected one of "
                    + String.join(", ", spec.subcommands().stream().map(ToolSpec::name).toList()));
        }
        CommandLine.ParseResult pr = commandLine.getParseResult();
        Map<String, Object> typed = new HashMap<>();
        for (ToolOption o : spec.options()) {
            String n = "--" + o.spec().name();
            if (pr.hasMatchedOption(n)) {
                Object v = pr.matchedOptionValue(n, null);
                typed.put(o.spec().name(), o.isFlag() ? Boolean.TRUE : v);
            }
        }
        ToolArgs args = ToolArgs.withDefaults(spec, subcommand, typed);
        try {
            return tool.run(args, new ToolConsole(host.out, host.err, host.quiet, host.debug));
        } catch (OptionException e) {
            // an option the tool found wrong after parsing: the same line as a value the parser refused
            throw new CommandLine.ParameterException(commandLine, e.getMessage(), e);
        }
    }

    /** The standard {@code -h, --help} option every command declares (one wording for all). */
    static OptionSpec helpOption() {
        return OptionSpec.builder("-h", "--help").usageHelp(true).description("Show this help message and exit.").build();
    }

    /** The standard {@code -V, --version} option of the root command and {@code run}. */
    static OptionSpec versionOption() {
        return OptionSpec.builder("-V", "--version").versionHelp(true).description("Print version information and exit.").build();
    }
}
