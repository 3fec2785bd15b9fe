package org.lanesift.chain;

import java.util.List;
import java.util.Map;

/**
 * The plain data model of a chain: instances of plugins with their raw options, and wires from an
 * output to an input, each end written {@code "instance.port"} (a bare {@code "instance"} means its
 * only output or input). The command line reads it from a JSON chain file (see
 * {@code docs/chain-file.md}); {@link ChainBuilder#fromSpec} builds it.
 *
 * @param nodes plugin instances
 * @param wires connections
 */
public record ChainSpec(List<Node> nodes, List<Wire> wires) {

    /**
     * Copies the lists.
     *
     * @param nodes plugin instances
     * @param wires connections
     */
    public ChainSpec {
        nodes = nodes == null ? List.of() : List.copyOf(nodes);
        wires = wires == null ? List.of() : List.copyOf(wires);
    }

    /**
     * One plugin instance.
     *
     * @param id      instance id, unique in the chain
     * @param plugin  plugin id
     * @param options raw option values (strings, numbers, booleans, lists)
     */
    public record Node(String id, String plugin, Map<String, Object> options) {
        /**
         * Copies the options.
         *
         * @param id instance id, unique in the chain
         * @param plugin plugin id
         * @param options raw option values (strings, numbers, booleans, lists)
         */
        public Node {
            options = options == null ? Map.of() : Map.copyOf(options);
        }
    }

    /**
     * One wire.
     *
     * @param from {@code "instance.output"}
     * @param to   {@code "instance.input"}
     */
    public record Wire(String from, String to) {
    }
}
