package org.lanesift.runner.output;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.report.Source;

/**
 * Where the numbers of one finding come from, as report.md shows it after the finding's label.
 * A finding's numbers are measured from the capture unless its text field {@code source} says
 * otherwise: a {@code standard} source (see {@link Source#standard}) names where the finding's
 * limits come from, the values being measured; any other source ({@code given},
 * {@code assumed by default}, {@code derived}) is the source of the finding's values themselves.
 * A finding without a quantity (a decoded event such as a frame or a line, or one whose numbers
 * are only counts, without a unit) shows no source.
 */
final class FindingSource {
    private FindingSource() {
    }

    /**
     * @param a the finding
     * @return the text for report.md, e.g. {@code "measured; limit standard: ANSI/TIA/EIA-644-A, values from memory (...)"},
     *         or empty when the finding has no number and no source
     */
    static String of(Annotation a) {
        String cited = cited(a);
        if (cited != null && isStandard(cited)) {
            return Source.Kind.MEASURED.word() + "; limit " + cited;
        }
        if (cited != null) {
            return cited;
        }
        for (Field f : a.fields().values()) {
            if (f.type() == Field.Type.NUMBER && f.unit() != null && !f.unit().isEmpty()) {
                return Source.Kind.MEASURED.word();
            }
        }
        return "";
    }

    /**
     * @param a a finding
     * @return its text field {@code source}, or null
     */
    static String cited(Annotation a) {
        Field f = a.fields().get("source");
        return f != null && f.type() == Field.Type.TEXT ? String.valueOf(f.value()) : null;
    }

    /**
     * @param text a source text
     * @return whether it cites a standard: it starts with the standard kind's word, or names no kind
     *         at all (a plain citation of a published limit)
     */
    static boolean isStandard(String text) {
        Source.Kind k = Source.Kind.of(text);
        return k == null || k == Source.Kind.STANDARD;
    }
}
