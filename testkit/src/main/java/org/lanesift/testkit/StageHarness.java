package org.lanesift.testkit;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.Block;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;

/**
 * Runs one plugin alone: every input port becomes an external input the test pushes blocks into,
 * every output is collected. It uses the real chain engine, so ordering and type checks apply.
 *
 * <pre>{@code
 * StageHarness h = StageHarness.of(new MyPlugin(), Map.of("lanes", 2));
 * h.push("clk", clockEdges).push("lane0", d0).push("lane1", d1).finish();
 * List<BitStream> bits = h.outputs("bits0", BitStream.class);
 * }</pre>
 */
public final class StageHarness implements AutoCloseable {
    private final Chain chain;
    private final Map<String, List<Block>> outputs = new LinkedHashMap<>();
    private final List<Annotation> annotations = new ArrayList<>();
    private final List<String> inputs = new ArrayList<>();
    private final List<String> emittedPorts = new ArrayList<>();

    private StageHarness(PluginProvider provider, Map<String, ?> options) {
        PluginRegistry reg = new PluginRegistry().add(provider);
        OptionValues ov = OptionValues.validate(provider.descriptor(), options);
        ChainBuilder b = Chain.builder(reg).add("dut", provider.descriptor().id(), options);
        for (PortSpec p : provider.descriptor().inputs(ov)) {
            b.input("in_" + p.name(), p.kind()).wire("in_" + p.name(), "dut." + p.name());
            inputs.add(p.name());
        }
        for (PortSpec p : provider.descriptor().outputs(ov)) {
            outputs.put(p.name(), new ArrayList<>());
        }
        b.outputs((id, port, block) -> {
            outputs.get(port).add(block);
            emittedPorts.add(port);
        });
        b.annotations((src, a) -> annotations.add(a));
        chain = b.build();
    }

    /**
     * Opens the plugin with options.
     *
     * @param provider the plugin
     * @param options  raw options
     * @return the harness
     */
    public static StageHarness of(PluginProvider provider, Map<String, ?> options) {
        return new StageHarness(provider, options);
    }

    /**
     * Pushes a block into an input port.
     *
     * @param port  input port name
     * @param block the block
     * @return this
     */
    public StageHarness push(String port, Block block) {
        if (!inputs.contains(port)) {
            throw new IllegalArgumentException("plugin has no input '" + port + "'; inputs: " + inputs);
        }
        chain.push("in_" + port, block);
        return this;
    }

    /**
     * Runs a source plugin to the end (for plugins without inputs), then finishes.
     *
     * @return this
     */
    public StageHarness run() {
        chain.run();
        return this;
    }

    /**
     * Flushes the plugin.
     *
     * @return this
     */
    public StageHarness finish() {
        chain.finish();
        return this;
    }

    /**
     * Blocks emitted on an output.
     *
     * @param port output name
     * @return the blocks in emission order
     */
    public List<Block> outputs(String port) {
        List<Block> l = outputs.get(port);
        if (l == null) {
            throw new IllegalArgumentException("plugin has no output '" + port + "'; outputs: " + outputs.keySet());
        }
        return l;
    }

    /**
     * Blocks emitted on an output, cast.
     *
     * @param <T>  block type
     * @param port output name
     * @param type block class
     * @return the blocks
     */
    public <T extends Block> List<T> outputs(String port, Class<T> type) {
        return outputs(port).stream().map(type::cast).toList();
    }

    /**
     * The output port of every block emitted so far, in emission order across all outputs (with
     * {@link #outputs(String)}, which keeps each port's blocks in order, this is the whole schedule).
     *
     * @return port names, one per emitted block
     */
    public List<String> emittedPorts() {
        return emittedPorts;
    }

    /**
     * Every annotation emitted so far.
     *
     * @return annotations in order
     */
    public List<Annotation> annotations() {
        return annotations;
    }

    /**
     * Annotations of one kind.
     *
     * @param kind the kind
     * @return matching annotations
     */
    public List<Annotation> annotations(String kind) {
        return annotations.stream().filter(a -> a.kind().equals(kind)).toList();
    }

    @Override
    public void close() {
        chain.close();
    }
}
