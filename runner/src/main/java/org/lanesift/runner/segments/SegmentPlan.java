package org.lanesift.runner.segments;

import java.io.IOException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.lanesift.chain.ChainSpec;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.runner.capture.RawSource;

/**
 * How a chain splits for decoding in segments. The <em>front</em> is the raw capture source and
 * every instance downstream of it that declares segment support ({@link SegmentSupport}) and takes
 * all its inputs from the front; it runs once per segment, on several threads. The <em>back</em>
 * is everything else; it runs once, on the stitched streams, so its counters, frame numbers and
 * decoder state are those of one pass. Only edge lists (and unwired logic outputs, which go
 * straight to the outputs) cross from front to back.
 */
public final class SegmentPlan {
    /** A front output: where it goes. */
    record Port(String node, String port, DataKind kind, List<String> backTargets) {
        String key() {
            return node + "." + port;
        }

        /** Id of the back chain's external input fed by this port. */
        String inputId() {
            return "seg_" + node + "_" + port;
        }
    }

    final String sourceId;
    final ChainSpec.Node source;
    final ChainSpec front;
    final ChainSpec back;
    final List<Port> ports;
    final RawSource.Layout layout;
    final long warmupFs;

    private SegmentPlan(ChainSpec.Node source, ChainSpec front, ChainSpec back, List<Port> ports, RawSource.Layout layout,
                        long warmupFs) {
        this.sourceId = source.id();
        this.source = source;
        this.front = front;
        this.back = back;
        this.ports = ports;
        this.layout = layout;
        this.warmupFs = warmupFs;
    }

    /**
     * Splits a chain, or says why it cannot be decoded in segments.
     *
     * @param spec     the chain, options resolved
     * @param registry plugins
     * @return the plan
     * @throws SegmentException naming the instance, wire or option that prevents segments
     */
    public static SegmentPlan of(ChainSpec spec, PluginRegistry registry) {
        Map<String, ChainSpec.Node> nodes = new LinkedHashMap<>();
        Map<String, PluginDescriptor> desc = new HashMap<>();
        Map<String, OptionValues> opts = new HashMap<>();
        ChainSpec.Node source = null;
        for (ChainSpec.Node n : spec.nodes()) {
            nodes.put(n.id(), n);
            PluginProvider p = registry.find(n.plugin());
            if (p == null) {
                throw new SegmentException("instance '" + n.id() + "': unknown plugin '" + n.plugin() + "'");
            }
            desc.put(n.id(), p.descriptor());
            OptionValues ov = OptionValues.validate(p.descriptor(), n.options());
            opts.put(n.id(), ov);
            if (p.descriptor().inputs(ov).isEmpty()) {
                if (source != null) {
                    throw new SegmentException("decoding in segments needs exactly one capture source; instances '" + source.id()
                            + "' and '" + n.id() + "' both read captures");
                }
                source = n;
            }
        }
        if (source == null) {
            throw new SegmentException("the chain has no capture source");
        }
        for (ChainSpec.Node n : spec.nodes()) {
            for (org.lanesift.plugin.PortSpec in : desc.get(n.id()).inputs(opts.get(n.id()))) {
                if (in.calibration()) {
                    throw new SegmentException("instance '" + n.id() + "' has calibration input '" + in.name() + "': a calibration"
                            + " covers the whole capture (docs/chain-file.md, calibration wires); run this chain without --jobs");
                }
            }
        }
        if (!source.plugin().equals("raw")) {
            throw new SegmentException("decoding in segments needs a raw binary capture (plugin 'raw'), which can be read from"
                    + " any frame; instance '" + source.id() + "' is '" + source.plugin() + "'");
        }
        // wires with both ends resolved to node.port
        List<String[]> wires = new ArrayList<>();
        for (ChainSpec.Wire w : spec.wires()) {
            wires.add(new String[] {port(w.from(), nodes, desc, opts, true), port(w.to(), nodes, desc, opts, false)});
        }
        Set<String> front = new LinkedHashSet<>();
        front.add(source.id());
        Map<String, String> blockers = new LinkedHashMap<>();
        long warm = 0;
        RawSource.Layout layout;
        try {
            layout = RawSource.layout(opts.get(source.id()));
        } catch (IOException | RuntimeException e) {
            throw new SegmentException("instance '" + source.id() + "': " + e.getMessage());
        }
        double period = layout.periodFs();
        boolean grew = true;
        while (grew) {
            grew = false;
            for (ChainSpec.Node n : spec.nodes()) {
                if (front.contains(n.id())) {
                    continue;
                }
                boolean fed = false;
                boolean allFront = true;
                for (String[] w : wires) {
                    if (node(w[1]).equals(n.id())) {
                        fed = true;
                        allFront &= front.contains(node(w[0]));
                    }
                }
                if (!fed || !allFront) {
                    continue;
                }
                SegmentSupport s = desc.get(n.id()).segmentSupport(opts.get(n.id()));
                if (!s.supported()) {
                    blockers.put(n.id(), s.blocker());
                    continue;
                }
                front.add(n.id());
                // every instance's warm-up counts, as if they were all in one line: an upper bound
                warm += s.warmupFs(period);
                grew = true;
            }
        }
        List<Port> ports = new ArrayList<>();
        List<ChainSpec.Wire> frontWires = new ArrayList<>();
        List<ChainSpec.Wire> backWires = new ArrayList<>();
        Map<String, List<String>> targets = new LinkedHashMap<>();
        for (String[] w : wires) {
            boolean a = front.contains(node(w[0]));
            boolean b = front.contains(node(w[1]));
            if (a && b) {
                frontWires.add(new ChainSpec.Wire(w[0], w[1]));
            } else if (!a && !b) {
                backWires.add(new ChainSpec.Wire(w[0], w[1]));
            } else {
                targets.computeIfAbsent(w[0], k -> new ArrayList<>()).add(w[1]);
            }
        }
        Set<String> wiredOutputs = new java.util.HashSet<>();
        for (String[] w : wires) {
            wiredOutputs.add(w[0]);
        }
        for (String id : front) {
            PluginDescriptor d = desc.get(id);
            for (PortSpec ps : d.outputs(opts.get(id))) {
                String key = id + "." + ps.name();
                List<String> to = targets.get(key);
                if (to != null) {
                    if (ps.kind() != DataKind.EDGES) {
                        String target = node(to.get(0));
                        String why = blockers.get(target);
                        throw new SegmentException("instance '" + target + "' (" + nodes.get(target).plugin() + ") takes "
                                + ps.kind().name().toLowerCase(java.util.Locale.ROOT) + " data from '" + key + "'"
                                + (why != null ? " and cannot decode in segments: " + why
                                : ", and only edge lists can pass between segments"));
                    }
                    ports.add(new Port(id, ps.name(), ps.kind(), List.copyOf(to)));
                } else if (!wiredOutputs.contains(key)) {
                    if (ps.kind() == DataKind.ANALOG) {
                        throw new SegmentException("output '" + key + "' is not wired, so it would be written as analog samples,"
                                + " which are not stitched between segments; wire it or decode without --jobs");
                    }
                    if (ps.kind() == DataKind.EDGES || ps.kind() == DataKind.LOGIC || ps.kind() == DataKind.ARTIFACT) {
                        ports.add(new Port(id, ps.name(), ps.kind(), List.of()));
                    } else {
                        throw new SegmentException("output '" + key + "' carries " + ps.kind() + ", which is not stitched between"
                                + " segments; decode without --jobs");
                    }
                }
            }
        }
        List<ChainSpec.Node> fn = new ArrayList<>();
        List<ChainSpec.Node> bn = new ArrayList<>();
        for (ChainSpec.Node n : spec.nodes()) {
            (front.contains(n.id()) ? fn : bn).add(n);
        }
        return new SegmentPlan(source, new ChainSpec(fn, frontWires), new ChainSpec(bn, backWires), ports, layout, warm);
    }

    private static String node(String portKey) {
        return portKey.substring(0, portKey.indexOf('.'));
    }

    /** "node.port", resolving a bare "node" to its only output or input. */
    private static String port(String ref, Map<String, ChainSpec.Node> nodes, Map<String, PluginDescriptor> desc,
                               Map<String, OptionValues> opts, boolean output) {
        int dot = ref.indexOf('.');
        String id = dot < 0 ? ref : ref.substring(0, dot);
        if (!nodes.containsKey(id)) {
            throw new SegmentException("wire end '" + ref + "': no instance '" + id + "'");
        }
        if (dot >= 0) {
            return ref;
        }
        List<PortSpec> ps = output ? desc.get(id).outputs(opts.get(id)) : desc.get(id).inputs(opts.get(id));
        if (ps.size() != 1) {
            throw new SegmentException("wire end '" + ref + "': instance '" + id + "' has " + ps.size() + " "
                    + (output ? "outputs" : "inputs") + "; name one");
        }
        return id + "." + ps.get(0).name();
    }

    /**
     * The instances that run once per segment.
     *
     * @return instance ids in chain order
     */
    public List<String> frontIds() {
        return front.nodes().stream().map(ChainSpec.Node::id).toList();
    }

    /**
     * The warm-up each segment is read with before its start, summed over the front.
     *
     * @return femtoseconds
     */
    public long warmupFs() {
        return warmupFs;
    }
}
