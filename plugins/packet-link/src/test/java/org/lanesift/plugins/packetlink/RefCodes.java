package org.lanesift.plugins.packetlink;

import java.io.ByteArrayOutputStream;

/**
 * Independent, deliberately plain re-implementations for the tests: the header ECC straight from
 * the published parity equations (docs/reference-facts.md#dsi-packets-ecc-and-checksum, MIPI DSI specification, from memory) and the
 * payload CRC bit by bit (CRC RevEng catalogue, CRC-16/MCRF4XX: poly 0x1021 reflected, init 0xFFFF,
 * no final XOR). Packet builders use these, not the production code.
 */
final class RefCodes {
    static final int[][] EQUATIONS = {
        {0, 1, 2, 4, 5, 7, 10, 11, 13, 16, 20, 21, 22, 23},
        {0, 1, 3, 4, 6, 8, 10, 12, 14, 17, 20, 21, 22, 23},
        {0, 2, 3, 5, 6, 9, 11, 12, 15, 18, 20, 21, 22},
        {1, 2, 3, 7, 8, 9, 13, 14, 15, 19, 20, 21, 23},
        {4, 5, 6, 7, 8, 9, 16, 17, 18, 19, 20, 22, 23},
        {10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 21, 22, 23},
    };

    private RefCodes() {
    }

    static int ecc(int b0, int b1, int b2) {
        int h = (b0 & 0xFF) | (b1 & 0xFF) << 8 | (b2 & 0xFF) << 16;
        int e = 0;
        for (int p = 0; p < 6; p++) {
            int x = 0;
            for (int bit : EQUATIONS[p]) {
                x ^= h >> bit & 1;
            }
            e |= x << p;
        }
        return e;
    }

    static int crc(byte[] d, int off, int len) {
        int c = 0xFFFF;
        for (int i = off; i < off + len; i++) {
            c ^= d[i] & 0xFF;
            for (int k = 0; k < 8; k++) {
                c = (c & 1) != 0 ? (c >>> 1) ^ 0x8408 : c >>> 1;
            }
        }
        return c;
    }

    static byte[] shortPacket(int vc, int dt, int d0, int d1) {
        int di = vc << 6 | dt;
        return new byte[] {(byte) di, (byte) d0, (byte) d1, (byte) ecc(di, d0, d1)};
    }

    static byte[] longPacket(int vc, int dt, byte[] payload) {
        int di = vc << 6 | dt;
        int wc = payload.length;
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        o.write(di);
        o.write(wc & 0xFF);
        o.write(wc >> 8);
        o.write(ecc(di, wc & 0xFF, wc >> 8));
        o.write(payload, 0, wc);
        int c = crc(payload, 0, wc);
        o.write(c & 0xFF);
        o.write(c >> 8);
        return o.toByteArray();
    }

    static byte[] cat(byte[]... parts) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        for (byte[] p : parts) {
            o.write(p, 0, p.length);
        }
        return o.toByteArray();
    }

    static byte[] bytes(int... v) {
        byte[] b = new byte[v.length];
        for (int i = 0; i < v.length; i++) {
            b[i] = (byte) v[i];
        }
        return b;
    }
}
