package org.lanesift.plugin;

import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.lanesift.time.TimeValue;
import org.lanesift.unit.Quantity;

/**
 * One option of a plugin: name, type, unit, default, allowed range and help.
 *
 * @param name         option name, as written in chain files ({@code "thresholdVolts"})
 * @param type         value type
 * @param unit         unit symbol for numbers ("V", "Hz", "%"); for {@link Type#TIME} the unit a bare number is taken in
 * @param defaultValue default (already of the Java type {@link #parse} returns), or null when the option is required
 * @param min          smallest allowed number (inclusive), or null; for TIME in femtoseconds when absolute
 * @param max          largest allowed number (inclusive), or null
 * @param choices      allowed values of a {@link Type#CHOICE}; empty otherwise
 * @param help         one or two lines for users
 */
public record OptionSpec(String name, Type type, String unit, Object defaultValue, Double min, Double max,
                         List<String> choices, String help) {

    /** Option value types and the Java types they parse to. */
    public enum Type {
        /** {@link Long}. */
        INTEGER,
        /** {@link Double}. */
        NUMBER,
        /** {@link Boolean}. */
        BOOLEAN,
        /** {@link String}. */
        TEXT,
        /** One of {@code choices}, a {@link String}. */
        CHOICE,
        /** {@link TimeValue}: a number with fs/ps/ns/us/ms/s/samples/UI. */
        TIME,
        /** A list of numbers, {@code List<Double>}, written as a JSON array or comma-separated text. */
        NUMBERS
    }

    /**
     * Normalises.
     *
     * @param name option name, as written in chain files ({@code "thresholdVolts"})
     * @param type value type
     * @param unit unit symbol for numbers ("V", "Hz", "%"); for {@link Type#TIME} the unit a bare number is taken in
     * @param defaultValue default (already of the Java type {@link #parse} returns), or null when the option is required
     * @param min smallest allowed number (inclusive), or null; for TIME in femtoseconds when absolute
     * @param max largest allowed number (inclusive), or null
     * @param choices allowed values of a {@link Type#CHOICE}; empty otherwise
     * @param help one or two lines for users
     */
    public OptionSpec {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(type, "type");
        unit = unit == null ? "" : unit;
        choices = choices == null ? List.of() : List.copyOf(choices);
        help = help == null ? "" : help;
    }

    /**
     * A number option.
     *
     * @param name name
     * @param unit unit
     * @param def  default
     * @param min  minimum or null
     * @param max  maximum or null
     * @param help help
     * @return the spec
     */
    public static OptionSpec number(String name, String unit, Double def, Double min, Double max, String help) {
        return new OptionSpec(name, Type.NUMBER, unit, def, min, max, List.of(), help);
    }

    /**
     * An integer option.
     *
     * @param name name
     * @param def  default or null
     * @param min  minimum
     * @param max  maximum
     * @param help help
     * @return the spec
     */
    public static OptionSpec integer(String name, Long def, long min, long max, String help) {
        return new OptionSpec(name, Type.INTEGER, "", def, (double) min, (double) max, List.of(), help);
    }

    /**
     * A boolean option.
     *
     * @param name name
     * @param def  default
     * @param help help
     * @return the spec
     */
    public static OptionSpec bool(String name, boolean def, String help) {
        return new OptionSpec(name, Type.BOOLEAN, "", def, null, null, List.of(), help);
    }

    /**
     * A text option.
     *
     * @param name name
     * @param def  default or null when required
     * @param help help
     * @return the spec
     */
    public static OptionSpec text(String name, String def, String help) {
        return new OptionSpec(name, Type.TEXT, "", def, null, null, List.of(), help);
    }

    /**
     * A choice option.
     *
     * @param name    name
     * @param def     default, one of the choices
     * @param help    help
     * @param choices the allowed values
     * @return the spec
     */
    public static OptionSpec choice(String name, String def, String help, String... choices) {
        return new OptionSpec(name, Type.CHOICE, "", def, null, null, List.of(choices), help);
    }

    /**
     * A time option.
     *
     * @param name        name
     * @param defaultUnit unit of a bare number
     * @param def         default, as text such as "0ps", or null when required
     * @param help        help
     * @return the spec
     */
    public static OptionSpec time(String name, TimeValue.Unit defaultUnit, String def, String help) {
        return new OptionSpec(name, Type.TIME, defaultUnit.symbol(), def == null ? null : TimeValue.parse(def, defaultUnit),
                null, null, List.of(), help);
    }

    /**
     * A list-of-numbers option.
     *
     * @param name name
     * @param unit unit of each number
     * @param help help
     * @return the spec, defaulting to the empty list
     */
    public static OptionSpec numbers(String name, String unit, String help) {
        return new OptionSpec(name, Type.NUMBERS, unit, List.of(), null, null, List.of(), help);
    }

    /**
     * Converts a raw value (a string, or a number/boolean/list from JSON) to this option's type and
     * checks the range.
     *
     * @param pluginId plugin id, for the message
     * @param raw      the value as given
     * @return the typed value
     * @throws OptionException naming plugin, option and what is allowed
     */
    public Object parse(String pluginId, Object raw) {
        try {
            return convert(raw);
        } catch (OptionException e) {
            throw new OptionException(name, "option '" + name + "' of plugin '" + pluginId + "': " + e.getMessage());
        }
    }

    /**
     * Converts a raw value (a string, or a number/boolean/list from JSON) to this option's type and
     * checks the range. A number given as text may carry this option's unit and an SI prefix
     * ({@code 10cm}, {@code 500MHz}; see {@link Quantity}). This is the one conversion used for chain
     * files and for every command line.
     *
     * @param raw the value as given
     * @return the typed value
     * @throws OptionException whose message says what is allowed and what was given (without naming the option)
     */
    public Object convert(Object raw) {
        try {
            Object v = switch (type) {
                case INTEGER -> {
                    if (raw instanceof Number n && n.doubleValue() == Math.rint(n.doubleValue())) {
                        yield n.longValue();
                    }
                    yield Long.parseLong(raw.toString().trim().replace("_", ""));
                }
                case NUMBER -> {
                    if (raw instanceof Number n) {
                        yield n.doubleValue();
                    }
                    try {
                        yield Quantity.parse(raw.toString(), unit);
                    } catch (IllegalArgumentException e) {
                        throw new NumberFormatException(e.getMessage());
                    }
                }
                case BOOLEAN -> {
                    if (raw instanceof Boolean b) {
                        yield b;
                    }
                    String s = raw.toString().trim().toLowerCase(Locale.ROOT);
                    if (s.equals("true") || s.equals("false")) {
                        yield Boolean.parseBoolean(s);
                    }
                    throw new OptionException(name, "expected true or false, got '" + raw + "'");
                }
                case TEXT -> raw.toString();
                case CHOICE -> {
                    String s = raw.toString();
                    if (!choices.contains(s)) {
                        throw new OptionException(name, "expected one of " + String.join(", ", choices) + ", got '" + s + "'");
                    }
                    yield s;
                }
                case TIME -> raw instanceof TimeValue tv ? tv
                        : raw instanceof Number n ? new TimeValue(n.doubleValue(), unitOf(unit))
                        : TimeValue.parse(raw.toString(), unitOf(unit));
                case NUMBERS -> parseNumbers(raw);
            };
            if (v instanceof Number n && (type == Type.NUMBER || type == Type.INTEGER)) {
                double d = n.doubleValue();
                if (!Double.isFinite(d) || (min != null && d < min) || (max != null && d > max)) {
                    throw new OptionException(name, raw + " is outside the allowed range " + range());
                }
            }
            return v;
        } catch (NumberFormatException e) {
            throw new OptionException(name, "expected " + (type == Type.INTEGER ? "an integer" : "a number")
                    + (min != null || max != null ? " in " + range() : "") + ", got '" + raw + "'");
        } catch (OptionException e) {
            throw e;
        } catch (IllegalArgumentException e) {
            throw new OptionException(name, e.getMessage());
        }
    }

    /**
     * The allowed range as text, such as {@code "0 to 2 V"}.
     *
     * @return the range
     */
    public String range() {
        String u = unit.isEmpty() ? "" : " " + unit;
        if (min != null && max != null) {
            return fmt(min) + " to " + fmt(max) + u;
        } else if (min != null) {
            return "at least " + fmt(min) + u;
        } else if (max != null) {
            return "at most " + fmt(max) + u;
        }
        return "any" + u;
    }

    private static String fmt(double d) {
        return d == Math.rint(d) && Math.abs(d) < 1e15 ? Long.toString((long) d) : Double.toString(d);
    }

    private static TimeValue.Unit unitOf(String symbol) {
        for (TimeValue.Unit u : TimeValue.Unit.values()) {
            if (u.symbol().equals(symbol)) {
                return u;
            }
        }
        return TimeValue.Unit.PS;
    }

    private List<Double> parseNumbers(Object raw) {
        if (raw instanceof List<?> list) {
            return list.stream().map(o -> o instanceof Number n ? n.doubleValue() : Double.parseDouble(o.toString().trim())).toList();
        }
        String s = raw.toString().trim();
        if (s.startsWith("[") && s.endsWith("]")) {
            s = s.substring(1, s.length() - 1);
        }
        if (s.isBlank()) {
            return List.of();
        }
        return java.util.Arrays.stream(s.split(",")).map(x -> Double.parseDouble(x.trim())).toList();
    }
}
