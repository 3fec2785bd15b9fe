package org.lanesift.plugin;

/**
 * A device or link that failed while in use: a port that closed, a device that stopped answering,
 * a stream that broke off. Neither bad input nor a bug: hosts print the message as one line and
 * exit with code 1.
 */
public class DeviceFailure extends RuntimeException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;

    /**
     * Creates the failure.
     *
     * @param message what failed, naming the device or port
     */
    public DeviceFailure(String message) {
        super(message);
    }

    /**
     * Creates the failure with a cause.
     *
     * @param message what failed
     * @param cause   the underlying error
     */
    public DeviceFailure(String message, Throwable cause) {
        super(message, cause);
    }
}
