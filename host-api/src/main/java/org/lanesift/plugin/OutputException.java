package org.lanesift.plugin;

/**
 * An output that cannot be written: the directory is not writable, a file stands where a folder is
 * expected, the disk is full. The message names the file and the reason. It counts as bad input
 * (exit 2): the user chose the location.
 */
public class OutputException extends InputException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;

    /**
     * Creates the exception.
     *
     * @param message such as {@code "cannot write out/report.md: Not a directory"}
     * @param cause   the I/O error, or null
     */
    public OutputException(String message, Throwable cause) {
        super(message, cause);
    }
}
