package org.lanesift.kit;

/**
 * Keeps the line state of a lane steady against short excursions: a new state counts (is
 * committed) only once every sample since its first has shown it for at least {@code minStateFs};
 * it then starts at that first sample. A sample of the committed state drops any pending change.
 * One instance per lane. Used by the {@code packet-link} decoder and by format discovery, so both
 * see the same states.
 */
public final class LineStateFilter {
    private final long minStateFs;
    private LineState committed;
    private long committedStartFs;
    private LineState candidate;
    private long candidateStartFs;

    /**
     * @param minStateFs how long a state must last to count, femtoseconds
     *                   ({@link LineStateClassifier#DEFAULT_MIN_STATE_FS} by default)
     */
    public LineStateFilter(long minStateFs) {
        this.minStateFs = minStateFs;
    }

    /**
     * Takes the state of the next sample.
     *
     * @param s   the sample's state
     * @param tFs the sample's time, femtoseconds (not before the previous sample's)
     * @return true when this sample commits a new state ({@link #committed()}, from {@link #committedStartFs()})
     */
    public boolean step(LineState s, long tFs) {
        if (s == committed) {
            candidate = null;
            return false;
        }
        if (candidate != s) {
            candidate = s;
            candidateStartFs = tFs;
        }
        return tFs - candidateStartFs >= minStateFs && commitCandidate();
    }

    /**
     * At the end of the input: commits a pending change of state that has lasted {@code minStateFs}
     * by {@code endFs} (only after a first state was committed).
     *
     * @param endFs the end of the input, femtoseconds
     * @return true when a state was committed
     */
    public boolean flush(long endFs) {
        return candidate != null && committed != null && endFs - candidateStartFs >= minStateFs && commitCandidate();
    }

    private boolean commitCandidate() {
        committed = candidate;
        committedStartFs = candidateStartFs;
        candidate = null;
        return true;
    }

    /** @return the committed state, or null before the first */
    public LineState committed() {
        return committed;
    }

    /** @return the first sample time of the committed state, femtoseconds */
    public long committedStartFs() {
        return committedStartFs;
    }
}
