package org.lanesift.report;

import java.util.Objects;

/**
 * Where a reported value comes from: {@code measured} from the capture, taken from a
 * {@code standard} (always with its section anchor in docs/reference-facts.md), {@code derived}
 * from other values by a stated relation, {@code given} by the user, or {@code assumed by default}.
 * {@link #text()} is the one wording every JSON report and report.md line uses, for example
 * {@code "measured: tail fits of the TIE distribution"} or
 * {@code "standard: ANSI/TIA/EIA-644-A (docs/reference-facts.md#lvds-electrical-levels)"}.
 *
 * @param kind   the kind of origin
 * @param detail how or from what, in a few words; may be empty
 */
public record Source(Kind kind, String detail) {
    /** The page standard values are cited from. */
    public static final String FACTS = "docs/reference-facts.md";

    /** The kinds of origin, with the word that starts {@link #text()}. */
    public enum Kind {
        /** Measured from the capture. */
        MEASURED("measured"),
        /** From a published standard or handbook, cited in docs/reference-facts.md. */
        STANDARD("standard"),
        /** Computed from other values by a stated relation. */
        DERIVED("derived"),
        /** Given by the user (an option or a map). */
        GIVEN("given"),
        /** A default standing in for what was not given. */
        ASSUMED("assumed by default");

        private final String word;

        Kind(String word) {
            this.word = word;
        }

        /** @return the word that starts the source text, e.g. {@code "assumed by default"} */
        public String word() {
            return word;
        }

        /**
         * The kind a source text starts with, the reverse of {@link Source#text()}.
         *
         * @param text a source text, e.g. {@code "given: the offsetsFile skew table"}
         * @return its kind, or null when it starts with none (a plain citation)
         */
        public static Kind of(String text) {
            for (Kind k : values()) {
                if (text.startsWith(k.word + ":") || text.equals(k.word)) {
                    return k;
                }
            }
            return null;
        }
    }

    /**
     * Checks that kind and detail are present.
     *
     * @param kind   the kind of origin
     * @param detail how or from what; may be empty
     */
    public Source {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(detail, "detail");
    }

    /**
     * A source of this kind.
     *
     * @param how how it was measured, or empty
     * @return the source
     */
    public static Source measured(String how) {
        return new Source(Kind.MEASURED, how);
    }

    /**
     * A value from a published standard or handbook, cited with its docs/reference-facts.md section.
     *
     * @param name   the standard (and, where it applies, "values from memory")
     * @param anchor the section anchor in docs/reference-facts.md, without '#', e.g. {@code lvds-electrical-levels}
     * @return the source
     * @throws IllegalArgumentException if the anchor is empty or not a plain lower-case anchor
     */
    public static Source standard(String name, String anchor) {
        if (anchor == null || !anchor.matches("[a-z0-9]+(-[a-z0-9]+)*")) {
            throw new IllegalArgumentException("a standard value needs its " + FACTS + " anchor, got '" + anchor + "'");
        }
        return new Source(Kind.STANDARD, name + " (" + FACTS + "#" + anchor + ")");
    }

    /**
     * A source of this kind.
     *
     * @param relation the relation and what it was applied to
     * @return the source
     */
    public static Source derived(String relation) {
        return new Source(Kind.DERIVED, relation);
    }

    /**
     * A source of this kind.
     *
     * @param what which option or map gave it
     * @return the source
     */
    public static Source given(String what) {
        return new Source(Kind.GIVEN, what);
    }

    /**
     * A source of this kind.
     *
     * @param why what the default stands for, and on what authority ("common practice", "from memory")
     * @return the source
     */
    public static Source assumed(String why) {
        return new Source(Kind.ASSUMED, why);
    }

    /** @return the kind's word, then ": " and the detail when there is one */
    public String text() {
        return detail.isEmpty() ? kind.word() : kind.word() + ": " + detail;
    }

    @Override
    public String toString() {
        return text();
    }
}
