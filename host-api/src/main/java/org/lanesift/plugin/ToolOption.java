package org.lanesift.plugin;

import java.util.Objects;

/**
 * One option of a {@link ToolSpec}: written {@code --NAME VALUE} on the command line (a
 * {@link OptionSpec.Type#BOOLEAN} option is a flag without a value). The value is converted and
 * range-checked by {@link OptionSpec#convert}, units and SI prefixes included.
 *
 * @param spec     name (without dashes), type, unit, default, range and help
 * @param label    placeholder shown in the help, such as {@code "METRES"}; empty for flags
 * @param required whether the command refuses to run without it
 */
public record ToolOption(OptionSpec spec, String label, boolean required) {
    /**
     * Checks the parts.
     *
     * @param spec     the option
     * @param label    the placeholder
     * @param required whether it must be given
     */
    public ToolOption {
        Objects.requireNonNull(spec, "spec");
        label = label == null || label.isEmpty() ? spec.name().toUpperCase(java.util.Locale.ROOT) : label;
    }

    /**
     * Whether this option takes no value.
     *
     * @return true for a flag
     */
    public boolean isFlag() {
        return spec.type() == OptionSpec.Type.BOOLEAN;
    }
}
