package org.lanesift.plugins.pixellink;

/**
 * Learns which level of a sync signal (HS or VS) is active: the level it enters when it leaves a
 * run during which DE was high (a sync pulse sits in blanking, after active video), unless the
 * polarity was given as an option. Edges before the polarity is known carry no measurement.
 */
final class SyncPolarity {
    private final int forced;
    private int active = -1;
    private boolean deInRun;

    /** @param forced 0 or 1 to fix the active level, -1 to learn it */
    SyncPolarity(int forced) {
        this.forced = forced;
    }

    /** The active level, 0 or 1, or -1 while unknown. */
    int active() {
        return active;
    }

    boolean known() {
        return active >= 0;
    }

    /** DE was high: the run of the sync signal now contains active video. */
    void deSeen() {
        deInRun = true;
    }

    /** At the first pixel: whether DE is high. */
    void start(boolean de) {
        deInRun = de;
    }

    /**
     * An edge of the sync signal.
     *
     * @param level  the level it enters, 0 or 1
     * @param deNow  whether DE is high at the edge
     * @return true if the polarity is known (from now on, or already)
     */
    boolean edge(int level, boolean deNow) {
        if (active < 0) {
            if (forced >= 0) {
                active = forced;
            } else if (deInRun) {
                active = level;
            } else {
                deInRun = deNow;
                return false;
            }
        }
        deInRun = deNow;
        return true;
    }
}
