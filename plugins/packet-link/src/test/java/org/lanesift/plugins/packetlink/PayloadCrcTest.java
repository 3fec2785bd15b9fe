package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.Random;
import org.junit.jupiter.api.Test;

class PayloadCrcTest {
    // Source: CRC RevEng catalogue, CRC-16/MCRF4XX: check value 0x6F91 for ASCII "123456789".
    @Test
    void catalogueCheckValue() {
        byte[] d = "123456789".getBytes(StandardCharsets.US_ASCII);
        assertEquals(0x6F91, PayloadCrc.of(d, 0, d.length));
    }

    // Source: worked example of docs/reference-facts.md#dsi-packets-ecc-and-checksum (from memory): payload B9 F1 12 83 has checksum
    // bytes 84 5D (sent least significant byte first).
    @Test
    void workedExamplePayload() {
        byte[] d = RefCodes.bytes(0xB9, 0xF1, 0x12, 0x83);
        int c = PayloadCrc.of(d, 0, 4);
        assertEquals(0x84, c & 0xFF);
        assertEquals(0x5D, c >> 8);
    }

    // Source: bit-serial definition of the same catalogue entry (RefCodes), against the table code,
    // including a checksum continued across pieces.
    @Test
    void tableMatchesBitSerial() {
        Random r = new Random(3);
        for (int n = 0; n < 300; n++) {
            byte[] d = new byte[n];
            r.nextBytes(d);
            int cut = n / 3;
            int c = PayloadCrc.update(PayloadCrc.update(PayloadCrc.INIT, d, 0, cut), d, cut, n - cut);
            assertEquals(RefCodes.crc(d, 0, n), c, "length " + n);
        }
    }
}
