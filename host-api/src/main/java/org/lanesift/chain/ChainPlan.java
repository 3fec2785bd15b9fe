package org.lanesift.chain;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Deque;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;

/**
 * The validated, immutable shape of a chain before any stage exists: each instance with its
 * plugin, validated options and resolved port types, every wire checked for kind and for a second
 * wire into the same input, required inputs checked, and the instances in topological order
 * (upstream first, declaration order where free). {@link ChainOpener} turns a plan into a running
 * {@link Chain}; building a plan opens nothing, so a plan that fails has nothing to close.
 */
final class ChainPlan {
    /** One end of a wire: an instance (index in declaration order) and a port index. */
    private record PortRef(int node, int port) {
    }

    /**
     * A wire leaving an output.
     *
     * @param to       index of the receiving step in {@link #steps()}
     * @param input    input index on that step
     * @param wireName {@code "from.port -> to.port"}, for messages
     */
    record Edge(int to, int input, String wireName) {
    }

    /**
     * One instance, in topological position.
     *
     * @param id           instance id
     * @param pointer      JSON pointer of its declaration in a chain file, or null
     * @param descriptor   plugin descriptor, null for an external input
     * @param provider     plugin provider, null for an external input
     * @param options      validated options, null for an external input
     * @param inputs       input ports under these options
     * @param outputs      output ports under these options
     * @param externalKind the kind a host pushes, or null for a plugin instance
     * @param targets      per output, the wires leaving it
     * @param taps         per output, the host's observers
     */
    record Step(String id, String pointer, PluginDescriptor descriptor, PluginProvider provider, OptionValues options,
                List<PortSpec> inputs, List<PortSpec> outputs, DataKind externalKind, List<List<Edge>> targets,
                List<List<Consumer<Block>>> taps) {
        String label() {
            return label(id, descriptor);
        }

        static String label(String id, PluginDescriptor descriptor) {
            return descriptor == null ? "input '" + id + "'" : "instance '" + id + "' (" + descriptor.id() + ")";
        }
    }

    /** An instance while the plan is being validated. */
    private static final class Draft {
        final String id;
        final String pointer;
        final PluginDescriptor descriptor;
        final PluginProvider provider;
        final OptionValues options;
        final List<PortSpec> inputs;
        final List<PortSpec> outputs;
        final DataKind externalKind;
        final List<List<PortRef>> targets = new ArrayList<>();
        final List<List<String>> wireNames = new ArrayList<>();
        final List<List<Consumer<Block>>> taps = new ArrayList<>();
        final boolean[] wiredInputs;

        Draft(String id, String pointer, PluginDescriptor d, PluginProvider p, OptionValues o, List<PortSpec> in,
              List<PortSpec> out, DataKind ext) {
            this.id = id;
            this.pointer = pointer;
            this.descriptor = d;
            this.provider = p;
            this.options = o;
            this.inputs = in;
            this.outputs = out;
            this.externalKind = ext;
            for (int i = 0; i < out.size(); i++) {
                targets.add(new ArrayList<>());
                wireNames.add(new ArrayList<>());
                taps.add(new ArrayList<>());
            }
            wiredInputs = new boolean[in.size()];
        }

        String label() {
            return Step.label(id, descriptor);
        }
    }

    private final List<Step> steps;

    private ChainPlan(List<Step> steps) {
        this.steps = steps;
    }

    /**
     * A plan made of steps already validated and ordered (a part of another plan, as
     * {@link CalibrationPasses} cuts it).
     *
     * @param steps steps in topological order, edges indexing into this list
     * @return the plan
     */
    static ChainPlan ofSteps(List<Step> steps) {
        return new ChainPlan(Collections.unmodifiableList(new ArrayList<>(steps)));
    }

    /**
     * Whether a wire leaving {@code from} ends on a calibration input.
     *
     * @param e the wire
     * @return true for a calibration wire
     */
    boolean isCalibration(Edge e) {
        return steps.get(e.to()).inputs().get(e.input()).calibration();
    }

    /**
     * The instances in topological order.
     *
     * @return unmodifiable list
     */
    List<Step> steps() {
        return steps;
    }

    /**
     * Validates a builder's description.
     *
     * @param b the builder
     * @return the plan
     * @throws ChainException naming the instance, wire or port at fault (with a JSON pointer when
     *                        the description came from a chain file)
     */
    static ChainPlan of(ChainBuilder b) {
        List<Draft> drafts = new ArrayList<>();
        Map<String, Integer> index = new HashMap<>();
        for (ChainBuilder.NodeDef d : b.nodes.values()) {
            index.put(d.id(), drafts.size());
            drafts.add(draft(b, d));
        }
        for (ChainBuilder.WireDef w : b.wires) {
            String ptr = w.pointer();
            PortRef from = resolve(drafts, index, w.from(), true, ptr == null ? null : ptr + "/from");
            PortRef to = resolve(drafts, index, w.to(), false, ptr == null ? null : ptr + "/to");
            Draft fn = drafts.get(from.node());
            Draft tn = drafts.get(to.node());
            PortSpec fp = fn.outputs.get(from.port());
            PortSpec tp = tn.inputs.get(to.port());
            String name = fn.id + "." + fp.name() + " -> " + tn.id + "." + tp.name();
            if (!tp.kind().accepts(fp.kind())) {
                throw new ChainException("wire " + name + ": output " + fn.id + "." + fp.name() + " carries " + fp.kind()
                        + " but input " + tn.id + "." + tp.name() + " expects " + tp.kind(), ptr);
            }
            if (tn.wiredInputs[to.port()]) {
                throw new ChainException("wire " + name + ": input " + tn.id + "." + tp.name() + " is already wired", ptr);
            }
            tn.wiredInputs[to.port()] = true;
            fn.targets.get(from.port()).add(to);
            fn.wireNames.get(from.port()).add(name);
        }
        for (ChainBuilder.TapDef t : b.taps) {
            PortRef at = resolve(drafts, index, t.at(), true, null);
            drafts.get(at.node()).taps.get(at.port()).add(t.consumer());
        }
        checkRequiredInputs(drafts, index);
        int[] order = topologicalOrder(drafts);
        int[] position = new int[drafts.size()];
        for (int k = 0; k < order.length; k++) {
            position[order[k]] = k;
        }
        List<Step> steps = new ArrayList<>(order.length);
        for (int k : order) {
            Draft d = drafts.get(k);
            List<List<Edge>> targets = new ArrayList<>();
            for (int o = 0; o < d.targets.size(); o++) {
                List<Edge> es = new ArrayList<>();
                for (int j = 0; j < d.targets.get(o).size(); j++) {
                    PortRef r = d.targets.get(o).get(j);
                    es.add(new Edge(position[r.node()], r.port(), d.wireNames.get(o).get(j)));
                }
                targets.add(Collections.unmodifiableList(es));
            }
            List<List<Consumer<Block>>> taps = new ArrayList<>();
            for (List<Consumer<Block>> ts : d.taps) {
                taps.add(Collections.unmodifiableList(new ArrayList<>(ts)));
            }
            steps.add(new Step(d.id, d.pointer, d.descriptor, d.provider, d.options, d.inputs, d.outputs, d.externalKind,
                    Collections.unmodifiableList(targets), Collections.unmodifiableList(taps)));
        }
        return new ChainPlan(Collections.unmodifiableList(steps));
    }

    private static Draft draft(ChainBuilder b, ChainBuilder.NodeDef d) {
        String ptr = d.pointer();
        if (d.externalKind() != null) {
            List<PortSpec> outs = List.of(PortSpec.of("out", d.externalKind(), "blocks pushed by the host"));
            return new Draft(d.id(), ptr, null, null, null, List.of(), outs, d.externalKind());
        }
        PluginProvider p = b.registry.find(d.plugin());
        if (p == null) {
            throw new ChainException("instance '" + d.id() + "': unknown plugin '" + d.plugin() + "'; known plugins: "
                    + String.join(", ", b.registry.all().stream().map(x -> x.descriptor().id()).toList()),
                    ptr == null ? null : ptr + "/plugin");
        }
        PluginDescriptor desc = p.descriptor();
        try {
            OptionValues ov = OptionValues.validate(desc, d.options());
            return new Draft(d.id(), ptr, desc, p, ov, desc.inputs(ov), desc.outputs(ov), null);
        } catch (OptionException e) {
            throw new ChainException("instance '" + d.id() + "': " + e.getMessage(),
                    ptr == null ? null : ptr + "/options/" + e.option(), e);
        }
    }

    /** Checked in the order a hash map of the ids yields, as the engine always has, so the first error named is stable. */
    private static void checkRequiredInputs(List<Draft> drafts, Map<String, Integer> index) {
        for (int k : index.values()) {
            Draft n = drafts.get(k);
            for (int i = 0; i < n.inputs.size(); i++) {
                if (n.inputs.get(i).required() && !n.wiredInputs[i]) {
                    throw new ChainException(n.label() + ": required input '" + n.inputs.get(i).name() + "' is not wired",
                            n.pointer);
                }
            }
        }
    }

    /** Kahn's algorithm, taking ready instances in declaration order. */
    private static int[] topologicalOrder(List<Draft> drafts) {
        int n = drafts.size();
        int[] indeg = new int[n];
        for (Draft d : drafts) {
            for (List<PortRef> ts : d.targets) {
                for (PortRef t : ts) {
                    indeg[t.node()]++;
                }
            }
        }
        Deque<Integer> ready = new ArrayDeque<>();
        for (int k = 0; k < n; k++) {
            if (indeg[k] == 0) {
                ready.add(k);
            }
        }
        int[] order = new int[n];
        int count = 0;
        while (!ready.isEmpty()) {
            int k = ready.poll();
            order[count++] = k;
            for (List<PortRef> ts : drafts.get(k).targets) {
                for (PortRef t : ts) {
                    if (--indeg[t.node()] == 0) {
                        ready.add(t.node());
                    }
                }
            }
        }
        if (count != n) {
            List<String> cyc = new ArrayList<>();
            for (int k = 0; k < n; k++) {
                if (indeg[k] > 0) {
                    cyc.add(drafts.get(k).id);
                }
            }
            Collections.sort(cyc);
            throw new ChainException("the wires form a cycle through " + String.join(", ", cyc), null);
        }
        return order;
    }

    private static PortRef resolve(List<Draft> drafts, Map<String, Integer> index, String end, boolean output, String ptr) {
        if (end == null || end.isEmpty()) {
            throw new ChainException("wire end missing: expected \"instance.port\"", ptr);
        }
        int dot = end.indexOf('.');
        String id = dot < 0 ? end : end.substring(0, dot);
        Integer k = index.get(id);
        if (k == null) {
            throw new ChainException("wire end '" + end + "': no instance '" + id + "'; instances: "
                    + String.join(", ", index.keySet().stream().sorted().toList()), ptr);
        }
        Draft n = drafts.get(k);
        List<PortSpec> ports = output ? n.outputs : n.inputs;
        String what = output ? "output" : "input";
        if (dot < 0) {
            if (ports.size() != 1) {
                throw new ChainException("wire end '" + end + "': " + n.label() + " has " + ports.size() + " " + what
                        + "s, name one: " + names(ports), ptr);
            }
            return new PortRef(k, 0);
        }
        String port = end.substring(dot + 1);
        for (int i = 0; i < ports.size(); i++) {
            if (ports.get(i).name().equals(port)) {
                return new PortRef(k, i);
            }
        }
        throw new ChainException("wire end '" + end + "': " + n.label() + " has no " + what + " '" + port + "'; its "
                + what + "s: " + names(ports), ptr);
    }

    private static String names(List<PortSpec> ports) {
        return ports.isEmpty() ? "(none)" : String.join(", ", ports.stream().map(p -> p.name() + " (" + p.kind() + ")").toList());
    }
}
