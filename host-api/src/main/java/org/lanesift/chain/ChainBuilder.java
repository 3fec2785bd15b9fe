package org.lanesift.chain;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.PluginRegistry;

/**
 * Builds a {@link Chain} in code, one call a step, and is usable from JShell:
 *
 * <pre>{@code
 * Chain c = Chain.builder(PluginRegistry.discover(null))
 *     .input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
 *     .add("rx", "differential", Map.of("mode", "pair"))
 *     .wire("p", "rx.p").wire("n", "rx.n")
 *     .tap("rx.edges", b -> System.out.println(b))
 *     .build();
 * }</pre>
 *
 * Nothing is checked until {@link #build()}, which checks everything before any stage opens.
 */
public final class ChainBuilder {
    final PluginRegistry registry;
    final Map<String, NodeDef> nodes = new LinkedHashMap<>();
    final List<WireDef> wires = new ArrayList<>();
    final List<TapDef> taps = new ArrayList<>();
    AnnotationSink annotations = (s, a) -> { };
    BlockSink outputs;
    ProgressListener progress = (d, t) -> { };

    record NodeDef(String id, String plugin, Map<String, Object> options, DataKind externalKind, String pointer) {
    }

    record WireDef(String from, String to, String pointer) {
    }

    record TapDef(String at, Consumer<Block> consumer) {
    }

    ChainBuilder(PluginRegistry registry) {
        this.registry = registry;
    }

    /**
     * Builds from the plain data model; errors carry JSON pointers into it.
     *
     * @param spec     the model
     * @param registry where plugins are looked up
     * @return a builder holding the model's nodes and wires
     */
    public static ChainBuilder fromSpec(ChainSpec spec, PluginRegistry registry) {
        ChainBuilder b = new ChainBuilder(registry);
        for (int i = 0; i < spec.nodes().size(); i++) {
            ChainSpec.Node n = spec.nodes().get(i);
            b.addAt(n.id(), n.plugin(), n.options(), null, "/nodes/" + i);
        }
        for (int i = 0; i < spec.wires().size(); i++) {
            ChainSpec.Wire w = spec.wires().get(i);
            b.wires.add(new WireDef(w.from(), w.to(), "/wires/" + i));
        }
        return b;
    }

    private ChainBuilder addAt(String id, String plugin, Map<String, ?> options, DataKind ext, String pointer) {
        if (id == null || !id.matches("[A-Za-z0-9_-]+")) {
            throw new ChainException("instance id must be letters, digits, '_' or '-', got '" + id + "'", pointer == null ? null : pointer + "/id");
        }
        if (nodes.containsKey(id)) {
            throw new ChainException("instance id '" + id + "' is used twice", pointer == null ? null : pointer + "/id");
        }
        nodes.put(id, new NodeDef(id, plugin, options == null ? Map.of() : new LinkedHashMap<>(options), ext, pointer));
        return this;
    }

    /**
     * Adds a plugin instance.
     *
     * @param id      instance id, unique
     * @param plugin  plugin id
     * @param options raw options
     * @return this
     */
    public ChainBuilder add(String id, String plugin, Map<String, ?> options) {
        return addAt(id, plugin, options, null, null);
    }

    /**
     * Adds a plugin instance with default options.
     *
     * @param id     instance id
     * @param plugin plugin id
     * @return this
     */
    public ChainBuilder add(String id, String plugin) {
        return add(id, plugin, Map.of());
    }

    /**
     * Adds an external input: a pseudo-instance with one output {@code out} that the host feeds
     * with {@link Chain#push(String, Block)} (the embedded way of running a chain).
     *
     * @param id   name of the input
     * @param kind kind of blocks the host will push
     * @return this
     */
    public ChainBuilder input(String id, DataKind kind) {
        return addAt(id, null, Map.of(), kind, null);
    }

    /**
     * Wires an output to an input.
     *
     * @param from {@code "instance.output"} or {@code "instance"} for its only output
     * @param to   {@code "instance.input"} or {@code "instance"} for its only input
     * @return this
     */
    public ChainBuilder wire(String from, String to) {
        wires.add(new WireDef(from, to, null));
        return this;
    }

    /**
     * Receives every block an output emits, in addition to its wires.
     *
     * @param at       {@code "instance.output"}
     * @param consumer the receiver
     * @return this
     */
    public ChainBuilder tap(String at, Consumer<Block> consumer) {
        taps.add(new TapDef(at, consumer));
        return this;
    }

    /**
     * Receives annotations from every stage.
     *
     * @param sink the sink
     * @return this
     */
    public ChainBuilder annotations(AnnotationSink sink) {
        annotations = sink;
        return this;
    }

    /**
     * Receives blocks of every output that has no wire.
     *
     * @param sink the sink
     * @return this
     */
    public ChainBuilder outputs(BlockSink sink) {
        outputs = sink;
        return this;
    }

    /**
     * Receives progress reports.
     *
     * @param l the listener
     * @return this
     */
    public ChainBuilder progress(ProgressListener l) {
        progress = l;
        return this;
    }

    /**
     * Checks the whole graph (plugins exist, options valid, ports exist, kinds match, every
     * required input wired, no input wired twice, no cycle), then opens every stage. With
     * calibration wires the stages opened are those of the final pass; {@link Chain#run()} runs
     * the calibration passes first.
     *
     * @return the ready chain
     * @throws ChainException naming the offending instance, port or JSON pointer
     */
    public Chain build() {
        ChainPlan plan = ChainPlan.of(this);
        CalibrationPasses passes = CalibrationPasses.of(plan);
        if (passes == null) {
            return ChainOpener.open(plan, annotations, progress, outputs);
        }
        Chain c = ChainOpener.open(passes.finalPlan(), annotations, passes.progress(progress, passes.count()), outputs);
        c.calibrateFirst(passes, progress);
        return c;
    }
}
