package org.lanesift.examples.demo;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class DemoScenarioTest {
    @Test
    void encoderMatchesThePublishedChecks() {
        // CRC RevEng catalogue, CRC-16/MCRF4XX: check value 0x6F91 for ASCII "123456789".
        assertEquals(0x6F91, DsiEncoder.crc16("123456789".getBytes(StandardCharsets.US_ASCII)));
        // Worked example of a display init sequence (docs/reference-facts.md#dsi-packets-ecc-and-checksum, from memory):
        // header 39 04 00 -> ECC 2C; payload B9 F1 12 83 -> checksum bytes 84 5D.
        assertEquals(0x2C, DsiEncoder.ecc(0x39, 0x04, 0x00));
        byte[] p = DsiEncoder.longPacket(0, 0x39, new byte[] {(byte) 0xB9, (byte) 0xF1, 0x12, (byte) 0x83});
        assertArrayEquals(new byte[] {0x39, 4, 0, 0x2C, (byte) 0xB9, (byte) 0xF1, 0x12, (byte) 0x83, (byte) 0x84, 0x5D}, p);
    }

    @Test
    void pixelSceneHoldsTwoCompleteFramesAndLvdsLevels() {
        PixelLinkScene.Capture c = PixelLinkScene.render(Impairments.pixelLinkDefaults());
        assertEquals(List.of(1, 2), c.truth().completeFrames());
        assertEquals(8, c.volts().length);
        // common mode of the clock pair: 1.2 V nominal + 60 mV ground offset (the scenario's parameter)
        double sum = 0;
        float[] p = c.volts()[0];
        float[] n = c.volts()[1];
        for (int i = 0; i < p.length; i++) {
            sum += (p[i] + n[i]) / 2;
        }
        assertEquals(1.26, sum / p.length, 0.01);
        // the same seed gives the same capture
        assertArrayEquals(p, PixelLinkScene.render(Impairments.pixelLinkDefaults()).volts()[0]);
    }

    @Test
    void packetSceneStartsAndEndsInLowPowerStop() {
        PacketLinkScene.Capture c = PacketLinkScene.render(Impairments.packetLinkDefaults());
        float[] l0p = c.volts()[2];
        assertEquals(1.2, l0p[100], 0.02);
        assertEquals(1.2, l0p[l0p.length - 100], 0.02);
        assertEquals(9 + 2 * (2 + 24), c.truth().commands().size());
    }

    @Test
    void exportsAreReadableText(@TempDir Path dir) throws Exception {
        float[][] v = {{0.1f, -0.25f, 1.5f}, {1f, 2f, 3f}};
        Path csv = dir.resolve("c.csv");
        CaptureFiles.writeCsv(csv, new String[] {"A", "B"}, v, 1e9, -1e-9);
        List<String> lines = Files.readAllLines(csv);
        // metadata keys of our own (docs/capture-csv.md, "Metadata lines the demo writes")
        assertEquals(List.of("generator,lanesift demo scenario (simulated capture)", "device,Siftlet-64 (invented)",
                "samples,3", "sample-period-s,1.000000e-09", ""), lines.subList(0, 5));
        assertEquals("Time (s),A (V),B (V)", lines.get(5));
        assertEquals("-0.000000001000,0.10000,1.00000", lines.get(6));
        assertEquals("0.000000000000,-0.25000,2.00000", lines.get(7));
        Path raw = dir.resolve("c.bin");
        CaptureFiles.writeRaw(raw, new String[] {"A", "B"}, v, 1e9, 1e-3);
        assertEquals(12, Files.size(raw));
        org.lanesift.json.JsonValue side = org.lanesift.json.JsonReader.read(Path.of(raw + ".json"), "c.bin.json");
        assertEquals("int16le", side.get("format").asString());
        assertEquals(1e9, side.get("rateHz").asDouble());
        assertEquals("B", side.at("/channels/1/name").asString());
        assertEquals(1e-3, side.at("/channels/1/gain").asDouble());
    }
}
