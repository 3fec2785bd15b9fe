package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.junit.jupiter.api.Test;

class FrameDecoderTest {
    record Got(int code, int seq, byte[] payload, long at) {
    }

    static final class Collect implements FrameDecoder.Listener {
        final List<Got> frames = new ArrayList<>();
        final List<long[]> skipped = new ArrayList<>();

        @Override
        public void frame(int code, int seq, byte[] buf, int off, int len, long at) {
            frames.add(new Got(code, seq, Arrays.copyOfRange(buf, off, off + len), at));
        }

        @Override
        public void skipped(long at, long length, int crc) {
            skipped.add(new long[] {at, length, crc});
        }
    }

    /** The worked example of docs/device-stream.md, byte for byte. */
    @Test
    void workedExampleOfTheDocument() {
        byte[] payload = {0x00, 0x01, 0, 0, 0, 0, 0, 0, 0x01, 0x03, 0x02, (byte) 0x80};
        byte[] f = Framing.encode(FrameType.DATA, 7, payload);
        String hex = hex(f);
        assertEquals("D5 6B 01 00 07 00 00 00 0C 00 00 01 00 00 00 00 00 00 01 03 02 80 F5 5D 23 5C", hex);
        // the CRC covers bytes 2..21 (type to end of payload), LSB first
        java.util.zip.CRC32C ref = new java.util.zip.CRC32C();
        ref.update(f, 2, f.length - 6);
        assertEquals((int) ref.getValue(), Framing.u32(f, f.length - 4));
        // the identify command has an empty payload
        assertEquals("D5 6B 10 00 00 00 00 00 00 00 3E BB 5E 08", hex(Framing.encode(FrameType.IDENTIFY, 0, new byte[0])));
    }

    static String crcHex(byte[] f) {
        return hex(Arrays.copyOfRange(f, f.length - 4, f.length));
    }

    static String hex(byte[] b) {
        StringBuilder s = new StringBuilder();
        for (byte x : b) {
            s.append(s.length() == 0 ? "" : " ").append(String.format("%02X", x & 0xFF));
        }
        return s.toString();
    }

    @Property(tries = 100)
    void framesSurviveAnyCutting(@ForAll("seeds") long seed, @ForAll @IntRange(min = 1, max = 5000) int chunk) {
        Random r = new Random(seed);
        ByteArrayOutputStream s = new ByteArrayOutputStream();
        List<byte[]> sent = new ArrayList<>();
        for (int i = 0; i < 20; i++) {
            byte[] p = new byte[r.nextInt(3000)];
            r.nextBytes(p);
            sent.add(p);
            s.writeBytes(Framing.encode(FrameType.DATA, i, p));
        }
        byte[] all = s.toByteArray();
        Collect c = new Collect();
        FrameDecoder d = new FrameDecoder(c);
        for (int i = 0; i < all.length; i += chunk) {
            d.feed(all, i, Math.min(chunk, all.length - i));
        }
        d.finish();
        assertEquals(20, c.frames.size());
        for (int i = 0; i < 20; i++) {
            assertEquals(i, c.frames.get(i).seq());
            assertArrayEquals(sent.get(i), c.frames.get(i).payload());
        }
        assertTrue(c.skipped.isEmpty());
    }

    @net.jqwik.api.Provide
    net.jqwik.api.Arbitrary<Long> seeds() {
        return net.jqwik.api.Arbitraries.longs();
    }

    @Property(tries = 100)
    void resynchronisesAfterCorruptionAndJunk(@ForAll("seeds") long seed) {
        Random r = new Random(seed);
        ByteArrayOutputStream s = new ByteArrayOutputStream();
        List<Integer> intact = new ArrayList<>();
        for (int i = 0; i < 30; i++) {
            byte[] p = new byte[1 + r.nextInt(500)];
            r.nextBytes(p);
            byte[] f = Framing.encode(FrameType.DATA, i, p);
            int fault = r.nextInt(4);
            if (fault == 0) {
                f[2 + r.nextInt(f.length - 2)] ^= (byte) (1 + r.nextInt(255)); // corrupt one byte after the marker
            } else {
                intact.add(i);
            }
            if (fault == 1) {
                byte[] junk = new byte[r.nextInt(40)];
                r.nextBytes(junk);
                s.writeBytes(junk);
            }
            s.writeBytes(f);
        }
        byte[] all = s.toByteArray();
        Collect c = new Collect();
        FrameDecoder d = new FrameDecoder(c);
        d.feed(all, 0, all.length);
        d.finish();
        // every intact frame is found; a corrupt one is never accepted (CRC-32C detects all single-byte errors)
        assertEquals(intact, c.frames.stream().map(Got::seq).toList());
        long good = c.frames.stream().mapToLong(g -> Framing.HEADER + g.payload().length + Framing.TRAILER).sum();
        long skipped = c.skipped.stream().mapToLong(x -> x[1]).sum();
        assertEquals(all.length, good + skipped, "every byte is either in a good frame or reported as skipped");
    }

    @Test
    void hugeLengthFieldIsRejectedWithoutWaitingForIt() {
        byte[] bogus = {(byte) 0xD5, 0x6B, 1, 0, 0, 0, 0, 0, (byte) 0xFF, (byte) 0xFF};
        byte[] good = Framing.encode(FrameType.DATA, 1, new byte[] {1, 2, 3, 4, 5, 6, 7, 8, 9});
        byte[] all = new byte[bogus.length + good.length];
        System.arraycopy(bogus, 0, all, 0, bogus.length);
        System.arraycopy(good, 0, all, bogus.length, good.length);
        Collect c = new Collect();
        FrameDecoder d = new FrameDecoder(c);
        d.feed(all, 0, all.length);
        assertEquals(1, c.frames.size(), "the frame right after a header claiming 65535 bytes is still found");
        assertEquals(bogus.length, c.frames.get(0).at());
        assertEquals(bogus.length, c.skipped.get(0)[1]);
        assertEquals(1, c.skipped.get(0)[2]);
    }

    @Test
    void deviceInfoRoundTripAndBounds() {
        DeviceInfo i = DeviceSimulator.INFO;
        byte[] p = i.encode();
        assertEquals(i, DeviceInfo.decode(p, 0, p.length));
        byte[] bad = p.clone();
        bad[0] = 60; // model length past the payload
        org.junit.jupiter.api.Assertions.assertThrows(DeviceException.class, () -> DeviceInfo.decode(bad, 0, bad.length));
        org.junit.jupiter.api.Assertions.assertThrows(DeviceException.class, () -> DeviceInfo.decode(p, 0, p.length - 1));
    }
}
