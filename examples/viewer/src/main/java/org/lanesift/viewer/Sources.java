package org.lanesift.viewer;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.capture.Captures;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.InputFormatException;

/**
 * Ties a chain to the capture the user opened: a capture alone becomes a one-node chain with the
 * reader plugin that {@link Captures#pluginFor} chooses (by extension, then content); a chosen
 * chain gets the capture as the {@code file} option of its one source node (a node with a
 * {@code file} option and no incoming wire).
 */
public final class Sources {
    private Sources() {
    }

    /**
     * A chain that only reads a capture, so its channels can be looked at before any decoding.
     *
     * @param capture the file
     * @return a one-node chain with instance id {@code cap}
     * @throws InputFormatException when the file is missing or its kind cannot be told
     */
    public static ChainSpec captureOnly(Path capture) {
        return new ChainSpec(List.of(new ChainSpec.Node("cap", Captures.pluginFor(capture),
                Map.of("file", capture.toAbsolutePath().toString()))), List.of());
    }

    /**
     * The chain with its source reading another capture.
     *
     * @param spec    the chain
     * @param capture the capture the user opened
     * @return a copy with the source node's {@code file} replaced
     * @throws InputFormatException when the chain has no source node with a file, or more than one
     */
    public static ChainSpec withCapture(ChainSpec spec, Path capture) {
        List<String> fed = new ArrayList<>();
        for (ChainSpec.Wire w : spec.wires()) {
            String to = w.to();
            fed.add(to.contains(".") ? to.substring(0, to.indexOf('.')) : to);
        }
        List<ChainSpec.Node> sources = spec.nodes().stream()
                .filter(n -> n.options().containsKey("file") && !fed.contains(n.id())).toList();
        if (sources.size() != 1) {
            throw new InputFormatException("the chain has " + sources.size() + " source nodes with a 'file' option"
                    + " (expected exactly one to read the opened capture " + capture + ")");
        }
        String id = sources.get(0).id();
        List<ChainSpec.Node> nodes = new ArrayList<>();
        for (ChainSpec.Node n : spec.nodes()) {
            if (n.id().equals(id)) {
                String reader = Captures.pluginFor(capture);
                // another reader's options (such as a CSV separator) mean nothing to this one
                Map<String, Object> o = reader.equals(n.plugin()) ? new LinkedHashMap<>(n.options()) : new LinkedHashMap<>();
                o.put("file", capture.toAbsolutePath().toString());
                nodes.add(new ChainSpec.Node(n.id(), reader, o));
            } else {
                nodes.add(n);
            }
        }
        return new ChainSpec(nodes, spec.wires());
    }
}
