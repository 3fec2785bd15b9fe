package org.lanesift.plugins.packetlink;

/** The line states of one lane as told by its two single-ended legs (MIPI D-PHY, from memory). */
enum LaneState {
    /** Both legs high: stop state. */
    LP11("LP-11"),
    /** Positive leg high, negative low. */
    LP10("LP-10"),
    /** Positive leg low, negative high. */
    LP01("LP-01"),
    /** Both legs low, near 0 V. */
    LP00("LP-00"),
    /** Both legs near the high-speed common mode: a high-speed burst. */
    HS("HS"),
    /** Levels fit no state (between thresholds, or common mode outside the high-speed range). */
    INVALID("invalid");

    final String label;

    LaneState(String label) {
        this.label = label;
    }
}
