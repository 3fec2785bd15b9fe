package org.lanesift.plugins.pixellink;

/**
 * Finds a data lane (one carrying pixel bits only) that is whole unit intervals off the others.
 * Such a lane keeps its transitions on the slot boundaries, so bit margins cannot see it, and it
 * carries no DE, HS or VS, so the framing stays intact: only its pixels are wrong.
 *
 * <p>Rule (the DE-edge alignment of the data lanes): while DE is low a transmitter sends a steady
 * value on the pixel bits (zeros, common practice), so the blanking pixel right after a DE fall
 * equals the one after it, and the last blanking pixel before a DE rise equals the one before it.
 * A lane that is k unit intervals late carries the last active pixel's final k slots into the
 * first k slots (in time) of the first blanking pixel; a lane k unit intervals early carries the
 * first active pixel's first k slots into the last k slots of the last blanking pixel. So the
 * difference of the two blanking pixels, mapped back to lanes and slots through the slot
 * mapping, lies on one lane and only in its first (late) or last (early) slots. Each DE edge is
 * one observation: quiet (no difference), a spill (the difference is confined as above) or noise
 * (anything else). A lane is named once it has {@link #MIN_SPILLS} spills in one direction and at
 * least four times as many spills as all other non-quiet observations together; a source that
 * sends data during blanking gives noise, and the rule then stays silent. Lanes carrying a
 * control slot are left out: their slip breaks the framing, which is found there. Up to
 * {@link #MAX_SLOTS} unit intervals are recognised (beyond that a lane is nearer the neighbouring
 * pixel than its own).
 */
final class LaneSlip {
    /** Spills needed before a lane is named. */
    static final int MIN_SPILLS = 4;
    /** Most unit intervals of slip recognised. */
    static final int MAX_SLOTS = 3;
    private static final int RGB = 0xFFFFFF;
    private static final int FIRST_SLOTS = (1 << MAX_SLOTS) - 1;
    private static final int LAST_SLOTS = FIRST_SLOTS << (7 - MAX_SLOTS);

    /** The result: a lane, which way it is off and by how many unit intervals, the first spill's time (fs). */
    record Slip(int lane, boolean late, int unitIntervals, long firstFs) {
    }

    /** Per lane and time slot, the decoded RGB bits it carries; 0 for control lanes. */
    private final int[][] slotBits;
    private final int[] late;
    private final int[] early;
    private final int[] lateSlots;
    private final int[] earlySlots;
    private final long[] firstLateFs;
    private final long[] firstEarlyFs;
    private long noise;
    private Slip found;

    /**
     * @param tables the slot lookup tables of one link, lane by lane (bit s of a word = time slot s)
     */
    LaneSlip(int[][] tables) {
        int n = tables.length;
        slotBits = new int[n][7];
        for (int l = 0; l < n; l++) {
            boolean control = false;
            for (int s = 0; s < 7; s++) {
                control |= (tables[l][1 << s] & ~RGB) != 0;
            }
            for (int s = 0; s < 7 && !control; s++) {
                slotBits[l][s] = tables[l][1 << s] & RGB;
            }
        }
        late = new int[n];
        early = new int[n];
        lateSlots = new int[n];
        earlySlots = new int[n];
        firstLateFs = new long[n];
        firstEarlyFs = new long[n];
    }

    /**
     * A DE fall: the first blanking pixel and the one after it (decoded words with flags).
     *
     * @return the slip, the first time the evidence suffices; otherwise null
     */
    Slip fall(int first, int next, long tFs) {
        return observe(first, next, tFs, true);
    }

    /**
     * A DE rise: the blanking pixel before the last one, and the last one.
     *
     * @return the slip, the first time the evidence suffices; otherwise null
     */
    Slip rise(int before, int last, long tFs) {
        return observe(last, before, tFs, false);
    }

    Slip found() {
        return found;
    }

    private Slip observe(int edgePx, int refPx, long tFs, boolean fall) {
        if (found != null || ((edgePx | refPx) >>> 24 & ~6) != 0) {
            return null; // decided already, or DE high, or a flagged, incomplete or broken pixel
        }
        int diff = (edgePx ^ refPx) & RGB;
        if (diff == 0) {
            return null;
        }
        int lane = -1;
        int slots = 0;
        for (int l = 0; l < slotBits.length; l++) {
            int m = 0;
            for (int s = 0; s < 7; s++) {
                if ((slotBits[l][s] & diff) != 0) {
                    m |= 1 << s;
                }
            }
            if (m != 0) {
                if (lane >= 0) {
                    noise++;
                    return null;
                }
                lane = l;
                slots = m;
            }
        }
        int covered = 0;
        for (int s = 0; lane >= 0 && s < 7; s++) {
            covered |= (slots >>> s & 1) != 0 ? slotBits[lane][s] : 0;
        }
        if (lane < 0 || (diff & ~covered) != 0 || (slots & ~(fall ? FIRST_SLOTS : LAST_SLOTS)) != 0) {
            noise++;
            return null;
        }
        int[] count = fall ? late : early;
        if (count[lane]++ == 0) {
            (fall ? firstLateFs : firstEarlyFs)[lane] = tFs;
        }
        (fall ? lateSlots : earlySlots)[lane] |= slots;
        long others = noise - count[lane];
        for (int l = 0; l < slotBits.length; l++) {
            others += late[l] + early[l];
        }
        if (count[lane] >= MIN_SPILLS && count[lane] >= 4 * others) {
            int m = (fall ? lateSlots : earlySlots)[lane];
            int ui = fall ? 32 - Integer.numberOfLeadingZeros(m) : 7 - Integer.numberOfTrailingZeros(m);
            found = new Slip(lane, fall, ui, (fall ? firstLateFs : firstEarlyFs)[lane]);
            return found;
        }
        return null;
    }
}
