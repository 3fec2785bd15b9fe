package org.lanesift.plugin;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.time.TimeValue;

/**
 * The validated options of one plugin instance: every declared option has a typed value (given or
 * default), and no undeclared option was accepted. Build with {@link #validate}.
 */
public final class OptionValues {
    private final String pluginId;
    private final Map<String, Object> values;

    private OptionValues(String pluginId, Map<String, Object> values) {
        this.pluginId = pluginId;
        this.values = Collections.unmodifiableMap(values);
    }

    /**
     * Validates raw option values against a descriptor.
     *
     * @param d   the plugin's descriptor
     * @param raw option name to raw value (string, number, boolean or list); may be null
     * @return the typed values
     * @throws OptionException for an unknown option, a missing required one, or a bad value
     */
    public static OptionValues validate(PluginDescriptor d, Map<String, ?> raw) {
        Map<String, Object> out = new LinkedHashMap<>();
        Map<String, ?> given = raw == null ? Map.of() : raw;
        for (String k : given.keySet()) {
            if (d.option(k) == null) {
                throw new OptionException(k, "plugin '" + d.id() + "' has no option '" + k + "'; its options are: "
                        + (d.options().isEmpty() ? "(none)" : String.join(", ", d.options().stream().map(OptionSpec::name).toList())));
            }
        }
        for (OptionSpec s : d.options()) {
            Object v = given.get(s.name());
            if (v == null) {
                if (s.defaultValue() == null) {
                    throw new OptionException(s.name(), "option '" + s.name() + "' of plugin '" + d.id() + "' is required: " + s.help());
                }
                out.put(s.name(), s.defaultValue());
            } else {
                out.put(s.name(), s.parse(d.id(), v));
            }
        }
        return new OptionValues(d.id(), out);
    }

    private Object need(String name) {
        if (!values.containsKey(name)) {
            throw new OptionException(name, "plugin '" + pluginId + "' asked for undeclared option '" + name + "'");
        }
        return values.get(name);
    }

    /**
     * A number option.
     *
     * @param name option name
     * @return its value
     */
    public double getDouble(String name) {
        return ((Number) need(name)).doubleValue();
    }

    /**
     * An integer option.
     *
     * @param name option name
     * @return its value
     */
    public long getLong(String name) {
        return ((Number) need(name)).longValue();
    }

    /**
     * An integer option that fits an int.
     *
     * @param name option name
     * @return its value
     */
    public int getInt(String name) {
        return Math.toIntExact(getLong(name));
    }

    /**
     * A boolean option.
     *
     * @param name option name
     * @return its value
     */
    public boolean getBoolean(String name) {
        return (Boolean) need(name);
    }

    /**
     * A text or choice option.
     *
     * @param name option name
     * @return its value
     */
    public String getString(String name) {
        return (String) need(name);
    }

    /**
     * A time option.
     *
     * @param name option name
     * @return its value
     */
    public TimeValue getTime(String name) {
        return (TimeValue) need(name);
    }

    /**
     * A list-of-numbers option.
     *
     * @param name option name
     * @return its value, possibly empty
     */
    @SuppressWarnings("unchecked")
    public List<Double> getNumbers(String name) {
        return (List<Double>) need(name);
    }

    /**
     * All values by name, for reports.
     *
     * @return unmodifiable map in declaration order
     */
    public Map<String, Object> asMap() {
        return values;
    }

    /**
     * The plugin these values belong to.
     *
     * @return plugin id
     */
    public String pluginId() {
        return pluginId;
    }

    @Override
    public String toString() {
        return pluginId + values;
    }
}
