package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The order check of {@link Edges} covers every transition of a long list and names the first one out of order. */
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
}
