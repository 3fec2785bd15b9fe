package org.lanesift.chain;

import java.nio.file.Path;
import java.util.List;

/**
 * A chain file as read from disk: the model and where it came from (so that relative file
 * options resolve against the file's directory, and errors name the file).
 *
 * @param spec      the nodes and wires, with relative {@code file} options already resolved
 * @param path      the file
 * @param shownName the name to use in messages (as the user typed it)
 * @param description the optional {@code description} field, or the empty string
 * @param outputs   the optional {@code outputs} field (which results a run writes, names checked by
 *                  the host against the chain's outputs), or null when the file has none
 */
public record ChainFile(ChainSpec spec, Path path, String shownName, String description, List<String> outputs) {
    /**
     * Copies the output names.
     *
     * @param spec the nodes and wires
     * @param path the file
     * @param shownName the name to use in messages
     * @param description the description, or the empty string
     * @param outputs the {@code outputs} field, or null when absent
     */
    public ChainFile {
        outputs = outputs == null ? null : List.copyOf(outputs);
    }

    /**
     * A chain file without an {@code outputs} field.
     *
     * @param spec the nodes and wires
     * @param path the file
     * @param shownName the name to use in messages
     * @param description the description, or the empty string
     */
    public ChainFile(ChainSpec spec, Path path, String shownName, String description) {
        this(spec, path, shownName, description, null);
    }
}
