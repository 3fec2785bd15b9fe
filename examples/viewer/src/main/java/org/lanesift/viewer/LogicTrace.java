package org.lanesift.viewer;

import java.util.Arrays;

/**
 * One logic signal held whole for drawing, as an edge list: the level at the start and the sorted
 * transition times. Reading the level at a time, or the edges in a pixel column, is a binary
 * search, so drawing costs O(pixels x log edges).
 *
 * @param name         row name
 * @param startFs      start of the covered span, femtoseconds
 * @param endFs        end of the covered span, exclusive, femtoseconds
 * @param initialLevel level at {@code startFs}
 * @param timesFs      transition times, sorted (at least {@code count} long)
 * @param count        number of transitions
 */
public record LogicTrace(String name, long startFs, long endFs, boolean initialLevel, long[] timesFs, int count) {

    /**
     * The level just after {@code tFs}.
     *
     * @param tFs a time, femtoseconds
     * @return the level
     */
    public boolean levelAt(double tFs) {
        return ((edgesAtOrBefore(tFs) & 1) == 1) != initialLevel;
    }

    /**
     * How many transitions happen at or before a time.
     *
     * @param tFs a time, femtoseconds
     * @return a count in {@code 0..count}
     */
    public int edgesAtOrBefore(double tFs) {
        long t = (long) Math.floor(tFs);
        int i = Arrays.binarySearch(timesFs, 0, count, t);
        if (i < 0) {
            return -i - 1;
        }
        while (i + 1 < count && timesFs[i + 1] == t) {
            i++;
        }
        return i + 1;
    }
}
