package org.lanesift.dist.sift;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;

/** The test-tree packet generator's ECC and checksum against published values, so the sift test's truth is right. */
class PacketLinkCaptureTest {
    @Test
    void eccAndChecksumMatchThePublishedValues() {
        // Source: docs/reference-facts.md#dsi-packets-ecc-and-checksum, worked example: header 39 04 00 has ECC 2C
        assertEquals(0x2C, PacketLinkCapture.ecc(0x39, 0x04, 0x00));
        // Source: CRC RevEng catalogue (docs/reference-facts.md#crc-check-values): CRC-16/MCRF4XX check value 0x6F91
        byte[] check = "123456789".getBytes(StandardCharsets.US_ASCII);
        int[] b = new int[check.length];
        for (int i = 0; i < b.length; i++) {
            b[i] = check[i];
        }
        assertEquals(0x6F91, PacketLinkCapture.crc16(b));
        // Source: docs/reference-facts.md#dsi-packets-ecc-and-checksum: payload B9 F1 12 83 sends checksum bytes 84 5D
        int[] pkt = PacketLinkCapture.packet(new PacketLinkCapture.Command(0x39, 0xB9, new int[] {0xF1, 0x12, 0x83}));
        assertArrayEquals(new int[] {0x39, 0x04, 0x00, 0x2C, 0xB9, 0xF1, 0x12, 0x83, 0x84, 0x5D}, pkt);
    }
}
