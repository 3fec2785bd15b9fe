package org.lanesift.plugin;

/**
 * The content of an input file or stream (a capture, a skew table, a mapping file, a device
 * stream's header) that does not follow its documented format. The message starts with the file
 * or source and, where there is one, the line or field, then says what was expected.
 */
public class InputFormatException extends InputException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;

    /**
     * Creates the exception.
     *
     * @param message such as {@code "capture.csv line 17: expected 4 fields, found 3"}
     */
    public InputFormatException(String message) {
        super(message);
    }

    /**
     * Creates the exception with a cause.
     *
     * @param message where and what was expected
     * @param cause   the underlying failure, such as an I/O error while reading
     */
    public InputFormatException(String message, Throwable cause) {
        super(message, cause);
    }
}
