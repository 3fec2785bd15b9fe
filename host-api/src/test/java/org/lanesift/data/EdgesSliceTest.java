package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.LongRange;
import org.junit.jupiter.api.Test;

class EdgesSliceTest {
    /** 0..1000 fs, low at the start, toggling at 100, 200, 300, 700; unknown over [400, 600). */
    private static final Edges E = new Edges("d", 0, 1000, false, new long[] {100, 200, 300, 700}, 4,
            new long[] {400, 600}, 1);

    @Test
    void aSliceStartsAtTheLevelOfItsStartAndKeepsTheTransitionsInside() {
        Edges s = E.slice(150, 650);
        assertEquals(150, s.startFs());
        assertEquals(650, s.endFs());
        assertTrue(s.initialLevel(), "high between 100 and 200");
        assertArrayEquals(new long[] {200, 300}, Arrays.copyOf(s.timesFs(), s.count()));
        assertEquals(1, s.invalidCount());
        assertEquals(400, s.invalidSpans()[0]);
        assertEquals(600, s.invalidSpans()[1]);
    }

    @Test
    void unknownSpansAreClippedAndEmptyOnesDropped() {
        Edges s = E.slice(500, 1000);
        assertEquals(1, s.invalidCount());
        assertEquals(500, s.invalidSpans()[0]);
        assertEquals(600, s.invalidSpans()[1]);
        assertTrue(s.initialLevel(), "three transitions before 500 (at 100, 200, 300): high");
    }

    @Test
    void aTransitionAtTheCutBelongsToTheLaterSlice() {
        Edges before = E.slice(0, 200);
        Edges after = E.slice(200, 1000);
        assertArrayEquals(new long[] {100}, Arrays.copyOf(before.timesFs(), before.count()));
        assertEquals(200, after.timesFs()[0]);
        assertTrue(after.initialLevel(), "the level just before the transition at 200");
        assertEquals(0, E.slice(600, 1000).invalidCount());
    }

    @Test
    void aCoveringRangeReturnsTheBlockAndADisjointOneIsAnError() {
        assertSame(E, E.slice(-5, 5000));
        IllegalArgumentException x = assertThrows(IllegalArgumentException.class, () -> E.slice(2000, 3000));
        assertTrue(x.getMessage().contains("'d'") && x.getMessage().contains("outside"), x.getMessage());
    }

    /** The level at any time is the same in the block and in the slice that covers that time. */
    @Property(tries = 300)
    void slicesAgreeWithTheWholeBlock(@ForAll @LongRange(min = -50, max = 1050) long a,
                                      @ForAll @LongRange(min = 0, max = 1100) long len) {
        long b = a + len;
        if (Math.min(b, 1000) < Math.max(a, 0)) {
            return;
        }
        Edges s = E.slice(a, b);
        for (long t = s.startFs(); t < s.endFs(); t += 7) {
            assertEquals(levelAt(E, t), levelAt(s, t), "level at " + t);
            assertEquals(E.isUnknownAt(t), s.isUnknownAt(t), "unknown at " + t);
        }
    }

    private static boolean levelAt(Edges e, long t) {
        boolean l = e.initialLevel();
        for (int i = 0; i < e.count() && e.timesFs()[i] <= t; i++) {
            l = !l;
        }
        return l;
    }
}
