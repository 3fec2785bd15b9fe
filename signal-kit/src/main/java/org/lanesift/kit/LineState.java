package org.lanesift.kit;

/**
 * The line states of one D-PHY-like lane as told by its two single-ended legs
 * (docs/reference-facts.md#d-phy-levels-and-states; MIPI D-PHY, from memory).
 */
public enum LineState {
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

    /** The state's name in reports, such as {@code LP-11}. */
    public final String label;

    LineState(String label) {
        this.label = label;
    }
}
