package org.lanesift.plugin;

/**
 * An option value that is missing, of the wrong type or out of range. The message names the
 * plugin, the option and what is allowed.
 */
public class OptionException extends InputException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;
    /** The offending option. */
    private final String option;

    /**
     * Creates the exception.
     *
     * @param option  option name
     * @param message full message naming plugin, option and allowed values
     */
    public OptionException(String option, String message) {
        super(message);
        this.option = option;
    }

    /**
     * Creates the exception with a cause.
     *
     * @param option  option name
     * @param message full message naming the option and what is allowed
     * @param cause   the underlying failure
     */
    public OptionException(String option, String message, Throwable cause) {
        super(message, cause);
        this.option = option;
    }

    /**
     * The offending option's name.
     *
     * @return option name
     */
    public String option() {
        return option;
    }
}
