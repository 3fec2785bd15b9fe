package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.AnalogBlock;

/** The raw binary source: every sample format, gain and offset, clipped codes, start time, block cuts. */
class RawReaderTest {
    private static void sidecar(Path bin, String json) throws Exception {
        Files.writeString(Path.of(bin + ".json"), json);
    }

    @Test
    void int16LittleEndianWithGainOffsetAndClipping(@TempDir Path dir) throws Exception {
        Path bin = dir.resolve("cap.bin");
        ByteBuffer bb = ByteBuffer.allocate(5 * 4).order(ByteOrder.LITTLE_ENDIAN);
        short[][] codes = {{0, 100}, {1000, -1000}, {-2000, 2000}, {Short.MAX_VALUE, 5}, {7, Short.MIN_VALUE}};
        for (short[] f : codes) {
            bb.putShort(f[0]).putShort(f[1]);
        }
        Files.write(bin, bb.array());
        sidecar(bin, "{\"rateHz\": 2e9, \"format\": \"int16le\", \"startTimeS\": -1e-9,"
                + " \"channels\": [{\"name\": \"leg P\", \"gain\": 1e-4, \"offset\": 1.2}, {\"name\": \"leg N\", \"gain\": -1e-4}]}");
        for (int block : new int[] {1, 2, 65536}) {
            Collected c = Collected.run(new RawSource(), Map.of("file", bin.toString(), "blockSamples", block));
            double[] p = c.analog("leg_P");
            double[] n = c.analog("leg_N");
            assertEquals(1.2, p[0], 1e-6);
            assertEquals(1.3, p[1], 1e-6);
            assertEquals(1.0, p[2], 1e-6);
            assertTrue(Double.isNaN(p[3]), "code 32767 is at the top of the range: clipped");
            assertEquals(1.2007, p[4], 1e-6);
            assertArrayEquals(new double[] {-0.01, 0.1, -0.2, -0.0005}, java.util.Arrays.copyOf(n, 4), 1e-7);
            assertTrue(Double.isNaN(n[4]), "code -32768 is clipped");
            AnalogBlock b = (AnalogBlock) c.blocks("leg_P").get(0);
            assertEquals(-1_000_000L, b.startFs());
            assertEquals(500_000.0, b.periodFs(), 1e-9);
        }
    }

    @Test
    void otherFormats(@TempDir Path dir) throws Exception {
        Path u8 = dir.resolve("u8.raw");
        Files.write(u8, new byte[] {0, 1, (byte) 128, (byte) 255});
        sidecar(u8, "{\"rateHz\": 1e6, \"format\": \"uint8\", \"markClipped\": false, \"channels\": [{\"name\": \"a\", \"gain\": 0.01, \"offset\": -1.28}]}");
        assertArrayEquals(new double[] {-1.28, -1.27, 0, 1.27}, Collected.run(new RawSource(), Map.of("file", u8.toString())).analog("a"), 1e-6);

        Path s8 = dir.resolve("s8.raw");
        Files.write(s8, new byte[] {-1, 2, -3, 4});
        sidecar(s8, "{\"rateHz\": 1e6, \"format\": \"int8\", \"channels\": [{\"name\": \"x\"}, {\"name\": \"y\"}]}");
        Collected c8 = Collected.run(new RawSource(), Map.of("file", s8.toString()));
        assertArrayEquals(new double[] {-1, -3}, c8.analog("x"), 0);
        assertArrayEquals(new double[] {2, 4}, c8.analog("y"), 0);

        Path be = dir.resolve("be.raw");
        Files.write(be, new byte[] {0x01, 0x02, (byte) 0xFF, (byte) 0xFE});
        sidecar(be, "{\"rateHz\": 1e6, \"format\": \"int16be\", \"channels\": [{\"name\": \"z\"}]}");
        assertArrayEquals(new double[] {258, -2}, Collected.run(new RawSource(), Map.of("file", be.toString())).analog("z"), 0);

        Path f32 = dir.resolve("f.raw");
        ByteBuffer bb = ByteBuffer.allocate(12).order(ByteOrder.LITTLE_ENDIAN).putFloat(0.25f).putFloat(Float.NaN).putFloat(-3.5f);
        Files.write(f32, bb.array());
        Path side = dir.resolve("elsewhere.json");
        Files.writeString(side, "{\"rateHz\": 1e6, \"format\": \"float32le\", \"channels\": [{\"name\": \"f\", \"gain\": 2}]}");
        double[] f = Collected.run(new RawSource(), Map.of("file", f32.toString(), "sidecar", side.toString())).analog("f");
        assertEquals(0.5, f[0], 0);
        assertTrue(Double.isNaN(f[1]), "NaN is invalid");
        assertEquals(-7, f[2], 0);
    }

    /** firstFrame and frameCount read a window with the sample indices and times of the whole capture. */
    @Test
    void aWindowKeepsTheIndicesAndTimesOfTheWholeCapture(@TempDir Path dir) throws Exception {
        Path bin = dir.resolve("w.bin");
        byte[] codes = new byte[1000];
        for (int i = 0; i < codes.length; i++) {
            codes[i] = (byte) (i % 251);
        }
        Files.write(bin, codes);
        sidecar(bin, "{\"rateHz\": 3e9, \"format\": \"uint8\", \"markClipped\": false, \"startTimeS\": 1e-6,"
                + " \"channels\": [{\"name\": \"a\"}]}");
        Map<String, Object> all = Map.of("file", bin.toString(), "blockSamples", 64);
        java.util.List<AnalogBlock> whole = Collected.run(new RawSource(), all).blocks("a").stream().map(AnalogBlock.class::cast).toList();
        Collected w = Collected.run(new RawSource(), Map.of("file", bin.toString(), "blockSamples", 64, "firstFrame", 128,
                "frameCount", 200));
        java.util.List<AnalogBlock> part = w.blocks("a").stream().map(AnalogBlock.class::cast).toList();
        assertEquals(200, part.stream().mapToInt(AnalogBlock::length).sum());
        for (AnalogBlock b : part) {
            AnalogBlock same = whole.get((int) (b.firstIndex() / 64));
            assertEquals(same.firstIndex(), b.firstIndex());
            assertEquals(same.startFs(), b.startFs(), "block at index " + b.firstIndex());
            for (int i = 0; i < b.length(); i++) {
                assertEquals(same.volts()[i], b.volts()[i]);
            }
        }
        assertEquals(128 + 199, part.get(part.size() - 1).firstIndex() + part.get(part.size() - 1).length() - 1);
        // a count past the end stops at the end; a start past the end is an error naming the option
        assertEquals(1000 - 900, Collected.run(new RawSource(), Map.of("file", bin.toString(), "firstFrame", 900,
                "frameCount", 5000)).analog("a").length);
        CaptureFormatException x = org.junit.jupiter.api.Assertions.assertThrows(CaptureFormatException.class,
                () -> Collected.run(new RawSource(), Map.of("file", bin.toString(), "firstFrame", 1001)));
        assertTrue(x.getMessage().contains("firstFrame") && x.getMessage().contains("1000 frames"), x.getMessage());
    }
}
