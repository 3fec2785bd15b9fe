package org.lanesift.plugin;

import java.util.Objects;
import org.lanesift.data.DataKind;

/**
 * One input or output of a plugin: a name unique among the plugin's inputs (or outputs), the kind
 * of data it carries, whether an input must be wired, whether it is a calibration input, whether it
 * reads bit margins, and help text.
 *
 * <p>A <b>calibration input</b> takes what another stage found over the whole capture (such as a
 * skew table) before the stage sees any data: the engine first runs the part of the chain that
 * produces it over the capture (a calibration pass), then runs the chain from the start with the
 * result already delivered (see {@code docs/chain-file.md}, "Calibration wires").
 *
 * <p><b>Bit margins.</b> A {@link DataKind#BITS} input (or one of kind {@link DataKind#ANY}) either
 * reads the per-bit setup and hold margins of the {@link org.lanesift.data.BitStream}s it receives,
 * or it does not. It reads them unless it says otherwise ({@link #readingBitMargins(boolean)}), so
 * that no receiver silently loses them. When no receiver of an output reads them, the engine tells
 * the producer so ({@link StageContext#wantsBitMargins(int)}), and the producer may send its bit
 * streams without the two arrays ({@link org.lanesift.data.BitStream#hasMargins()} false). An input
 * that declares it does not read them must never ask for them: on a stream without margins the
 * accessors throw, a bug reported as an internal error. A receiver whose reading depends on its
 * options declares it from them in its port function. Ignored for outputs and other kinds.
 *
 * @param name        port name, letters, digits, '_' and '-'
 * @param kind        what it carries
 * @param required    for inputs: the chain fails to build if it is not wired; ignored for outputs
 * @param help        one line for users
 * @param calibration for inputs: whatever is wired here is computed in an earlier pass over the
 *                    capture and delivered before the first data block; ignored for outputs
 * @param readsBitMargins for inputs: the stage reads the setup and hold margins of the bit streams
 *                    it receives here ({@code setupFs}, {@code holdFs}); true unless declared otherwise
 */
public record PortSpec(String name, DataKind kind, boolean required, String help, boolean calibration, boolean readsBitMargins) {

    /**
     * Checks the name.
     *
     * @param name port name, letters, digits, '_' and '-'
     * @param kind what it carries
     * @param required for inputs: the chain fails to build if it is not wired; ignored for outputs
     * @param help one line for users
     * @param calibration for inputs: fed by a calibration pass before any data
     * @param readsBitMargins for inputs: the stage reads the per-bit margins of the bit streams it receives
     */
    public PortSpec {
        Objects.requireNonNull(kind, "kind");
        if (name == null || !name.matches("[A-Za-z0-9_-]+")) {
            throw new IllegalArgumentException("port name must be letters, digits, '_' or '-', got '" + name + "'");
        }
        help = help == null ? "" : help;
    }

    /**
     * A port that reads bit margins if it receives bit streams (the default).
     *
     * @param name        port name, letters, digits, '_' and '-'
     * @param kind        what it carries
     * @param required    for inputs: the chain fails to build if it is not wired
     * @param help        one line for users
     * @param calibration for inputs: fed by a calibration pass before any data
     */
    public PortSpec(String name, DataKind kind, boolean required, String help, boolean calibration) {
        this(name, kind, required, help, calibration, true);
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
     * The same port, declared as reading the per-bit margins of the bit streams it receives, or not.
     * Declare {@code false} only when the stage never calls {@code BitStream.setupFs()} or
     * {@code holdFs()} on what arrives here; declare {@code true} where it does, even though that is
     * the default, so the reader is visible in its descriptor.
     *
     * @param reads whether the stage reads the margins
     * @return the port with the declaration
     */
    public PortSpec readingBitMargins(boolean reads) {
        return new PortSpec(name, kind, required, help, calibration, reads);
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
