package org.lanesift.plugin;

import java.util.Objects;
import org.lanesift.data.DataKind;

/**
 * One input or output of a plugin: a name unique among the plugin's inputs (or outputs), the kind
 * of data it carries, whether an input must be wired, whether it is a calibration input, and help
 * text.
 *
 * <p>A <b>calibration input</b> takes what another stage found over the whole capture (such as a
 * skew table) before the stage sees any data: the engine first runs the part of the chain that
 * produces it over the capture (a calibration pass), then runs the chain from the start with the
 * result already delivered (see {@code docs/chain-file.md}, "Calibration wires").
 *
 * @param name        port name, letters, digits, '_' and '-'
 * @param kind        what it carries
 * @param required    for inputs: the chain fails to build if it is not wired; ignored for outputs
 * @param help        one line for users
 * @param calibration for inputs: whatever is wired here is computed in an earlier pass over the
 *                    capture and delivered before the first data block; ignored for outputs
 */
public record PortSpec(String name, DataKind kind, boolean required, String help, boolean calibration) {

    /**
     * Checks the name.
     *
     * @param name port name, letters, digits, '_' and '-'
     * @param kind what it carries
     * @param required for inputs: the chain fails to build if it is not wired; ignored for outputs
     * @param help one line for users
     * @param calibration for inputs: fed by a calibration pass before any data
     */
    public PortSpec {
        Objects.requireNonNull(kind, "kind");
        if (name == null || !name.matches("[A-Za-z0-9_-]+")) {
            throw new IllegalArgumentException("port name must be letters, digits, '_' or '-', got '" + name + "'");
        }
        help = help == null ? "" : help;
    }

    /**
     * A port that is not a calibration input.
     *
     * @param name     port name, letters, digits, '_' and '-'
     * @param kind     what it carries
     * @param required for inputs: the chain fails to build if it is not wired
     * @param help     one line for users
     */
    public PortSpec(String name, DataKind kind, boolean required, String help) {
        this(name, kind, required, help, false);
    }

    /**
     * A required calibration input: what is wired here is computed by a calibration pass over the
     * capture and delivered before the stage's first data block.
     *
     * @param name port name
     * @param kind data kind (normally {@link DataKind#ARTIFACT})
     * @param help help text
     * @return the port
     */
    public static PortSpec calibration(String name, DataKind kind, String help) {
        return new PortSpec(name, kind, true, help, true);
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
