package org.lanesift.chain;

/**
 * A stage threw while the chain ran. The message names the instance, the plugin and what it was
 * doing; the cause is the stage's own exception. Hosts judge the failure by the cause's type, not
 * by this wrapper: an {@link org.lanesift.plugin.InputException} is bad input (exit 2), a
 * {@link org.lanesift.plugin.DeviceFailure} a failed device (exit 1), anything else a bug (exit 1,
 * "internal error").
 */
public final class StageFailure extends ChainException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;
    /** The failing instance. */
    private final String instanceId;

    /**
     * Creates the failure.
     *
     * @param instanceId the failing instance
     * @param message    what failed
     * @param cause      the stage's exception
     */
    public StageFailure(String instanceId, String message, Throwable cause) {
        super(message, null, cause);
        this.instanceId = instanceId;
    }

    /**
     * The failing instance.
     *
     * @return instance id
     */
    public String instanceId() {
        return instanceId;
    }
}
