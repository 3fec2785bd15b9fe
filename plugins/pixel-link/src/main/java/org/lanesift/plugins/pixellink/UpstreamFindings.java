package org.lanesift.plugins.pixellink;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.FindingRef;

/**
 * The findings the sampler named in the bit streams it sent ({@link org.lanesift.data.BitStream#causes()}):
 * what this decoder sees of them (flagged bits, clock breaks) is stated as information referring
 * to them; what none of them covers is this decoder's own finding. References whose span lies
 * wholly before the decode's progress are dropped, so the list stays as short as the findings
 * still in reach. Times are femtoseconds.
 */
final class UpstreamFindings {
    private final List<FindingRef> refs = new ArrayList<>();

    /**
     * Adds the references a block carries (each once).
     *
     * @param causes the block's references
     */
    void add(List<FindingRef> causes) {
        for (FindingRef r : causes) {
            if (!refs.contains(r)) {
                refs.add(r);
            }
        }
    }

    /**
     * The finding that accounts for flagged bits at an instant.
     *
     * @param tFs the pixel's time
     * @return the reference, or null when none covers it
     */
    FindingRef flagsAt(long tFs) {
        for (FindingRef r : refs) {
            if (r.effect() == FindingRef.Effect.FLAGGED_BITS && r.covers(tFs)) {
                return r;
            }
        }
        return null;
    }

    /**
     * The finding to name for a pixel whose flagged bits a finding accounts for: the one covering
     * its time, else the nearest (a pixel's slot-0 time can lie a few unit intervals before the
     * first bit a finding covers).
     *
     * @param tFs the pixel's time
     * @return the reference, or null when there is none of flagged bits
     */
    FindingRef flagsNear(long tFs) {
        FindingRef best = null;
        long bestD = Long.MAX_VALUE;
        for (FindingRef r : refs) {
            if (r.effect() != FindingRef.Effect.FLAGGED_BITS) {
                continue;
            }
            long d = r.covers(tFs) ? 0 : tFs < r.fromFs() ? r.fromFs() - tFs : tFs - r.toFs();
            if (d < bestD) {
                best = r;
                bestD = d;
            }
        }
        return best;
    }

    /**
     * The finding that accounts for a clock break between two consecutive pixels.
     *
     * @param fromFs the time of the pixel before the break (or of the break itself when unknown)
     * @param toFs   the time of the pixel after it
     * @return the reference, or null when none meets the interval
     */
    FindingRef breakBetween(long fromFs, long toFs) {
        for (FindingRef r : refs) {
            if (r.effect() == FindingRef.Effect.CLOCK_BREAK && r.meets(Math.min(fromFs, toFs), toFs)) {
                return r;
            }
        }
        return null;
    }

    /**
     * Forgets the references that end before an instant no later question can reach back to.
     *
     * @param beforeFs the earliest time still asked about
     */
    void dropBefore(long beforeFs) {
        refs.removeIf(r -> r.toFs() < beforeFs);
    }
}
