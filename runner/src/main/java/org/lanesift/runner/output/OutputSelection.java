package org.lanesift.runner.output;

import java.util.ArrayList;
import java.util.Collection;
import java.util.EnumSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.TreeSet;
import org.lanesift.data.DataKind;

/**
 * Which of a chain's results a run writes, and in which forms (docs/chain-file.md, "Which outputs a
 * run writes"): the chain file's {@code outputs} field or {@code run --outputs}. A result is an
 * output no wire consumes; a <em>by-product</em> is such an output of an instance whose other
 * outputs feed further instances (a differential's logic beside the edges a sampler takes), and is
 * left out unless asked for. Names are checked against a fixed list and the chain's own results;
 * an unknown name is an error naming the field and listing the valid names.
 */
public final class OutputSelection {
    /** One way of writing a result (or the annotations). */
    public enum Form {
        /** Edges, logic and word streams in {@code signals.vcd}. */
        VCD,
        /** Analog outputs and bit streams as CSV. */
        CSV,
        /** Bit streams and word streams in the packed binary forms (docs/bits-binary.md). */
        BINARY,
        /** Artifacts: reports, tables, pictures, as the stage made them. */
        ARTIFACTS,
        /** Every annotation in {@code annotations.jsonl}. */
        ANNOTATIONS;

        /**
         * The name used in the {@code outputs} field.
         *
         * @return lower-case name
         */
        public String label() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    /** The forms written when the list names none: what a run wrote before output selection existed. */
    public static final Set<Form> STANDARD = Set.copyOf(EnumSet.of(Form.VCD, Form.CSV, Form.ARTIFACTS, Form.ANNOTATIONS));
    /** Name of the standard forms. */
    public static final String STANDARD_NAME = "standard";
    /** Name that adds the by-products. */
    public static final String BY_PRODUCTS = "by-products";
    /** Name that writes no output file (report.md only). */
    public static final String NONE = "none";

    private final Set<Form> forms;
    private final Set<String> named;
    private final boolean byProducts;
    private final Set<String> byProductNames;

    private OutputSelection(Set<Form> forms, Set<String> named, boolean byProducts, Set<String> byProductNames) {
        this.forms = forms;
        this.named = named;
        this.byProducts = byProducts;
        this.byProductNames = byProductNames;
    }

    /**
     * Reads a list of names.
     *
     * @param names       the list, or null for the default (the standard forms, no by-products)
     * @param results     the chain's results, as {@code instance.output}
     * @param byProducts  those of the results that are by-products
     * @return the selection
     * @throws SelectionException naming the entry and listing the valid names (the caller names the field)
     */
    public static OutputSelection of(List<String> names, Collection<String> results, Collection<String> byProducts) {
        Set<String> bp = Set.copyOf(byProducts);
        if (names == null) {
            return new OutputSelection(STANDARD, Set.of(), false, bp);
        }
        if (names.isEmpty()) {
            throw new SelectionException(-1, "is empty; expected at least one name, or '" + NONE + "'");
        }
        Set<Form> forms = EnumSet.noneOf(Form.class);
        Set<String> named = new LinkedHashSet<>();
        boolean withByProducts = false;
        for (int i = 0; i < names.size(); i++) {
            String n = names.get(i).trim();
            if (n.equals(NONE)) {
                if (names.size() > 1) {
                    throw new SelectionException(i, "'" + NONE + "' writes no output file and cannot be combined with other names");
                }
                return new OutputSelection(Set.of(), Set.of(), false, bp);
            } else if (n.equals(STANDARD_NAME)) {
                forms.addAll(STANDARD);
            } else if (n.equals(BY_PRODUCTS)) {
                withByProducts = true;
            } else if (form(n) != null) {
                forms.add(form(n));
            } else if (results.contains(n)) {
                named.add(n);
            } else {
                throw new SelectionException(i, "unknown output name '" + org.lanesift.plugin.Echo.of(n) + "'; expected one of: "
                        + String.join(", ", validNames(results)));
            }
        }
        if (forms.isEmpty()) {
            forms.addAll(STANDARD);
        }
        return new OutputSelection(Set.copyOf(forms), Set.copyOf(named), withByProducts, bp);
    }

    /**
     * Every name a list may hold for a chain: the keywords, the forms, then the chain's results.
     *
     * @param results the chain's results, as {@code instance.output}
     * @return the names
     */
    public static List<String> validNames(Collection<String> results) {
        List<String> v = new ArrayList<>(List.of(NONE, STANDARD_NAME, BY_PRODUCTS));
        for (Form f : Form.values()) {
            v.add(f.label());
        }
        v.addAll(new TreeSet<>(results));
        return v;
    }

    private static Form form(String name) {
        for (Form f : Form.values()) {
            if (f.label().equals(name)) {
                return f;
            }
        }
        return null;
    }

    /**
     * Whether a result is written at all (in at least one of the selected forms that suits its kind
     * is decided by {@link #writes(Form)}).
     *
     * @param output {@code instance.output}
     * @return true when it was named, or when no output was named and it is not a by-product (or
     *         by-products were asked for)
     */
    public boolean wants(String output) {
        if (!named.isEmpty()) {
            return named.contains(output);
        }
        return byProducts || !byProductNames.contains(output);
    }

    /**
     * Whether a result of a kind is written, given its name: {@link #wants} and a selected form that
     * can hold the kind.
     *
     * @param output {@code instance.output}
     * @param kind   its kind (null or ANY when not known before it arrives)
     * @return true when some selected form takes it
     */
    public boolean wants(String output, DataKind kind) {
        if (!wants(output)) {
            return false;
        }
        if (kind == null || kind == DataKind.ANY) {
            return !forms.isEmpty();
        }
        return switch (kind) {
            case EDGES, LOGIC -> forms.contains(Form.VCD);
            case WORDS -> forms.contains(Form.VCD) || forms.contains(Form.BINARY);
            case BITS -> forms.contains(Form.CSV) || forms.contains(Form.BINARY);
            case ANALOG -> forms.contains(Form.CSV);
            case ARTIFACT -> forms.contains(Form.ARTIFACTS);
            case FRAME -> true;
            default -> !forms.isEmpty();
        };
    }

    /**
     * Whether a form is selected.
     *
     * @param form the form
     * @return true when written
     */
    public boolean writes(Form form) {
        return forms.contains(form);
    }

    /**
     * The selection in words, for report.md.
     *
     * @return such as "vcd, csv, artifacts, annotations; by-products left out"
     */
    public String describe() {
        if (forms.isEmpty()) {
            return NONE + " (no output files; this report only)";
        }
        List<String> f = new ArrayList<>();
        for (Form x : Form.values()) {
            if (forms.contains(x)) {
                f.add(x.label());
            }
        }
        String which = !named.isEmpty() ? "only " + String.join(", ", new TreeSet<>(named))
                : byProducts ? "all results, by-products included" : "all results but by-products";
        return String.join(", ", f) + "; " + which;
    }

    /**
     * A name in an {@code outputs} list that is not valid: the entry and the valid names; the host
     * puts the field (chain file and JSON pointer, or the command-line option) in front.
     */
    public static final class SelectionException extends org.lanesift.plugin.InputException {
        private static final long serialVersionUID = 1L;
        private final int index;

        SelectionException(int index, String message) {
            super(message);
            this.index = index;
        }

        /**
         * The entry at fault.
         *
         * @return its index in the list, or -1 for the list itself
         */
        public int index() {
            return index;
        }
    }
}
