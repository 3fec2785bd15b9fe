package org.lanesift.data;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** A bit stream carries both margin arrays or neither, says which, and never hands out margins it does not have. */
class BitStreamMarginsTest {
    private static BitStream stream(long[] setup, long[] hold) {
        return new BitStream("d1", 0, 300, 3, new long[] {5}, new long[] {0, 100, 200}, new long[] {0, 1, 2}, new long[] {2}, null,
                setup, hold, new long[] {4}, 100.0);
    }

    @Test
    void withMarginsTheyAreTheArraysGiven() {
        long[] su = {10, 20, BitStream.UNKNOWN_MARGIN};
        long[] ho = {30, 40, 50};
        BitStream b = stream(su, ho);
        assertTrue(b.hasMargins());
        assertSame(su, b.setupFs());
        assertSame(ho, b.holdFs());
        assertFalse(b.toString().contains("no margins"), b.toString());
    }

    @Test
    void withoutMarginsAskingForThemIsABug() {
        BitStream b = stream(null, null);
        assertFalse(b.hasMargins());
        assertTrue(b.bit(0) && !b.bit(1) && b.bit(2) && b.isFlagged(2), "values and flags are all there");
        IllegalStateException e = assertThrows(IllegalStateException.class, b::setupFs);
        assertTrue(e.getMessage().contains("'d1' carries no setup margins") && e.getMessage().contains("readsBitMargins"), e.getMessage());
        e = assertThrows(IllegalStateException.class, b::holdFs);
        assertTrue(e.getMessage().contains("'d1' carries no hold margins"), e.getMessage());
        assertTrue(b.toString().contains("no margins"), b.toString());
    }

    @Test
    void oneMarginArrayWithoutTheOtherOrTooShortIsRefused() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> stream(new long[3], null));
        assertTrue(e.getMessage().contains("both"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> stream(null, new long[3]));
        assertThrows(IllegalArgumentException.class, () -> stream(new long[2], new long[3]));
    }
}
