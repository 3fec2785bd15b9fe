package org.lanesift.chain;

/**
 * A chain that cannot be built or run: an unknown plugin, a bad wire, a block out of time order,
 * a stage that failed. The message names the instance, port or chain-file location
 * ({@link #pointer()}, a JSON pointer such as {@code /wires/2/to}) and what was expected.
 */
public class ChainException extends org.lanesift.plugin.InputException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;
    /** Where in the chain model the problem is, or null. */
    private final String pointer;

    /**
     * Creates the exception.
     *
     * @param message what is wrong and what was expected
     * @param pointer JSON pointer into the chain model, or null
     */
    public ChainException(String message, String pointer) {
        super(message);
        this.pointer = pointer;
    }

    /**
     * Creates the exception with a cause.
     *
     * @param message what is wrong
     * @param pointer JSON pointer, or null
     * @param cause   the underlying failure
     */
    public ChainException(String message, String pointer, Throwable cause) {
        super(message, cause);
        this.pointer = pointer;
    }

    /**
     * Where in the chain model the problem is.
     *
     * @return a JSON pointer such as {@code /nodes/1/options/lanes}, or null
     */
    public String pointer() {
        return pointer;
    }
}
