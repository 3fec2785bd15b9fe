package org.lanesift.plugin;

/**
 * Bad input: the one way a plugin, a tool or the host says that what the user gave (an option, a
 * chain file, a capture, an output location) cannot be used. Hosts report it as one line, the
 * message, and exit code 2. The message names the file and line, the field or the option, and
 * what was expected. Subtypes, one per concern: {@link OptionException} (an option value),
 * {@link InputFormatException} (the content of a file or stream), {@link OutputException} (an
 * output that cannot be written) and {@link org.lanesift.chain.ChainException} (chain wiring).
 * Anything else a stage or tool throws is a bug (exit 1, "internal error").
 */
public class InputException extends RuntimeException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;

    /**
     * Creates the exception.
     *
     * @param message one line: where (file and line, field or option) and what was expected
     */
    public InputException(String message) {
        super(message);
    }

    /**
     * Creates the exception with a cause, such as the I/O error behind it.
     *
     * @param message one line: where and what was expected
     * @param cause   the underlying failure
     */
    public InputException(String message, Throwable cause) {
        super(message, cause);
    }
}
