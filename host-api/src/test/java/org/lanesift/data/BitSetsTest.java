package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.junit.jupiter.api.Test;

class BitSetsTest {
    @Test
    void basics() {
        long[] w = new long[3];
        BitSets.setRange(w, 60, 130);
        assertEquals(70, BitSets.count(w, 192));
        assertTrue(BitSets.get(w, 60));
        assertTrue(BitSets.get(w, 129));
        assertFalse(BitSets.get(w, 130));
        assertFalse(BitSets.get(w, 59));
        assertTrue(BitSets.any(w, 0, 61));
        assertFalse(BitSets.any(w, 0, 60));
        assertFalse(BitSets.any(w, 130, 192));
        BitSets.set(w, 100, false);
        assertEquals(69, BitSets.count(w, 192));
        assertEquals(2, BitSets.words(65));
    }

    @Property
    void rangeMatchesBitByBit(@ForAll @IntRange(min = 0, max = 300) int a, @ForAll @IntRange(min = 0, max = 300) int b) {
        int from = Math.min(a, b);
        int to = Math.max(a, b);
        long[] w = new long[5];
        BitSets.setRange(w, from, to);
        for (int i = 0; i < 320; i++) {
            assertEquals(i >= from && i < to, BitSets.get(w, i), "bit " + i);
        }
        assertEquals(to - from, BitSets.count(w, 320));
        assertEquals(to > from, BitSets.any(w, 0, 320));
    }

    /** A word-wise slice holds, bit for bit, what a bit-by-bit copy would, and nothing past its length. */
    @Property(tries = 300)
    void sliceMatchesABitByBitCopy(@ForAll @IntRange(min = 0, max = 300) int from, @ForAll @IntRange(min = 0, max = 200) int n,
                                   @ForAll long seed) {
        java.util.Random r = new java.util.Random(seed);
        long[] src = new long[8];
        for (int i = 0; i < src.length; i++) {
            src[i] = r.nextLong();
        }
        long[] d = BitSets.slice(src, from, n);
        assertEquals(BitSets.words(n), d.length);
        for (int i = 0; i < 64 * d.length; i++) {
            assertEquals(i < n && BitSets.get(src, from + i), BitSets.get(d, i), "bit " + i);
        }
    }
}
