package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class PacketParserTest {
    record P(int off, int header, int ecc, int pOff, int pLen, int rx, int calc) {
    }

    static final class Rec implements PacketParser.Listener {
        final List<P> packets = new ArrayList<>();
        final List<int[]> stops = new ArrayList<>();

        @Override
        public void packet(int offset, int header, int eccResult, int payloadOffset, int payloadLength, int checksumRx, int checksumCalc) {
            packets.add(new P(offset, header, eccResult, payloadOffset, payloadLength, checksumRx, checksumCalc));
        }

        @Override
        public void stopped(int offset, int remaining, int reason) {
            stops.add(new int[] {offset, remaining, reason});
        }
    }

    // Source: worked example of docs/reference-facts.md#dsi-packets-ecc-and-checksum (from memory): the packet 39 04 00 2C B9 F1 12 83 84 5D
    // is a DCS long write of 4 bytes with a good ECC and checksum.
    @Test
    void workedExamplePacket() {
        byte[] d = RefCodes.bytes(0x39, 0x04, 0x00, 0x2C, 0xB9, 0xF1, 0x12, 0x83, 0x84, 0x5D);
        Rec r = new Rec();
        assertEquals(10, PacketParser.parse(d, 0, d.length, r));
        assertEquals(1, r.packets.size());
        P p = r.packets.get(0);
        assertEquals(0x39, p.header() & 0xFF);
        assertEquals("dcs-long-write", DataTypes.name(p.header() & 0x3F));
        assertEquals(4, p.pLen());
        assertEquals(p.rx(), p.calc());
        assertEquals(0x5D84, p.rx());
        assertEquals(0, r.stops.size());
    }

    @Test
    void shortLongAndLeftover() {
        byte[] a = RefCodes.shortPacket(1, 0x15, 0x36, 0x08);
        byte[] b = RefCodes.longPacket(0, 0x29, RefCodes.bytes(0xE0, 1, 2, 3, 4, 5));
        byte[] d = RefCodes.cat(a, b, RefCodes.bytes(0x00, 0xFF));
        Rec r = new Rec();
        assertEquals(a.length + b.length, PacketParser.parse(d, 0, d.length, r));
        assertEquals(2, r.packets.size());
        assertEquals(1, r.packets.get(0).header() >> 6 & 3);
        assertEquals(0x36, r.packets.get(0).header() >> 8 & 0xFF);
        assertEquals(6, r.packets.get(1).pLen());
        assertEquals(1, r.stops.size());
        assertEquals(PacketParser.STOP_LEFTOVER, r.stops.get(0)[2]);
        assertEquals(2, r.stops.get(0)[1]);
    }

    @Test
    void corruptedLengthIsCorrectedNotTrusted() {
        byte[] b = RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2C, 9, 9, 9));
        b[1] ^= 0x40; // word count 4 -> 68: a single-bit error the ECC repairs before the length is used
        Rec r = new Rec();
        PacketParser.parse(b, 0, b.length, r);
        assertEquals(1, r.packets.size());
        assertEquals(3, r.packets.get(0).pLen() - 1);
        assertEquals(Ecc.CORRECTED_HEADER_BIT, Ecc.status(r.packets.get(0).ecc()));
        assertEquals(14, Ecc.bit(r.packets.get(0).ecc()));
    }

    @Test
    void doubleErrorStopsAndTruncationStops() {
        byte[] b = RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2C, 9, 9, 9));
        byte[] two = b.clone();
        two[0] ^= 0x03;
        Rec r = new Rec();
        assertEquals(0, PacketParser.parse(two, 0, two.length, r));
        assertEquals(PacketParser.STOP_UNCORRECTABLE, r.stops.get(0)[2]);
        Rec r2 = new Rec();
        assertEquals(0, PacketParser.parse(b, 0, b.length - 1, r2));
        assertEquals(PacketParser.STOP_TRUNCATED, r2.stops.get(0)[2]);
        assertEquals(0, r2.packets.size());
    }
}
