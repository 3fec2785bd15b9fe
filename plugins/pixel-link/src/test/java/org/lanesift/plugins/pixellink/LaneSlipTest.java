package org.lanesift.plugins.pixellink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The data-lane slip rule on lines built slot by slot with the VESA 24-bit table
 * (docs/reference-facts.md#pixel-link-clock-and-slot-mappings): lanes are serialised slot 0 first,
 * one lane is moved by whole unit intervals, the words are cut again per pixel and decoded, and
 * the blanking pixels beside each DE edge go to the rule as the frame assembler hands them over.
 */
class LaneSlipTest {
    private static final int[][] TABLES = SlotMapping.builtIn("vesa-24").lookupTables(false);
    private static final int ACTIVE = 16;
    private static final int BLANK = 8;
    private static final int LINES = 40;

    @Test
    void alignedLanesGiveNothing() {
        assertNull(run(-1, 0, false, 1));
    }

    @Test
    void aDataLaneOneUnitIntervalLateIsNamed() {
        assertEquals(new LaneSlip.Slip(0, true, 1, 0), withoutTime(run(0, 1, false, 2)));
    }

    @Test
    void aDataLaneTwoUnitIntervalsEarlyIsNamed() {
        assertEquals(new LaneSlip.Slip(1, false, 2, 0), withoutTime(run(1, -2, false, 3)));
    }

    @Test
    void aSourceSendingDataDuringBlankingLeavesTheRuleSilent() {
        assertNull(run(0, 1, true, 4));
    }

    @Test
    void theControlLaneIsLeftToTheFramingCheck() {
        assertNull(run(2, 1, false, 5));
    }

    private static LaneSlip.Slip withoutTime(LaneSlip.Slip s) {
        return s == null ? null : new LaneSlip.Slip(s.lane(), s.late(), s.unitIntervals(), 0);
    }

    /** Lines of random pixels; lane {@code slipLane} moved by {@code slots} (positive: late). */
    private static LaneSlip.Slip run(int slipLane, int slots, boolean noisyBlanking, long seed) {
        Random r = new Random(seed);
        int pixels = LINES * (ACTIVE + BLANK);
        int[][] bits = new int[4][pixels * 7];
        int deLane = -1;
        int deSlot = -1;
        for (int l = 0; l < 4; l++) {
            for (int s = 0; s < 7; s++) {
                if ((TABLES[l][1 << s] & (1 << 24)) != 0) {
                    deLane = l;
                    deSlot = s;
                }
            }
        }
        for (int p = 0; p < pixels; p++) {
            boolean de = p % (ACTIVE + BLANK) < ACTIVE;
            for (int l = 0; l < 4; l++) {
                for (int s = 0; s < 7; s++) {
                    int v = de || noisyBlanking ? r.nextInt(2) : 0;
                    if ((TABLES[l][1 << s] & 0x07000000) != 0) {
                        v = l == deLane && s == deSlot && de ? 1 : 0; // control slots: DE only, sync idle
                    }
                    bits[l][p * 7 + s] = v;
                }
            }
        }
        if (slipLane >= 0) {
            int[] moved = new int[bits[slipLane].length];
            for (int i = 0; i < moved.length; i++) {
                int from = i - slots;
                moved[i] = from >= 0 && from < moved.length ? bits[slipLane][from] : 0;
            }
            bits[slipLane] = moved;
        }
        int[] px = new int[pixels];
        for (int p = 0; p < pixels; p++) {
            for (int l = 0; l < 4; l++) {
                int w = 0;
                for (int s = 0; s < 7; s++) {
                    w |= bits[l][p * 7 + s] << s;
                }
                px[p] |= TABLES[l][w];
            }
        }
        LaneSlip slip = new LaneSlip(TABLES);
        for (int p = 2; p + 1 < pixels; p++) {
            int edge = (px[p] ^ px[p - 1]) >>> 24 & 1;
            if (edge != 0 && (px[p] >>> 24 & 1) == 0) {
                slip.fall(px[p], px[p + 1], p);
            } else if (edge != 0) {
                slip.rise(px[p - 2], px[p - 1], p);
            }
        }
        return slip.found();
    }
}
