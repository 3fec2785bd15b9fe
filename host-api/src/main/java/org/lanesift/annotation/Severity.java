package org.lanesift.annotation;

/** How much an annotation matters to the user. */
public enum Severity {
    /** Decoded content or a measurement: nothing wrong. */
    INFO,
    /** The result is usable but something is marginal (a margin below 15 % of a UI, a level near a limit). */
    WARNING,
    /** Something is wrong (a checksum mismatch, a level outside the standard, a lost lock). */
    ERROR
}
