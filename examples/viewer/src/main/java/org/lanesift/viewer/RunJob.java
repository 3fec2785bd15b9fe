package org.lanesift.viewer;

import java.util.List;
import java.util.function.Consumer;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.ChainSpec;
import org.lanesift.chain.ProgressListener;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;

/**
 * Runs a chain for the screen: taps what the viewer shows and gathers it in a {@link Collector}.
 * What is tapped, decided from each node's descriptor and options:
 *
 * <ul>
 *   <li>every analog or logic output of a source node (a node with no inputs): the capture's channels, one row each, named by the port;</li>
 *   <li>every edge-list output of a node fed by analog signals (the receivers): the decoded logic rows, named by the edge list's channel;</li>
 *   <li>every frame output (the frame pane) and artifact output (PNG pictures for the pictures pane);</li>
 *   <li>every annotation.</li>
 * </ul>
 *
 * <p>Threading: {@link #run} runs the whole chain on the calling thread (the viewer's worker);
 * {@link #cancel} may be called from any thread and stops it before the next block.
 */
public final class RunJob {
    private final PluginRegistry registry;
    private final ChainSpec spec;
    private volatile Chain chain;
    private volatile boolean cancelled;

    /**
     * A job.
     *
     * @param registry where plugins are found
     * @param spec     the chain
     */
    public RunJob(PluginRegistry registry, ChainSpec spec) {
        this.registry = registry;
        this.spec = spec;
    }

    /**
     * Builds and runs the chain, then builds the model.
     *
     * @param progress told how far the sources have got (on this thread)
     * @return the model; after a cancel, what was gathered until then
     * @throws InputException when the chain, an option or a capture is bad
     */
    public ViewModel run(ProgressListener progress) {
        Collector into = new Collector();
        gather(into, progress);
        return into.build();
    }

    /**
     * Builds and runs the chain into a collector the caller builds the model from.
     *
     * @param into     where taps and annotations go
     * @param progress told how far the sources have got (on this thread)
     * @throws InputException when the chain, an option or a capture is bad
     */
    public void gather(Collector into, ProgressListener progress) {
        ChainBuilder b = ChainBuilder.fromSpec(spec, registry).annotations(into).progress(progress);
        for (ChainSpec.Node n : spec.nodes()) {
            tapNode(b, n, into);
        }
        Chain c = b.build();
        chain = c;
        try {
            if (!cancelled) {
                c.run();
            }
        } finally {
            c.close();
        }
    }

    /** Stops the run before its next block; safe from any thread. */
    public void cancel() {
        cancelled = true;
        Chain c = chain;
        if (c != null) {
            c.cancel();
        }
    }

    /**
     * Whether {@link #cancel} was called.
     *
     * @return true after a cancel
     */
    public boolean isCancelled() {
        return cancelled;
    }

    private void tapNode(ChainBuilder b, ChainSpec.Node n, Collector into) {
        PluginProvider p = registry.find(n.plugin());
        if (p == null) {
            return; // build() reports the unknown plugin with its pointer
        }
        PluginDescriptor d = p.descriptor();
        List<PortSpec> ins;
        List<PortSpec> outs;
        try {
            OptionValues v = OptionValues.validate(d, n.options());
            ins = d.inputs(v);
            outs = d.outputs(v);
        } catch (InputException e) {
            return; // build() reports it with its pointer
        }
        boolean source = ins.isEmpty();
        boolean fedAnalog = ins.stream().anyMatch(s -> s.kind() == DataKind.ANALOG);
        for (PortSpec o : outs) {
            String at = n.id() + "." + o.name();
            DataKind k = o.kind();
            Consumer<org.lanesift.data.Block> tap = null;
            if (source && (k == DataKind.ANALOG || k == DataKind.LOGIC || k == DataKind.EDGES)) {
                tap = blk -> into.accept(o.name(), blk);
            } else if (fedAnalog && k == DataKind.EDGES) {
                tap = blk -> into.accept(((org.lanesift.data.Edges) blk).channel(), blk);
            } else if (k == DataKind.FRAME || k == DataKind.ARTIFACT) {
                tap = blk -> into.accept(at, blk);
            }
            if (tap != null) {
                b.tap(at, tap);
            }
        }
    }
}
