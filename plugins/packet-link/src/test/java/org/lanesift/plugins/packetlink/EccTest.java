package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.api.Test;

class EccTest {
    // Source: the worked example of docs/reference-facts.md#dsi-packets-ecc-and-checksum (a published walkthrough; from memory):
    // header 39 04 00 has ECC 2C.
    @Test
    void workedExampleHeader() {
        assertEquals(0x2C, Ecc.compute(0x39 | 0x04 << 8));
        assertEquals(0x2C, RefCodes.ecc(0x39, 0x04, 0x00));
        assertEquals(Ecc.OK, Ecc.status(Ecc.check(0x000439, 0x2C)));
    }

    // Source: the published parity equations (docs/reference-facts.md#dsi-packets-ecc-and-checksum, MIPI DSI specification, from
    // memory), evaluated bit by bit in RefCodes, against the table-driven production code.
    @Test
    void tableMatchesEquationsForRandomHeaders() {
        Random r = new Random(8);
        for (int i = 0; i < 20000; i++) {
            int h = r.nextInt(1 << 24);
            assertEquals(RefCodes.ecc(h & 0xFF, h >> 8 & 0xFF, h >> 16), Ecc.compute(h), "header " + Integer.toHexString(h));
        }
    }

    // Source: MIPI DSI ECC equations (docs/reference-facts.md#dsi-packets-ecc-and-checksum). Exhaustive over the 30 protected bit
    // positions (24 header bits + 6 ECC bits): every single-bit error is corrected back to the sent
    // header, and every one of the 435 double-bit errors is reported uncorrectable.
    @Test
    void allSingleErrorsCorrectedAllDoubleErrorsDetected() {
        Random r = new Random(80);
        for (int trial = 0; trial < 200; trial++) {
            int h = r.nextInt(1 << 24);
            int ecc = RefCodes.ecc(h & 0xFF, h >> 8 & 0xFF, h >> 16);
            long word = h | (long) ecc << 24;
            for (int a = 0; a < 30; a++) {
                long bad = word ^ (1L << a);
                int res = Ecc.check((int) (bad & 0xFFFFFF), (int) (bad >>> 24));
                assertEquals(h, Ecc.header(res), "single error at bit " + a);
                assertEquals(a < 24 ? Ecc.CORRECTED_HEADER_BIT : Ecc.CORRECTED_ECC_BIT, Ecc.status(res));
                assertEquals(a, Ecc.bit(res));
                for (int b = a + 1; b < 30; b++) {
                    long bad2 = bad ^ (1L << b);
                    int res2 = Ecc.check((int) (bad2 & 0xFFFFFF), (int) (bad2 >>> 24));
                    assertEquals(Ecc.UNCORRECTABLE, Ecc.status(res2), "double error at bits " + a + ", " + b);
                }
            }
        }
    }
}
