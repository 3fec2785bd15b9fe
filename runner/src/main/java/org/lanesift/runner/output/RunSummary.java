package org.lanesift.runner.output;

import java.time.Instant;
import java.util.List;
import java.util.Map;

/**
 * What a run was, for {@code report.md}: the chain, its inputs and overrides, the instances
 * with their effective options, and how it ended.
 *
 * @param chainFile   the chain file as named by the user
 * @param description the chain file's description, or empty
 * @param version     lanesift version
 * @param started     when the run began
 * @param millis      wall time in milliseconds
 * @param status      "completed", "cancelled" or "failed: ..." (one line)
 * @param inputs      {@code --input} values, instance to file
 * @param sets        {@code --set} values as typed
 * @param instances   the instances in chain order
 * @param stale       files in the output folder from an earlier run that this run did not write (left in place)
 */
public record RunSummary(String chainFile, String description, String version, Instant started, long millis, String status,
                         Map<String, String> inputs, List<String> sets, List<Instance> instances,
                         List<String> stale) {

    /**
     * One instance.
     *
     * @param id      instance id
     * @param plugin  plugin id
     * @param name    plugin display name
     * @param version plugin version
     * @param options effective options (defaults filled in), as text
     * @param given   the names of the options the chain file (or {@code --set}) gave; the others
     *                are the plugin's defaults, assumed
     */
    public record Instance(String id, String plugin, String name, String version, Map<String, String> options,
                           java.util.Set<String> given) {
    }
}
