package org.lanesift.plugin;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * The declaration of a {@link Tool}'s command line: name, summary, description, options (each an
 * {@link OptionSpec} with type, unit, default, range and help), optional subcommands and a footer.
 * The host builds its parser, {@code --help}, the value conversion with units and the error line
 * from it, the same way for every command; the tool never sees the argument array.
 *
 * @param name        command name, lower case with hyphens ({@code "cable-delay"})
 * @param summary     one line for the host's command list
 * @param description text shown above the options in {@code --help}, one paragraph (the host wraps it)
 * @param options     the options, written {@code --NAME} on the command line
 * @param subcommands subcommands (such as {@code probe divider}), each with options of its own; empty if none
 * @param footer      paragraphs shown below the options (exit codes, cautions, where the docs are), each wrapped by the host
 */
public record ToolSpec(String name, String summary, List<String> description, List<ToolOption> options,
                       List<ToolSpec> subcommands, List<String> footer) {

    /**
     * Normalises and checks that option names are unique.
     *
     * @param name        command name
     * @param summary     one line
     * @param description lines above the options
     * @param options     the options
     * @param subcommands the subcommands
     * @param footer      lines below the options
     */
    public ToolSpec {
        Objects.requireNonNull(name, "name");
        if (!name.matches("[a-z][a-z0-9-]*")) {
            throw new IllegalArgumentException("command name '" + name + "': expected lower case letters, digits and hyphens");
        }
        summary = summary == null ? "" : summary;
        description = List.copyOf(description == null ? List.of() : description);
        options = List.copyOf(options == null ? List.of() : options);
        subcommands = List.copyOf(subcommands == null ? List.of() : subcommands);
        footer = List.copyOf(footer == null ? List.of() : footer);
        java.util.Set<String> seen = new java.util.HashSet<>();
        for (ToolOption o : options) {
            if (!seen.add(o.spec().name())) {
                throw new IllegalArgumentException("command '" + name + "': option --" + o.spec().name() + " declared twice");
            }
        }
    }

    /**
     * Starts a declaration.
     *
     * @param name command name
     * @return a builder
     */
    public static Builder builder(String name) {
        return new Builder(name);
    }

    /**
     * The option of this name.
     *
     * @param optionName name without the dashes
     * @return the option, or null
     */
    public ToolOption option(String optionName) {
        for (ToolOption o : options) {
            if (o.spec().name().equals(optionName)) {
                return o;
            }
        }
        return null;
    }

    /** Builds a {@link ToolSpec}. */
    public static final class Builder {
        private final String name;
        private String summary = "";
        private final List<String> description = new ArrayList<>();
        private final List<ToolOption> options = new ArrayList<>();
        private final List<ToolSpec> subcommands = new ArrayList<>();
        private final List<String> footer = new ArrayList<>();

        private Builder(String name) {
            this.name = name;
        }

        /**
         * Sets the summary.
         *
         * @param text one line
         * @return this
         */
        public Builder summary(String text) {
            summary = text;
            return this;
        }

        /**
         * Adds description lines.
         *
         * @param lines lines above the options
         * @return this
         */
        public Builder description(String... lines) {
            description.addAll(List.of(lines));
            return this;
        }

        /**
         * Adds an optional option; without a default in {@code spec}, it is absent unless given.
         *
         * @param spec  name, type, unit, default, range, help
         * @param label placeholder in the help, such as {@code "METRES"}
         * @return this
         */
        public Builder option(OptionSpec spec, String label) {
            options.add(new ToolOption(spec, label, false));
            return this;
        }

        /**
         * Adds a required option.
         *
         * @param spec  name, type, unit, range, help
         * @param label placeholder in the help
         * @return this
         */
        public Builder required(OptionSpec spec, String label) {
            options.add(new ToolOption(spec, label, true));
            return this;
        }

        /**
         * Adds a flag: an option without a value, false unless given.
         *
         * @param flagName name without the dashes
         * @param help     one line
         * @return this
         */
        public Builder flag(String flagName, String help) {
            options.add(new ToolOption(OptionSpec.bool(flagName, false, help), "", false));
            return this;
        }

        /**
         * Adds options declared elsewhere, such as those of a command this one drives.
         *
         * @param more the options
         * @return this
         */
        public Builder options(List<ToolOption> more) {
            options.addAll(more);
            return this;
        }

        /**
         * Adds a subcommand.
         *
         * @param sub its declaration
         * @return this
         */
        public Builder subcommand(ToolSpec sub) {
            subcommands.add(sub);
            return this;
        }

        /**
         * Adds footer lines.
         *
         * @param lines lines below the options
         * @return this
         */
        public Builder footer(String... lines) {
            footer.addAll(List.of(lines));
            return this;
        }

        /**
         * Builds the declaration.
         *
         * @return the spec
         */
        public ToolSpec build() {
            return new ToolSpec(name, summary, description, options, subcommands, footer);
        }
    }
}
