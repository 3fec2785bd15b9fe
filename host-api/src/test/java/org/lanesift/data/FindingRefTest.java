package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The reference a bit stream carries to its producer's findings, and the block's list of them. */
class FindingRefTest {
    private static final FindingRef DROP = new FindingRef("sampler", "clock-dropout", 5_000_000_000L,
            FindingRef.Effect.CLOCK_BREAK, 5_000_000_000L, 5_040_000_000L);

    @Test
    void spansAreInclusiveAtBothEnds() {
        assertTrue(DROP.covers(5_000_000_000L) && DROP.covers(5_040_000_000L));
        assertFalse(DROP.covers(4_999_999_999L) || DROP.covers(5_040_000_001L));
        // a break between two bits either side of the span, or touching it, meets it
        assertTrue(DROP.meets(4_990_000_000L, 5_047_000_000L));
        assertTrue(DROP.meets(5_040_000_000L, 5_047_000_000L));
        assertFalse(DROP.meets(5_040_000_001L, 5_047_000_000L));
        assertFalse(DROP.meets(4_000_000_000L, 4_999_999_999L));
    }

    @Test
    void itDescribesTheFindingForAConsequencesLabel() {
        assertEquals("the clock-dropout finding of 'sampler' at 5.000 us", DROP.describe());
        assertThrows(IllegalArgumentException.class,
                () -> new FindingRef("s", "k", 0, FindingRef.Effect.FLAGGED_BITS, 10, 9));
        assertThrows(NullPointerException.class, () -> new FindingRef("s", null, 0, FindingRef.Effect.FLAGGED_BITS, 0, 0));
    }

    @Test
    void aBitStreamCarriesAnUnmodifiableCopyOrNone() {
        long[] w = new long[1];
        long[] t = new long[1];
        BitStream plain = new BitStream("d0", 0, 1, 1, w, t, t, w, null, t, t, w, 1000);
        assertEquals(List.of(), plain.causes());
        List<FindingRef> l = new ArrayList<>(List.of(DROP));
        BitStream named = new BitStream("d0", 0, 1, 1, w, t, t, w, null, t, t, w, 1000, l);
        l.clear();
        assertEquals(List.of(DROP), named.causes());
        assertThrows(UnsupportedOperationException.class, () -> named.causes().add(DROP));
        assertEquals(List.of(), new BitStream("d0", 0, 1, 1, w, t, t, w, null, t, t, w, 1000, null).causes());
    }
}
