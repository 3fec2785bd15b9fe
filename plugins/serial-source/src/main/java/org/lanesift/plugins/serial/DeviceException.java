package org.lanesift.plugins.serial;

/** A device, port or spool problem; the message names the port, file or field and what was expected. */
public class DeviceException extends org.lanesift.plugin.DeviceFailure {
    private static final long serialVersionUID = 1L;

    /**
     * Creates the exception.
     *
     * @param message what went wrong
     */
    public DeviceException(String message) {
        super(message);
    }

    /**
     * Creates the exception with a cause.
     *
     * @param message what went wrong
     * @param cause   the cause
     */
    public DeviceException(String message, Throwable cause) {
        super(message, cause);
    }
}
