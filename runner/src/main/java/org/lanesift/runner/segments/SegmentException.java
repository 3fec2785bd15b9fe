package org.lanesift.runner.segments;

/** A chain that cannot be decoded in segments, or a seam where two segments disagree. */
public final class SegmentException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    /**
     * Creates the exception.
     *
     * @param message what prevents segments, naming the instance, wire or option
     */
    public SegmentException(String message) {
        super(message);
    }
}
