package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The order check of {@link Edges}: always on the public constructor, skipped only by the in-package producer path. */
class EdgesOrderCheckTest {
    private static long[] ascendingWithSwap(int n, int swapAt) {
        long[] t = new long[n];
        for (int i = 0; i < n; i++) {
            t[i] = 10L * i;
        }
        long x = t[swapAt];
        t[swapAt] = t[swapAt + 1];
        t[swapAt + 1] = x;
        return t;
    }

    @Test
    void thePublicConstructorChecksEveryTransitionOfALongList() {
        long[] t = ascendingWithSwap(10_000, 7_000);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new Edges("clk", 0, 1_000_000, false, t, t.length, null, 0));
        assertTrue(e.getMessage().contains("'clk'") && e.getMessage().contains("transition 7001"), e.getMessage());
    }

    @Test
    void thePublicConstructorStillChecksAfterAnOrderedConstruction() {
        long[] ok = ascendingWithSwap(1000, 0);
        ok[0] = 0;
        ok[1] = 10;
        assertEquals(1000, Edges.ordered("a", 0, 1_000_000, false, ok, ok.length, null, 0).count());
        long[] t = ascendingWithSwap(1000, 500);
        assertThrows(IllegalArgumentException.class, () -> new Edges("a", 0, 1_000_000, false, t, t.length, null, 0));
    }

    @Test
    void theOrderedPathStillChecksShortListsAndTheBounds() {
        long[] shortList = ascendingWithSwap(10, 4);
        assertThrows(IllegalArgumentException.class, () -> Edges.ordered("a", 0, 1000, false, shortList, 10, null, 0));
        long[] t = ascendingWithSwap(1000, 0);
        t[0] = -5; // before the start
        t[1] = 10;
        assertThrows(IllegalArgumentException.class, () -> Edges.ordered("a", 0, 1_000_000, false, t, t.length, null, 0));
        long[] late = ascendingWithSwap(1000, 0);
        late[0] = 0;
        late[1] = 10;
        assertThrows(IllegalArgumentException.class, () -> Edges.ordered("a", 0, 9990, false, late, late.length, null, 0));
    }
}
