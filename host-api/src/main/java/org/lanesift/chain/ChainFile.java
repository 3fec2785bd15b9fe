package org.lanesift.chain;

import java.nio.file.Path;

/**
 * A chain file as read from disk: the model and where it came from (so that relative file
 * options resolve against the file's directory, and errors name the file).
 *
 * @param spec      the nodes and wires, with relative {@code file} options already resolved
 * @param path      the file
 * @param shownName the name to use in messages (as the user typed it)
 * @param description the optional {@code description} field, or the empty string
 */
public record ChainFile(ChainSpec spec, Path path, String shownName, String description) {
}
