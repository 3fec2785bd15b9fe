package org.lanesift.plugin;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.lanesift.time.TimeValue;

/**
 * The parsed command line of a {@link Tool}: typed values by option name (defaults filled in), which
 * options were given, and the subcommand chosen. The host makes it from the arguments; callers
 * that drive a tool from Java make it with {@link #of}, so a command calls another through this
 * type, never through an argument list.
 */
public final class ToolArgs {
    private final String command;
    private final Map<String, Object> values;
    private final Set<String> given;

    /**
     * Creates parsed arguments from typed values.
     *
     * @param command the subcommand chosen, or {@code ""}
     * @param values  typed values by option name, defaults included
     * @param given   names of the options given by the user
     */
    public ToolArgs(String command, Map<String, Object> values, Set<String> given) {
        this.command = command == null ? "" : command;
        this.values = Map.copyOf(values);
        this.given = Set.copyOf(given);
    }

    /**
     * Makes the arguments of {@code spec} (or of its subcommand {@code command}) from option values
     * as text, with the same conversion, unit handling and range checks the command line uses.
     *
     * @param spec    the command's declaration
     * @param command a subcommand of {@code spec}, or {@code ""}
     * @param raw     values as text by option name (for a flag: "true" or "false")
     * @return the parsed arguments
     * @throws OptionException for an unknown option, a bad value or a missing required option, naming it
     */
    public static ToolArgs of(ToolSpec spec, String command, Map<String, String> raw) {
        ToolSpec target = spec;
        if (command != null && !command.isEmpty()) {
            target = spec.subcommands().stream().filter(s -> s.name().equals(command)).findFirst()
                    .orElseThrow(() -> new OptionException(command, spec.name() + ": unknown subcommand '" + command + "'"));
        }
        Map<String, Object> typed = new HashMap<>();
        for (Map.Entry<String, String> e : raw.entrySet()) {
            ToolOption o = target.option(e.getKey());
            if (o == null) {
                throw new OptionException(e.getKey(), target.name() + ": unknown option --" + e.getKey());
            }
            try {
                typed.put(e.getKey(), o.spec().convert(e.getValue()));
            } catch (OptionException x) {
                throw new OptionException(e.getKey(), "option '--" + e.getKey() + "': " + x.getMessage());
            }
        }
        return withDefaults(target, command, typed);
    }

    /**
     * Completes typed values of the given options with the declared defaults and checks the required ones.
     *
     * @param target  the declaration of the command that runs
     * @param command its name as a subcommand, or {@code ""}
     * @param typed   typed values of the options given
     * @return the parsed arguments
     * @throws OptionException for a missing required option
     */
    public static ToolArgs withDefaults(ToolSpec target, String command, Map<String, Object> typed) {
        Map<String, Object> all = new HashMap<>();
        for (ToolOption o : target.options()) {
            Object v = typed.get(o.spec().name());
            if (v == null && o.required()) {
                throw new OptionException(o.spec().name(), "missing required option '--" + o.spec().name() + "=" + o.label() + "'");
            }
            if (v == null) {
                v = o.spec().defaultValue();
            }
            if (v != null) {
                all.put(o.spec().name(), v);
            }
        }
        return new ToolArgs(command, all, typed.keySet());
    }

    /**
     * The subcommand chosen.
     *
     * @return its name, or {@code ""} when the command has none or none was given
     */
    public String command() {
        return command;
    }

    /**
     * Whether the user gave this option (rather than it taking its default).
     *
     * @param name option name
     * @return true if given
     */
    public boolean given(String name) {
        return given.contains(name);
    }

    /**
     * Whether the option has a value, given or by default.
     *
     * @param name option name
     * @return true if present
     */
    public boolean has(String name) {
        return values.containsKey(name);
    }

    /**
     * A number option, in the option's declared unit.
     *
     * @param name option name
     * @return the value, or NaN when absent
     */
    public double number(String name) {
        Object v = values.get(name);
        return v instanceof Number n ? n.doubleValue() : Double.NaN;
    }

    /**
     * An integer option.
     *
     * @param name option name
     * @param absent value when absent
     * @return the value
     */
    public long integer(String name, long absent) {
        Object v = values.get(name);
        return v instanceof Number n ? n.longValue() : absent;
    }

    /**
     * A text or choice option.
     *
     * @param name option name
     * @return the value, or null when absent
     */
    public String text(String name) {
        Object v = values.get(name);
        return v == null ? null : v.toString();
    }

    /**
     * A flag.
     *
     * @param name option name
     * @return true if given (or true by default)
     */
    public boolean flag(String name) {
        return Boolean.TRUE.equals(values.get(name));
    }

    /**
     * A time option.
     *
     * @param name option name
     * @return the value, or null when absent
     */
    public TimeValue time(String name) {
        return (TimeValue) values.get(name);
    }

    /**
     * A list-of-numbers option.
     *
     * @param name option name
     * @return the numbers, empty when absent
     */
    @SuppressWarnings("unchecked")
    public List<Double> numbers(String name) {
        Object v = values.get(name);
        return v == null ? List.of() : (List<Double>) v;
    }

    /**
     * The typed values, by option name.
     *
     * @return an unmodifiable map
     */
    public Map<String, Object> values() {
        return values;
    }

    /**
     * These arguments without some options, to hand to a command that does not know them.
     *
     * @param names option names to drop
     * @return the remaining arguments
     */
    public ToolArgs without(String... names) {
        Map<String, Object> v = new HashMap<>(values);
        Set<String> g = new java.util.HashSet<>(given);
        for (String n : names) {
            v.remove(n);
            g.remove(n);
        }
        return new ToolArgs(command, v, g);
    }
}
