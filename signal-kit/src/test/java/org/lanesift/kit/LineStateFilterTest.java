package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The line-state filter: a state counts once it has lasted the minimum, from its first sample. */
class LineStateFilterTest {
    @Test
    void shortExcursionsAreDroppedAndLastingStatesStartAtTheirFirstSample() {
        LineStateFilter f = new LineStateFilter(30);
        assertFalse(f.step(LineState.LP11, 0));
        assertNull(f.committed());
        assertTrue(f.step(LineState.LP11, 30), "LP-11 has lasted 30");
        assertEquals(LineState.LP11, f.committed());
        assertEquals(0, f.committedStartFs());
        // a 20-long LP-01 excursion, then LP-11 again: dropped
        assertFalse(f.step(LineState.LP01, 40));
        assertFalse(f.step(LineState.LP01, 60));
        assertFalse(f.step(LineState.LP11, 70));
        // LP-01 from 80; an LP-00 sample at 90 restarts the count; LP-00 commits at 120, from 90
        assertFalse(f.step(LineState.LP01, 80));
        assertFalse(f.step(LineState.LP00, 90));
        assertFalse(f.step(LineState.LP00, 110));
        assertTrue(f.step(LineState.LP00, 120));
        assertEquals(LineState.LP00, f.committed());
        assertEquals(90, f.committedStartFs());
        assertFalse(f.step(LineState.LP00, 130), "the committed state again commits nothing");
    }

    @Test
    void flushCommitsAPendingStateThatLastedToTheEnd() {
        LineStateFilter f = new LineStateFilter(30);
        f.step(LineState.HS, 0);
        assertFalse(f.flush(20), "nothing committed yet: no change to finish");
        f.step(LineState.HS, 30);
        f.step(LineState.LP11, 40);
        assertFalse(f.flush(60), "LP-11 lasted 20 by the end");
        assertTrue(f.flush(70));
        assertEquals(LineState.LP11, f.committed());
        assertEquals(40, f.committedStartFs());
    }

    @Test
    void maskedSamplesClassifyAsInvalid() {
        LineStateClassifier c = LineStateClassifier.dphy();
        float[] p = {1.2f, 1.2f};
        float[] n = {1.2f, 1.2f};
        assertEquals(LineState.LP11, c.classify(p, 0, null, n, 0, null));
        assertEquals(LineState.INVALID, c.classify(p, 1, new long[] {0b10}, n, 1, null));
        assertEquals(LineState.INVALID, c.classify(p, 1, null, n, 1, new long[] {0b10}));
        assertEquals(LineState.LP11, c.classify(p, 0, new long[] {0b10}, n, 0, new long[] {0b10}));
    }
}
