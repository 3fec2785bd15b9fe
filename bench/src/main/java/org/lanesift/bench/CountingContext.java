package org.lanesift.bench;

import java.util.List;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.StageContext;

/**
 * The one stage context of the benchmarks that drive a stage directly, without the chain engine:
 * every output counts as connected, and what the stage emits is only counted (blocks, edge
 * transitions, logic samples, annotations), so a benchmark can consume the counts and measure the
 * stage alone. Counting allocates nothing.
 */
final class CountingContext implements StageContext {
    private final String instanceId;
    private final OptionValues options;
    private final List<PortSpec> in;
    private final List<PortSpec> out;
    /** Blocks emitted on any output. */
    long blocks;
    /** Transitions in emitted edge lists. */
    long transitions;
    /** Samples in emitted logic blocks. */
    long logicSamples;
    /** Annotations made. */
    long annotations;

    /**
     * Creates a context for one instance of a plugin.
     *
     * @param instanceId the instance id the stage sees
     * @param plugin     the plugin, for its ports
     * @param rawOptions option values as a chain file would give them
     */
    CountingContext(String instanceId, PluginProvider plugin, Map<String, ?> rawOptions) {
        this.instanceId = instanceId;
        this.options = OptionValues.validate(plugin.descriptor(), rawOptions);
        this.in = List.copyOf(plugin.descriptor().inputs(options));
        this.out = List.copyOf(plugin.descriptor().outputs(options));
    }

    @Override
    public String instanceId() {
        return instanceId;
    }

    @Override
    public OptionValues options() {
        return options;
    }

    @Override
    public List<PortSpec> inputs() {
        return in;
    }

    @Override
    public List<PortSpec> outputs() {
        return out;
    }

    @Override
    public boolean isConnected(int output) {
        return true;
    }

    @Override
    public void emit(int output, Block block) {
        blocks++;
        if (block instanceof Edges e) {
            transitions += e.count();
        } else if (block instanceof LogicBlock l) {
            logicSamples += l.length();
        }
    }

    @Override
    public void annotate(Annotation a) {
        annotations++;
    }

    @Override
    public void progress(long done, long total) {
        // benchmarks report no progress
    }

    @Override
    public boolean isCancelled() {
        return false;
    }
}
