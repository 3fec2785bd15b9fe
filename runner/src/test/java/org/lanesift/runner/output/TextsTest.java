package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.math.BigDecimal;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import org.junit.jupiter.api.Test;

/** Femtoseconds to decimal seconds, checked against exact decimal arithmetic (java.math.BigDecimal). */
class TextsTest {
    @Property(tries = 2000)
    void secondsAreExact(@ForAll long fs) {
        String s = Texts.seconds(fs);
        // Source: java.math.BigDecimal, exact decimal arithmetic of the JDK
        assertEquals(0, new BigDecimal(s).compareTo(BigDecimal.valueOf(fs).movePointLeft(15)), s);
    }

    @Test
    void examples() {
        assertEquals("0", Texts.seconds(0));
        assertEquals("1", Texts.seconds(1_000_000_000_000_000L));
        assertEquals("-0.000000000001234", Texts.seconds(-1234));
        assertEquals("0.0000000025", Texts.seconds(2_500_000));
        assertEquals("a_b-c.d", Texts.safe("a b-c.d"));
        assertEquals("390400ff", Texts.hex(new byte[] {0x39, 0x04, 0x00, (byte) 0xFF}));
    }
}
