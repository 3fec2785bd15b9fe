package org.lanesift.plugins.discovery;

/**
 * What discovery examines: the clock's edges and each data lane's transitions, femtoseconds.
 *
 * @param clockName   clock signal name
 * @param risingFs    rising clock edges, ascending
 * @param nRising     how many
 * @param fallingFs   falling clock edges, ascending
 * @param nFalling    how many
 * @param laneNames   data lane names
 * @param laneInitial level of each lane before its first transition
 * @param laneEdgesFs transitions of each lane, ascending
 * @param laneCounts  transitions per lane
 */
public record LinkEdgesInput(String clockName, long[] risingFs, int nRising, long[] fallingFs, int nFalling, String[] laneNames,
                             boolean[] laneInitial, long[][] laneEdgesFs, int[] laneCounts) {
}
