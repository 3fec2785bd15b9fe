package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The rule of {@link Edges#levelOnly}: a transition inside or at the end of an unknown span is no edge. */
class EdgesLevelOnlyTest {

    /** Samples from a string: '0', '1', 'x' (unknown). Period 1000 fs, first sample at {@code startFs}. */
    static LogicBlock logic(String s, long startFs) {
        int n = s.length();
        long[] bits = new long[BitSets.words(n)];
        long[] inv = new long[BitSets.words(n)];
        for (int i = 0; i < n; i++) {
            BitSets.set(bits, i, s.charAt(i) == '1');
            BitSets.set(inv, i, s.charAt(i) == 'x');
        }
        return new LogicBlock("c", 0, startFs, 1000, bits, n, inv);
    }

    @Test
    void theRuleCoversTheSpanAndBothBounds() {
        assertTrue(Edges.levelOnly(400, 400, 600));
        assertTrue(Edges.levelOnly(500, 400, 600));
        assertTrue(Edges.levelOnly(600, 400, 600), "the transition that ends the span");
        assertFalse(Edges.levelOnly(399, 400, 600));
        assertFalse(Edges.levelOnly(601, 400, 600));
    }

    @Test
    void theTransitionLeavingAnUnknownRunIsLevelOnlyAndTheOthersAreEdges() {
        // 0 0 1 1 x x x 0 0 1: true edges at 1.5 and 8.5 samples; the run x ends at 6.5 with a change 1 -> 0
        Edges e = LogicEdges.edgesOf(logic("0011xxx001", 0));
        assertEquals(3, e.count());
        assertEquals(1500, e.timesFs()[0]);
        assertEquals(6500, e.timesFs()[1]);
        assertEquals(8500, e.timesFs()[2]);
        assertFalse(e.levelOnly(0));
        assertTrue(e.levelOnly(1), "the exit from the unknown run restores the level, it is no edge");
        assertFalse(e.levelOnly(2));
    }

    @Test
    void anUnknownStartFollowedByTheFirstLevelIsLevelOnlyAcrossBlocks() {
        // block 1 ends unknown after a low start; block 2 starts high: the transition at block 2's start
        // ends block 1's last unknown span
        LogicEdges conv = new LogicEdges();
        Edges a = conv.toEdges(logic("00xx", 0));
        Edges b = conv.toEdges(logic("1101", 4000));
        assertEquals(1, a.invalidCount());
        assertEquals(3500, b.timesFs()[0]);
        assertFalse(b.levelOnly(0), "block 2 alone has no unknown span");
        assertTrue(Edges.levelOnly(b.timesFs()[0], a.invalidSpans()[0], a.invalidSpans()[1]),
                "checked against the previous block's last span, as the rule asks");
        assertFalse(b.levelOnly(1));
    }
}
