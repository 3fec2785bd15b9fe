package org.lanesift.plugin;

import java.util.Objects;
import org.lanesift.data.DataKind;

/**
 * One input or output of a plugin: a name unique among the plugin's inputs (or outputs), the kind
 * of data it carries, whether an input must be wired, and help text.
 *
 * @param name     port name, letters, digits, '_' and '-'
 * @param kind     what it carries
 * @param required for inputs: the chain fails to build if it is not wired; ignored for outputs
 * @param help     one line for users
 */
public record PortSpec(String name, DataKind kind, boolean required, String help) {

    /**
     * Checks the name.
     *
     * @param name port name, letters, digits, '_' and '-'
     * @param kind what it carries
     * @param required for inputs: the chain fails to build if it is not wired; ignored for outputs
     * @param help one line for users
     */
    public PortSpec {
        Objects.requireNonNull(kind, "kind");
        if (name == null || !name.matches("[A-Za-z0-9_-]+")) {
            throw new IllegalArgumentException("port name must be letters, digits, '_' or '-', got '" + name + "'");
        }
        help = help == null ? "" : help;
    }

    /**
     * A required port.
     *
     * @param name port name
     * @param kind data kind
     * @param help help text
     * @return the port
     */
    public static PortSpec of(String name, DataKind kind, String help) {
        return new PortSpec(name, kind, true, help);
    }

    /**
     * An optional input port.
     *
     * @param name port name
     * @param kind data kind
     * @param help help text
     * @return the port
     */
    public static PortSpec optional(String name, DataKind kind, String help) {
        return new PortSpec(name, kind, false, help);
    }
}
