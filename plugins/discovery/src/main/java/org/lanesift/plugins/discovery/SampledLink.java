package org.lanesift.plugins.discovery;

import org.lanesift.data.BitSets;

/**
 * The bits of every lane, sampled at the found sample points, cut into bursts. Burst {@code b}
 * covers bit indices {@code [start[b], end[b])} on every lane (the lanes share the clock).
 *
 * @param lanes      packed bits of each lane
 * @param bits       bits per lane
 * @param start      first bit of each burst
 * @param end        end bit of each burst, exclusive
 * @param bursts     number of bursts
 * @param idleLevel  level of each lane in its long idle runs (false when none was seen)
 * @param burstMode  {@code clock-stops}, {@code idle-runs} or {@code streaming}
 * @param idleRunBits shortest run of idle bits counted as a pause between bursts
 */
record SampledLink(long[][] lanes, int bits, int[] start, int[] end, int bursts, boolean[] idleLevel, String burstMode,
                   int idleRunBits) {

    boolean bit(int lane, int i) {
        return BitSets.get(lanes[lane], i);
    }

    int length(int b) {
        return end[b] - start[b];
    }
}
