package org.lanesift.viewer;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.InputFormatException;

/**
 * Ties a chain to the capture the user opened: a capture alone becomes a one-node chain with the
 * reader plugin its extension names; a chosen chain gets the capture as the {@code file} option of
 * its one source node (a node with a {@code file} option and no incoming wire).
 */
public final class Sources {
    private Sources() {
    }

    /**
     * The reader plugin id for a capture file, by extension (docs/capture-*.md).
     *
     * @param capture the file
     * @return {@code csv}, {@code vcd} or {@code raw}
     * @throws InputFormatException for any other extension, naming the known ones
     */
    public static String readerFor(Path capture) {
        String n = String.valueOf(capture.getFileName()).toLowerCase(Locale.ROOT);
        int dot = n.lastIndexOf('.');
        String ext = dot < 0 ? "" : n.substring(dot + 1);
        return switch (ext) {
            case "csv", "tsv", "txt" -> "csv";
            case "vcd" -> "vcd";
            case "bin", "raw", "dat" -> "raw";
            default -> throw new InputFormatException(capture + ": cannot tell the capture format from the extension '"
                    + ext + "'; expected .csv .tsv .txt, .vcd, or .bin .raw .dat (with a FILE.json sidecar)");
        };
    }

    /**
     * A chain that only reads a capture, so its channels can be looked at before any decoding.
     *
     * @param capture the file
     * @return a one-node chain with instance id {@code cap}
     */
    public static ChainSpec captureOnly(Path capture) {
        return new ChainSpec(List.of(new ChainSpec.Node("cap", readerFor(capture),
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
                String reader = readerFor(capture);
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
