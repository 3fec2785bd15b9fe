package org.lanesift.plugins.discovery;

/** How the words of one burst are spread over the lanes. */
enum LaneDistribution {
    /** One lane: nothing to spread. */
    SINGLE("single"),
    /** Word k of the burst on lane k mod N (each lane has the sync). */
    WORD("word"),
    /** Bit k of the burst on lane k mod N (each lane has the sync). */
    BIT("bit"),
    /** Each lane its own stream of bursts. */
    INDEPENDENT("independent");

    final String label;

    LaneDistribution(String label) {
        this.label = label;
    }
}
