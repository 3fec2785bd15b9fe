package org.lanesift.chain;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * A built, type-checked graph of open stages, and the reference engine that moves blocks through
 * it.
 *
 * <p><b>Engine.</b> Delivery is synchronous push: when a stage emits, every downstream stage
 * receives the block before {@code emit} returns, depth first. No block is queued inside the
 * engine, so buffering is bounded by what stages themselves keep, and nothing is ever dropped.
 * Blocks reach an input in non-decreasing start time (checked; a violation stops the chain with a
 * named error), and sample-based inputs (analog, logic) of one stage must share one sample period.
 * The chain runs either from its source stages ({@link #run()}) or from blocks a host pushes into
 * external inputs ({@link #push}); both end with {@link #finish()}, which flushes stages in
 * upstream-to-downstream order. Not thread-safe, except {@link #cancel()}.
 */
public final class Chain implements AutoCloseable {
    private final List<Node> order;
    private final Map<String, Node> byId;
    private final AnnotationSink annotations;
    private final ProgressListener progress;
    private volatile boolean cancelled;
    private boolean finished;
    private boolean closed;
    private final Map<Node, long[]> sourceProgress = new HashMap<>();

    private static final class Target {
        final Node node;
        final int input;
        final String wireName;

        Target(Node node, int input, String wireName) {
            this.node = node;
            this.input = input;
            this.wireName = wireName;
        }
    }

    private final class Node implements StageContext {
        final String id;
        final PluginDescriptor descriptor;
        final PluginProvider provider;
        final OptionValues options;
        final List<PortSpec> inputs;
        final List<PortSpec> outputs;
        final DataKind externalKind;
        final List<List<Target>> targets = new ArrayList<>();
        final List<List<Consumer<Block>>> taps = new ArrayList<>();
        final boolean[] wiredInputs;
        final long[] lastStart;
        double samplePeriodFs = Double.NaN;
        int samplePeriodInput = -1;
        Stage stage;
        BlockSink hostSink;

        Node(String id, PluginDescriptor d, PluginProvider p, OptionValues o, List<PortSpec> in, List<PortSpec> out, DataKind ext) {
            this.id = id;
            this.descriptor = d;
            this.provider = p;
            this.options = o;
            this.inputs = in;
            this.outputs = out;
            this.externalKind = ext;
            for (int i = 0; i < out.size(); i++) {
                targets.add(new ArrayList<>());
                taps.add(new ArrayList<>());
            }
            wiredInputs = new boolean[in.size()];
            lastStart = new long[in.size()];
            java.util.Arrays.fill(lastStart, Long.MIN_VALUE);
        }

        String label() {
            return descriptor == null ? "input '" + id + "'" : "instance '" + id + "' (" + descriptor.id() + ")";
        }

        @Override
        public String instanceId() {
            return id;
        }

        @Override
        public OptionValues options() {
            return options;
        }

        @Override
        public List<PortSpec> inputs() {
            return inputs;
        }

        @Override
        public List<PortSpec> outputs() {
            return outputs;
        }

        @Override
        public boolean isConnected(int output) {
            return !targets.get(output).isEmpty() || !taps.get(output).isEmpty() || hostSink != null;
        }

        @Override
        public void emit(int output, Block block) {
            if (output < 0 || output >= outputs.size()) {
                throw new ChainException(label() + " emitted on output " + output + " but has " + outputs.size() + " outputs", null);
            }
            PortSpec port = outputs.get(output);
            if (block == null || !port.kind().accepts(block.kind())) {
                throw new ChainException(label() + " emitted " + (block == null ? "null" : block.kind()) + " on output '"
                        + port.name() + "', which carries " + port.kind(), null);
            }
            for (Consumer<Block> t : taps.get(output)) {
                t.accept(block);
            }
            List<Target> ts = targets.get(output);
            if (ts.isEmpty()) {
                if (hostSink != null) {
                    hostSink.accept(id, port.name(), block);
                }
                return;
            }
            for (int i = 0, n = ts.size(); i < n; i++) {
                deliver(ts.get(i), block);
            }
        }

        @Override
        public void annotate(Annotation a) {
            annotations.accept(id, a);
        }

        @Override
        public void progress(long done, long total) {
            sourceProgress.put(this, new long[] {done, total});
            long d = 0;
            long t = 0;
            for (long[] v : sourceProgress.values()) {
                d += v[0];
                t = (t < 0 || v[1] < 0) ? -1 : t + v[1];
            }
            Chain.this.progress.progress(d, t);
        }

        @Override
        public boolean isCancelled() {
            return cancelled;
        }
    }

    private Chain(List<Node> order, Map<String, Node> byId, AnnotationSink a, ProgressListener p) {
        this.order = order;
        this.byId = byId;
        this.annotations = a;
        this.progress = p;
    }

    /**
     * Starts a fluent chain description.
     *
     * @param registry where plugin ids are looked up
     * @return a builder
     */
    public static ChainBuilder builder(PluginRegistry registry) {
        return new ChainBuilder(registry);
    }

    static Chain open(ChainBuilder b) {
        Chain chain = new Chain(new ArrayList<>(), new HashMap<>(), b.annotations, b.progress);
        Map<String, Node> real = new HashMap<>();
        for (ChainBuilder.NodeDef d : b.nodes.values()) {
            String ptr = d.pointer();
            Node node;
            if (d.externalKind() != null) {
                List<PortSpec> outs = List.of(PortSpec.of("out", d.externalKind(), "blocks pushed by the host"));
                node = chain.new Node(d.id(), null, null, null, List.of(), outs, d.externalKind());
            } else {
                PluginProvider p = b.registry.find(d.plugin());
                if (p == null) {
                    throw new ChainException("instance '" + d.id() + "': unknown plugin '" + d.plugin() + "'; known plugins: "
                            + String.join(", ", b.registry.all().stream().map(x -> x.descriptor().id()).toList()),
                            ptr == null ? null : ptr + "/plugin");
                }
                PluginDescriptor desc = p.descriptor();
                OptionValues ov;
                try {
                    ov = OptionValues.validate(desc, d.options());
                } catch (OptionException e) {
                    throw new ChainException("instance '" + d.id() + "': " + e.getMessage(),
                            ptr == null ? null : ptr + "/options/" + e.option(), e);
                }
                List<PortSpec> in;
                List<PortSpec> out;
                try {
                    in = desc.inputs(ov);
                    out = desc.outputs(ov);
                } catch (OptionException e) {
                    throw new ChainException("instance '" + d.id() + "': " + e.getMessage(),
                            ptr == null ? null : ptr + "/options/" + e.option(), e);
                }
                node = chain.new Node(d.id(), desc, p, ov, in, out, null);
            }
            real.put(d.id(), node);
        }
        // wires
        for (ChainBuilder.WireDef w : b.wires) {
            String ptr = w.pointer();
            Object[] from = resolve(real, w.from(), true, ptr == null ? null : ptr + "/from");
            Object[] to = resolve(real, w.to(), false, ptr == null ? null : ptr + "/to");
            Node fn = (Node) from[0];
            int fi = (Integer) from[1];
            Node tn = (Node) to[0];
            int ti = (Integer) to[1];
            PortSpec fp = fn.outputs.get(fi);
            PortSpec tp = tn.inputs.get(ti);
            String name = fn.id + "." + fp.name() + " -> " + tn.id + "." + tp.name();
            if (!tp.kind().accepts(fp.kind())) {
                throw new ChainException("wire " + name + ": output " + fn.id + "." + fp.name() + " carries " + fp.kind()
                        + " but input " + tn.id + "." + tp.name() + " expects " + tp.kind(), ptr);
            }
            if (tn.wiredInputs[ti]) {
                throw new ChainException("wire " + name + ": input " + tn.id + "." + tp.name() + " is already wired", ptr);
            }
            tn.wiredInputs[ti] = true;
            fn.targets.get(fi).add(new Target(tn, ti, name));
        }
        for (ChainBuilder.TapDef t : b.taps) {
            Object[] at = resolve(real, t.at(), true, null);
            ((Node) at[0]).taps.get((Integer) at[1]).add(t.consumer());
        }
        for (Node n : real.values()) {
            n.hostSink = b.outputs;
            for (int i = 0; i < n.inputs.size(); i++) {
                if (n.inputs.get(i).required() && !n.wiredInputs[i]) {
                    throw new ChainException(n.label() + ": required input '" + n.inputs.get(i).name() + "' is not wired",
                            b.nodes.get(n.id).pointer());
                }
            }
        }
        // topological order (Kahn), in declaration order where free
        Map<Node, Integer> indeg = new HashMap<>();
        for (Node n : real.values()) {
            indeg.putIfAbsent(n, 0);
            for (List<Target> ts : n.targets) {
                for (Target t : ts) {
                    indeg.merge(t.node, 1, Integer::sum);
                }
            }
        }
        Deque<Node> ready = new ArrayDeque<>();
        for (String id : b.nodes.keySet()) {
            Node n = real.get(id);
            if (indeg.get(n) == 0) {
                ready.add(n);
            }
        }
        List<Node> order = chain.order;
        while (!ready.isEmpty()) {
            Node n = ready.poll();
            order.add(n);
            for (List<Target> ts : n.targets) {
                for (Target t : ts) {
                    if (indeg.merge(t.node, -1, Integer::sum) == 0) {
                        ready.add(t.node);
                    }
                }
            }
        }
        if (order.size() != real.size()) {
            List<String> cyc = real.values().stream().filter(n -> !order.contains(n)).map(n -> n.id).sorted().toList();
            throw new ChainException("the wires form a cycle through " + String.join(", ", cyc), null);
        }
        chain.byId.putAll(real);
        // open stages, upstream first; close what was opened if one fails
        for (Node n : order) {
            if (n.provider == null) {
                continue;
            }
            try {
                n.stage = n.provider.open(n);
                if (n.stage == null) {
                    throw new IllegalStateException("provider returned no stage");
                }
            } catch (OptionException e) {
                chain.close();
                String ptr = b.nodes.get(n.id).pointer();
                throw new ChainException(n.label() + ": " + e.getMessage(), ptr == null ? null : ptr + "/options/" + e.option(), e);
            } catch (ChainException e) {
                chain.close();
                throw e;
            } catch (Exception e) {
                chain.close();
                throw new StageFailure(n.id, n.label() + " could not start: " + e.getMessage(), e);
            }
        }
        return chain;
    }

    private static Object[] resolve(Map<String, Node> nodes, String end, boolean output, String ptr) {
        if (end == null || end.isEmpty()) {
            throw new ChainException("wire end missing: expected \"instance.port\"", ptr);
        }
        int dot = end.indexOf('.');
        String id = dot < 0 ? end : end.substring(0, dot);
        Node n = nodes.get(id);
        if (n == null) {
            throw new ChainException("wire end '" + end + "': no instance '" + id + "'; instances: "
                    + String.join(", ", nodes.keySet().stream().sorted().toList()), ptr);
        }
        List<PortSpec> ports = output ? n.outputs : n.inputs;
        String what = output ? "output" : "input";
        if (dot < 0) {
            if (ports.size() != 1) {
                throw new ChainException("wire end '" + end + "': " + n.label() + " has " + ports.size() + " " + what
                        + "s, name one: " + names(ports), ptr);
            }
            return new Object[] {n, 0};
        }
        String port = end.substring(dot + 1);
        for (int i = 0; i < ports.size(); i++) {
            if (ports.get(i).name().equals(port)) {
                return new Object[] {n, i};
            }
        }
        throw new ChainException("wire end '" + end + "': " + n.label() + " has no " + what + " '" + port + "'; its "
                + what + "s: " + names(ports), ptr);
    }

    private static String names(List<PortSpec> ports) {
        return ports.isEmpty() ? "(none)" : String.join(", ", ports.stream().map(p -> p.name() + " (" + p.kind() + ")").toList());
    }

    private void deliver(Target t, Block block) {
        Node n = t.node;
        if (block.startFs() < n.lastStart[t.input]) {
            throw new ChainException("wire " + t.wireName + ": block starting at " + block.startFs()
                    + " fs arrived after one starting at " + n.lastStart[t.input] + " fs (blocks must arrive in time order)", null);
        }
        n.lastStart[t.input] = block.startFs();
        double period = block instanceof AnalogBlock a ? a.periodFs() : block instanceof LogicBlock l ? l.periodFs() : Double.NaN;
        if (!Double.isNaN(period)) {
            if (Double.isNaN(n.samplePeriodFs)) {
                n.samplePeriodFs = period;
                n.samplePeriodInput = t.input;
            } else if (Math.abs(period - n.samplePeriodFs) > 1e-9 * n.samplePeriodFs) {
                throw new ChainException(n.label() + ": input '" + n.inputs.get(t.input).name() + "' has sample period "
                        + period + " fs but input '" + n.inputs.get(n.samplePeriodInput).name() + "' has " + n.samplePeriodFs
                        + " fs; inputs of one stage must share a sample rate", null);
            }
        }
        if (cancelled) {
            return;
        }
        try {
            n.stage.accept(t.input, block);
        } catch (ChainException e) {
            throw e;
        } catch (Exception | Error e) {
            if (e instanceof VirtualMachineError vme && !(e instanceof OutOfMemoryError)) {
                throw vme;
            }
            throw new StageFailure(n.id, n.label() + " failed on input '" + n.inputs.get(t.input).name() + "' ("
                    + block + "): " + e, e);
        }
    }

    /**
     * Feeds a block into an external input declared with {@link ChainBuilder#input}.
     *
     * @param input the input's id
     * @param block the block, of the declared kind
     * @throws ChainException if there is no such input, the kind is wrong, or a stage failed
     */
    public void push(String input, Block block) {
        Node n = byId.get(input);
        if (n == null || n.externalKind == null) {
            throw new ChainException("no external input '" + input + "' in this chain", null);
        }
        ensureOpen();
        n.emit(0, block);
    }

    /**
     * Runs every source stage until all are exhausted or the chain is cancelled, then finishes.
     * Sources take turns, one {@code produce()} call each.
     *
     * @throws ChainException when building blocks fails or a stage throws
     */
    public void run() {
        ensureOpen();
        List<Node> sources = new ArrayList<>();
        for (Node n : order) {
            if (n.provider != null && n.inputs.isEmpty()) {
                sources.add(n);
            }
        }
        boolean[] active = new boolean[sources.size()];
        java.util.Arrays.fill(active, true);
        int live = sources.size();
        while (live > 0 && !cancelled) {
            for (int i = 0; i < sources.size(); i++) {
                if (!active[i] || cancelled) {
                    continue;
                }
                Node s = sources.get(i);
                boolean more;
                try {
                    more = s.stage.produce();
                } catch (ChainException e) {
                    throw e;
                } catch (Exception e) {
                    throw new StageFailure(s.id, s.label() + " failed while producing: " + e.getMessage(), e);
                }
                if (!more) {
                    active[i] = false;
                    live--;
                }
            }
        }
        finish();
    }

    /**
     * Flushes every stage, upstream first. Called once; later calls do nothing.
     *
     * @throws ChainException if a stage fails while flushing
     */
    public void finish() {
        if (finished) {
            return;
        }
        ensureOpen();
        finished = true;
        for (Node n : order) {
            if (n.stage == null) {
                continue;
            }
            try {
                n.stage.finish();
            } catch (ChainException e) {
                throw e;
            } catch (Exception e) {
                throw new StageFailure(n.id, n.label() + " failed while finishing: " + e, e);
            }
        }
    }

    /** Asks the chain to stop; safe from any thread. Sources stop producing and no further block is delivered. */
    public void cancel() {
        cancelled = true;
    }

    /**
     * Whether {@link #cancel()} was called.
     *
     * @return true if cancelled
     */
    public boolean isCancelled() {
        return cancelled;
    }

    /**
     * Ids of the instances in the order they are flushed (upstream first).
     *
     * @return instance ids
     */
    public List<String> instanceIds() {
        return order.stream().map(n -> n.id).toList();
    }

    private void ensureOpen() {
        if (closed) {
            throw new ChainException("the chain is closed", null);
        }
    }

    /** Closes every stage; stages' close failures are ignored so that all get closed. */
    @Override
    public void close() {
        if (closed) {
            return;
        }
        closed = true;
        if (order == null) {
            return;
        }
        for (Node n : order) {
            if (n.stage != null) {
                try {
                    n.stage.close();
                } catch (RuntimeException ignored) {
                    // keep closing the others
                }
            }
        }
    }
}
