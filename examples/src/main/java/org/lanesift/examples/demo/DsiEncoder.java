package org.lanesift.examples.demo;

import java.io.ByteArrayOutputStream;

/**
 * An independent encoder of display-serial-interface packets for the demo's packet link, written
 * from the equations in docs/reference-facts.md#dsi-packets-ecc-and-checksum (MIPI DSI; from memory): header = data
 * identifier, two data bytes, ECC; long packets add payload and a CRC-16 checksum, LSB first.
 * It shares no code with the decoder plugin, so the demo checks one against the other.
 */
final class DsiEncoder {
    private static final int[][] ECC_BITS = {
        {0, 1, 2, 4, 5, 7, 10, 11, 13, 16, 20, 21, 22, 23},
        {0, 1, 3, 4, 6, 8, 10, 12, 14, 17, 20, 21, 22, 23},
        {0, 2, 3, 5, 6, 9, 11, 12, 15, 18, 20, 21, 22},
        {1, 2, 3, 7, 8, 9, 13, 14, 15, 19, 20, 21, 23},
        {4, 5, 6, 7, 8, 9, 16, 17, 18, 19, 20, 22, 23},
        {10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 21, 22, 23},
    };

    private DsiEncoder() {
    }

    static int ecc(int b0, int b1, int b2) {
        int h = (b0 & 0xFF) | (b1 & 0xFF) << 8 | (b2 & 0xFF) << 16;
        int e = 0;
        for (int p = 0; p < 6; p++) {
            int x = 0;
            for (int bit : ECC_BITS[p]) {
                x ^= (h >> bit) & 1;
            }
            e |= x << p;
        }
        return e;
    }

    /** CRC-16, polynomial x^16+x^12+x^5+1 reflected (0x8408), init 0xFFFF, no final XOR. */
    static int crc16(byte[] data) {
        int crc = 0xFFFF;
        for (byte b : data) {
            crc ^= b & 0xFF;
            for (int i = 0; i < 8; i++) {
                crc = (crc & 1) != 0 ? (crc >>> 1) ^ 0x8408 : crc >>> 1;
            }
        }
        return crc;
    }

    static byte[] shortPacket(int vc, int dataType, int d0, int d1) {
        int di = (vc << 6) | dataType;
        return new byte[] {(byte) di, (byte) d0, (byte) d1, (byte) ecc(di, d0, d1)};
    }

    static byte[] longPacket(int vc, int dataType, byte[] payload) {
        int di = (vc << 6) | dataType;
        int wc = payload.length;
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        o.write(di);
        o.write(wc & 0xFF);
        o.write(wc >> 8);
        o.write(ecc(di, wc & 0xFF, wc >> 8));
        o.writeBytes(payload);
        int crc = crc16(payload);
        o.write(crc & 0xFF);
        o.write(crc >> 8);
        return o.toByteArray();
    }
}
