package org.lanesift.plugins.dualedge;

import java.util.Arrays;

/**
 * Clock edges that {@link ClockRecovery} accepted and the planner has not taken yet, as parallel
 * primitive arrays (so the planner's and the sample buffer's loops read them without boxing): edge
 * time in femtoseconds, the tracked period at that edge in femtoseconds, flag bits, and the edge's
 * index (accepted-edge count, or the reference-edge count on multiplied clocks, -1 for a
 * non-reference edge there). The arrays are valid up to {@link #count()}.
 */
final class AcceptedEdges {
    /** Flag: a rising edge. */
    static final byte RISING = 1;
    /** Flag: the first edge after the clock was acquired again. */
    static final byte RESTART = 2;
    /** Flag: an unknown span of the clock lane overlaps the interval before this edge. */
    static final byte SUSPECT = 4;
    /** Flag: the edge a pixel period is counted from (multiplied clocks); every edge otherwise. */
    static final byte REFERENCE = 8;

    private long[] timesFs = new long[1024];
    private double[] periodsFs = new double[1024];
    private byte[] flags = new byte[1024];
    private long[] indices = new long[1024];
    private int count;

    int count() {
        return count;
    }

    /** Room in the present arrays; {@link #add} grows them, a bulk writer must stay below this. */
    int capacity() {
        return timesFs.length;
    }

    long[] timesFs() {
        return timesFs;
    }

    double[] periodsFs() {
        return periodsFs;
    }

    byte[] flags() {
        return flags;
    }

    long[] indices() {
        return indices;
    }

    /**
     * Appends one edge, growing the arrays if needed.
     *
     * @param timeFs   edge time, fs
     * @param periodFs tracked period at the edge, fs
     * @param f        flag bits
     * @param index    edge index, or -1
     */
    void add(long timeFs, double periodFs, byte f, long index) {
        if (count == timesFs.length) {
            int n = timesFs.length * 2;
            timesFs = Arrays.copyOf(timesFs, n);
            periodsFs = Arrays.copyOf(periodsFs, n);
            flags = Arrays.copyOf(flags, n);
            indices = Arrays.copyOf(indices, n);
        }
        timesFs[count] = timeFs;
        periodsFs[count] = periodFs;
        flags[count] = f;
        indices[count] = index;
        count++;
    }

    /**
     * Records that a bulk writer filled slots {@code [count(), newCount)} of the arrays directly.
     *
     * @param newCount the new count, at most {@link #capacity()}
     */
    void appended(int newCount) {
        if (newCount < count || newCount > timesFs.length) {
            throw new IllegalStateException("accepted-edge count " + newCount + " outside " + count + ".." + timesFs.length);
        }
        count = newCount;
    }

    /** Drops the first {@code n} edges (the planner took them). */
    void consumed(int n) {
        System.arraycopy(timesFs, n, timesFs, 0, count - n);
        System.arraycopy(periodsFs, n, periodsFs, 0, count - n);
        System.arraycopy(flags, n, flags, 0, count - n);
        System.arraycopy(indices, n, indices, 0, count - n);
        count -= n;
    }
}
