package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.lanesift.data.Edges;

class EdgeFilterTest {
    @Test
    void aTransitionEndingTheLastSpanOfThePreviousBlockIsNoEdge() {
        // unknown over [0, 500); the level comes back at 500, the first transition of the second block
        Edges whole = new Edges("c", 0, 2000, false, new long[] {500, 1000, 1500}, 3, new long[] {0, 500}, 1);
        Edges a = whole.slice(0, 500);
        Edges b = whole.slice(500, 2000);
        EdgeFilter f = new EdgeFilter();
        f.done(a);
        assertFalse(f.isEdge(b, 0), "restores the level after the unknown span");
        assertTrue(f.isEdge(b, 1));
        assertTrue(f.isEdge(b, 2));
        EdgeFilter one = new EdgeFilter();
        assertFalse(one.isEdge(whole, 0));
        assertTrue(one.isEdge(whole, 1));
    }
}
