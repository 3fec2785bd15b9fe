package org.lanesift.chain;

import java.util.ArrayList;
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
import org.lanesift.plugin.OptionValues;
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
    private final BlockSink hostSink;
    private volatile boolean cancelled;
    private boolean finished;
    private boolean closed;
    private final Map<Node, long[]> sourceProgress = new HashMap<>();
    private CalibrationPasses calibration;
    private ProgressListener wholeRunProgress;
    private volatile Chain calibratingPass;

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

    /** The running form of one {@link ChainPlan.Step}: its stage, its context, and what reaches its inputs. */
    final class Node implements StageContext {
        final String id;
        final ChainPlan.Step step;
        final List<PortSpec> inputs;
        final List<PortSpec> outputs;
        final DataKind externalKind;
        final List<List<Target>> targets = new ArrayList<>();
        final List<List<Consumer<Block>>> taps;
        final long[] lastStart;
        /** Per output: 0 not asked yet, 1 the host sink wants it, -1 it does not. */
        final byte[] hostWants;
        double samplePeriodFs = Double.NaN;
        int samplePeriodInput = -1;
        Stage stage;

        Node(ChainPlan.Step step) {
            this.id = step.id();
            this.step = step;
            this.inputs = step.inputs();
            this.outputs = step.outputs();
            this.externalKind = step.externalKind();
            this.taps = step.taps();
            lastStart = new long[inputs.size()];
            java.util.Arrays.fill(lastStart, Long.MIN_VALUE);
            hostWants = new byte[outputs.size()];
        }

        private boolean hostWants(int output) {
            if (hostSink == null) {
                return false;
            }
            if (hostWants[output] == 0) {
                hostWants[output] = hostSink.wants(id, outputs.get(output).name()) ? (byte) 1 : (byte) -1;
            }
            return hostWants[output] > 0;
        }

        String label() {
            return step.label();
        }

        @Override
        public String instanceId() {
            return id;
        }

        @Override
        public OptionValues options() {
            return step.options();
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
            return !targets.get(output).isEmpty() || !taps.get(output).isEmpty() || hostWants(output);
        }

        @Override
        public boolean mayLend(int output) {
            if (output < 0 || output >= outputs.size() || !taps.get(output).isEmpty()) {
                return false;
            }
            List<Target> ts = targets.get(output);
            if (ts.isEmpty()) {
                return false;
            }
            for (Target t : ts) {
                if (t.node.step.descriptor() == null || !t.node.step.descriptor().readsLentBlocks()) {
                    return false;
                }
            }
            return true;
        }

        @Override
        public boolean wantsBitMargins(int output) {
            if (output < 0 || output >= outputs.size()) {
                return true;
            }
            if (!taps.get(output).isEmpty()) {
                return true; // a host's observer: it declares nothing, so it gets everything
            }
            List<Target> ts = targets.get(output);
            if (ts.isEmpty()) {
                return hostWants(output) && hostSink.readsBitMargins(id, outputs.get(output).name());
            }
            for (Target t : ts) {
                if (t.node.inputs.get(t.input).readsBitMargins()) {
                    return true;
                }
            }
            return false;
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
                if (hostWants(output)) {
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

    /**
     * Creates the running nodes of a plan, every wire connected, no stage open yet
     * ({@link ChainOpener} opens them).
     */
    Chain(ChainPlan plan, AnnotationSink annotations, ProgressListener progress, BlockSink outputs) {
        this.annotations = annotations;
        this.progress = progress;
        this.hostSink = outputs;
        List<Node> nodes = new ArrayList<>();
        Map<String, Node> ids = new HashMap<>();
        for (ChainPlan.Step st : plan.steps()) {
            Node n = new Node(st);
            nodes.add(n);
            ids.put(n.id, n);
        }
        for (Node n : nodes) {
            for (List<ChainPlan.Edge> es : n.step.targets()) {
                List<Target> ts = new ArrayList<>(es.size());
                for (ChainPlan.Edge e : es) {
                    ts.add(new Target(nodes.get(e.to()), e.input(), e.wireName()));
                }
                n.targets.add(ts);
            }
        }
        this.order = List.copyOf(nodes);
        this.byId = ids;
    }

    /**
     * Makes {@link #run()} run the calibration passes first (this chain is their final pass).
     *
     * @param passes        the passes of the plan this chain's plan was cut from
     * @param wholeProgress the host's progress listener (this chain reports the final pass through it)
     */
    void calibrateFirst(CalibrationPasses passes, ProgressListener wholeProgress) {
        this.calibration = passes;
        this.wholeRunProgress = wholeProgress;
    }

    /** The calibration pass now running, so that {@link #cancel()} reaches it; null between passes. */
    void calibrating(Chain pass) {
        calibratingPass = pass;
        if (pass != null && cancelled) {
            pass.cancel();
        }
    }

    /**
     * Delivers a calibration result to an input before any data block.
     *
     * @param node  index of the receiving node in {@link #nodes()}
     * @param input its calibration input
     * @param block the result
     */
    void deliverCalibration(int node, int input, Block block) {
        Node n = order.get(node);
        deliver(new Target(n, input, "calibration of " + n.id + "." + n.inputs.get(input).name()), block);
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

    /**
     * The running nodes, upstream first.
     *
     * @return the nodes in topological order
     */
    List<Node> nodes() {
        return order;
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
     * Sources take turns, one {@code produce()} call each. A chain with calibration wires first
     * runs its calibration passes, each over the sources from their start (see
     * {@code docs/chain-file.md}, "Calibration wires").
     *
     * @throws ChainException when building blocks fails or a stage throws
     */
    public void run() {
        ensureOpen();
        if (calibration != null) {
            CalibrationPasses c = calibration;
            calibration = null;
            c.run(this, annotations, wholeRunProgress, hostSink);
        }
        List<Node> sources = new ArrayList<>();
        for (Node n : order) {
            if (n.step.provider() != null && n.inputs.isEmpty()) {
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
        Chain pass = calibratingPass;
        if (pass != null) {
            pass.cancel();
        }
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
