package org.lanesift.annotation;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;

/**
 * A statement about a span of the capture that a GUI draws on a row and a file export lists: a
 * decoded packet, a frame boundary, a measurement, a finding.
 *
 * @param startFs  start of the span, femtoseconds
 * @param endFs    end of the span (equal to start for an instant)
 * @param track    the row it belongs on, such as {@code "lane0.bits"} or {@code "levels"}
 * @param kind     a stable machine name of what it is, such as {@code "packet"}, {@code "margin-low"}
 * @param label    a short human text, a few words
 * @param severity how much it matters
 * @param fields   typed values, in insertion order (unmodifiable)
 */
public record Annotation(long startFs, long endFs, String track, String kind, String label, Severity severity,
                         Map<String, Field> fields) {

    /**
     * Checks the fields.
     *
     * @param startFs start of the span, femtoseconds
     * @param endFs end of the span (equal to start for an instant)
     * @param track the row it belongs on, such as {@code "lane0.bits"} or {@code "levels"}
     * @param kind a stable machine name of what it is, such as {@code "packet"}, {@code "margin-low"}
     * @param label a short human text, a few words
     * @param severity how much it matters
     * @param fields typed values, in insertion order (unmodifiable)
     */
    public Annotation {
        Objects.requireNonNull(track, "track");
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(label, "label");
        Objects.requireNonNull(severity, "severity");
        if (endFs < startFs) {
            throw new IllegalArgumentException("annotation '" + kind + "' ends before it starts");
        }
        fields = fields == null ? Map.of() : Collections.unmodifiableMap(new LinkedHashMap<>(fields));
    }

    /**
     * Starts building an annotation.
     *
     * @param track row name
     * @param kind  machine name of what it is
     * @return a builder with severity {@link Severity#INFO}
     */
    public static Builder on(String track, String kind) {
        return new Builder(track, kind);
    }

    /** Builds an {@link Annotation} step by step. */
    public static final class Builder {
        private final String track;
        private final String kind;
        private long startFs;
        private long endFs;
        private String label = "";
        private Severity severity = Severity.INFO;
        private final Map<String, Field> fields = new LinkedHashMap<>();

        private Builder(String track, String kind) {
            this.track = track;
            this.kind = kind;
        }

        /**
         * Sets the span.
         *
         * @param startFs start, femtoseconds
         * @param endFs   end, femtoseconds
         * @return this builder
         */
        public Builder span(long startFs, long endFs) {
            this.startFs = startFs;
            this.endFs = endFs;
            return this;
        }

        /**
         * Sets the label.
         *
         * @param label short text
         * @return this builder
         */
        public Builder label(String label) {
            this.label = label;
            return this;
        }

        /**
         * Sets the severity.
         *
         * @param s severity
         * @return this builder
         */
        public Builder severity(Severity s) {
            this.severity = s;
            return this;
        }

        /**
         * Adds a field.
         *
         * @param name field name
         * @param f    value
         * @return this builder
         */
        public Builder field(String name, Field f) {
            fields.put(name, f);
            return this;
        }

        /**
         * Adds a number field.
         *
         * @param name field name
         * @param v    value
         * @param unit unit symbol
         * @return this builder
         */
        public Builder number(String name, double v, String unit) {
            return field(name, Field.number(v, unit));
        }

        /**
         * Adds a text field.
         *
         * @param name field name
         * @param s    text
         * @return this builder
         */
        public Builder text(String name, String s) {
            return field(name, Field.text(s));
        }

        /**
         * Builds the annotation.
         *
         * @return the annotation
         */
        public Annotation build() {
            return new Annotation(startFs, endFs, track, kind, label, severity, fields);
        }
    }
}
