package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;

import net.jqwik.api.ForAll;
import net.jqwik.api.Property;

class Logic8Test {
    @Property(tries = 200)
    void splitEqualsBitByBitReading(@ForAll byte[] b) {
        long[][] out = new long[8][(b.length + 63) / 64 + 1];
        Logic8.split(b, b.length, 8, out);
        for (int i = 0; i < b.length; i++) {
            for (int c = 0; c < 8; c++) {
                boolean want = (b[i] >> c & 1) != 0;
                assertEquals(want, (out[c][i >>> 6] >>> (i & 63) & 1) != 0, "sample " + i + " channel " + c);
            }
        }
    }
}
