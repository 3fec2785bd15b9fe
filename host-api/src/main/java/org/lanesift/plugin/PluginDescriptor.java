package org.lanesift.plugin;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.function.Function;

/**
 * What a plugin is and how to wire it: a stable id, display name, version, description, options,
 * and input and output ports. Ports may depend on the options (a sampler with {@code lanes=3} has
 * inputs {@code lane0..lane2}); supply a port function for that, otherwise the fixed lists apply.
 */
public final class PluginDescriptor {
    private final String id;
    private final String displayName;
    private final String version;
    private final String description;
    private final List<OptionSpec> options;
    private final Function<OptionValues, List<PortSpec>> inputs;
    private final Function<OptionValues, List<PortSpec>> outputs;
    private final Function<OptionValues, SegmentSupport> segments;
    private final boolean readsLentBlocks;

    private PluginDescriptor(Builder b) {
        this.id = b.id;
        this.displayName = b.displayName == null ? b.id : b.displayName;
        this.version = b.version;
        this.description = b.description;
        this.options = List.copyOf(b.options);
        List<PortSpec> fi = List.copyOf(b.fixedInputs);
        List<PortSpec> fo = List.copyOf(b.fixedOutputs);
        this.inputs = b.inputs != null ? b.inputs : o -> fi;
        this.outputs = b.outputs != null ? b.outputs : o -> fo;
        SegmentSupport none = SegmentSupport.no("plugin '" + b.id + "' does not declare that it can decode in segments");
        this.segments = b.segments != null ? b.segments : o -> none;
        this.readsLentBlocks = b.readsLentBlocks;
    }

    /**
     * Starts a descriptor.
     *
     * @param id stable id, lower case with '-' and '.', such as {@code "differential"}
     * @return a builder
     */
    public static Builder builder(String id) {
        return new Builder(id);
    }

    /**
     * Stable id used in chain files.
     *
     * @return the id
     */
    public String id() {
        return id;
    }

    /**
     * Name to show users.
     *
     * @return the name
     */
    public String displayName() {
        return displayName;
    }

    /**
     * Plugin version.
     *
     * @return the version text
     */
    public String version() {
        return version;
    }

    /**
     * One paragraph on what it does.
     *
     * @return the description
     */
    public String description() {
        return description;
    }

    /**
     * Declared options.
     *
     * @return the options in declaration order
     */
    public List<OptionSpec> options() {
        return options;
    }

    /**
     * Looks up an option.
     *
     * @param name option name
     * @return the spec, or null
     */
    public OptionSpec option(String name) {
        for (OptionSpec o : options) {
            if (o.name().equals(name)) {
                return o;
            }
        }
        return null;
    }

    /**
     * Input ports for given options.
     *
     * @param values validated options
     * @return ports in order; the stage receives input indices into this list
     */
    public List<PortSpec> inputs(OptionValues values) {
        return inputs.apply(values);
    }

    /**
     * Output ports for given options.
     *
     * @param values validated options
     * @return ports in order; the stage emits with indices into this list
     */
    public List<PortSpec> outputs(OptionValues values) {
        return outputs.apply(values);
    }

    /**
     * Whether a stage with these options can decode a capture cut into independent time segments
     * (see {@link SegmentSupport}); plugins that do not declare it cannot.
     *
     * @param values validated options
     * @return the support, never null
     */
    public SegmentSupport segmentSupport(OptionValues values) {
        SegmentSupport s = segments.apply(values);
        return s == null ? SegmentSupport.no("plugin '" + id + "' gave no segment support") : s;
    }

    /**
     * Whether the plugin's stages may be handed lent blocks: they read a received block's arrays
     * only until {@link Stage#accept} returns, copy whatever they need later, and never emit a
     * block that shares a received block's arrays. See {@link org.lanesift.data.Block}, "Ownership".
     *
     * @return true when declared with {@link Builder#readsLentBlocks()}; false by default
     */
    public boolean readsLentBlocks() {
        return readsLentBlocks;
    }

    @Override
    public String toString() {
        return id + " " + version;
    }

    /** Builds a {@link PluginDescriptor}. */
    public static final class Builder {
        private final String id;
        private String displayName;
        private String version = "0.1.0";
        private String description = "";
        private final List<OptionSpec> options = new ArrayList<>();
        private final List<PortSpec> fixedInputs = new ArrayList<>();
        private final List<PortSpec> fixedOutputs = new ArrayList<>();
        private Function<OptionValues, List<PortSpec>> inputs;
        private Function<OptionValues, List<PortSpec>> outputs;
        private Function<OptionValues, SegmentSupport> segments;
        private boolean readsLentBlocks;

        private Builder(String id) {
            if (id == null || !id.matches("[a-z0-9][a-z0-9.-]*")) {
                throw new IllegalArgumentException("plugin id must be lower case letters, digits, '.' and '-', got '" + id + "'");
            }
            this.id = id;
        }

        /**
         * Sets the display name.
         *
         * @param s name
         * @return this
         */
        public Builder name(String s) {
            displayName = s;
            return this;
        }

        /**
         * Sets the version.
         *
         * @param s version
         * @return this
         */
        public Builder version(String s) {
            version = Objects.requireNonNull(s);
            return this;
        }

        /**
         * Sets the description.
         *
         * @param s description
         * @return this
         */
        public Builder description(String s) {
            description = Objects.requireNonNull(s);
            return this;
        }

        /**
         * Adds an option.
         *
         * @param o option
         * @return this
         */
        public Builder option(OptionSpec o) {
            if (options.stream().anyMatch(x -> x.name().equals(o.name()))) {
                throw new IllegalArgumentException("plugin '" + id + "': option '" + o.name() + "' declared twice");
            }
            options.add(o);
            return this;
        }

        /**
         * Adds a fixed input port.
         *
         * @param p port
         * @return this
         */
        public Builder input(PortSpec p) {
            fixedInputs.add(p);
            return this;
        }

        /**
         * Adds a fixed output port.
         *
         * @param p port
         * @return this
         */
        public Builder output(PortSpec p) {
            fixedOutputs.add(p);
            return this;
        }

        /**
         * Makes the inputs depend on the options (replaces fixed inputs).
         *
         * @param f function from options to ports
         * @return this
         */
        public Builder inputs(Function<OptionValues, List<PortSpec>> f) {
            inputs = f;
            return this;
        }

        /**
         * Makes the outputs depend on the options (replaces fixed outputs).
         *
         * @param f function from options to ports
         * @return this
         */
        public Builder outputs(Function<OptionValues, List<PortSpec>> f) {
            outputs = f;
            return this;
        }

        /**
         * Declares whether, and after how much warm-up, the stage can decode in independent time
         * segments for given options (see {@link SegmentSupport}). Without it, it cannot.
         *
         * @param f function from options to support
         * @return this
         */
        public Builder segments(Function<OptionValues, SegmentSupport> f) {
            segments = f;
            return this;
        }

        /**
         * Declares that the plugin's stages keep no received block, nor its arrays, past the return
         * of {@link Stage#accept}, so that a source may recycle the arrays of the blocks it sends
         * them (see {@link org.lanesift.data.Block}, "Ownership"). A stage that queues blocks
         * until another input catches up must copy them before it declares this.
         *
         * @return this
         */
        public Builder readsLentBlocks() {
            readsLentBlocks = true;
            return this;
        }

        /**
         * Builds the descriptor.
         *
         * @return the descriptor
         */
        public PluginDescriptor build() {
            return new PluginDescriptor(this);
        }
    }
}
