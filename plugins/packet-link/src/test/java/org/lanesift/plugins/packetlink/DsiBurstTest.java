package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.stream.Collectors;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.Frame;
import org.lanesift.data.WordStream;
import org.lanesift.testkit.StageHarness;

/**
 * A synthetic two-lane link (LinkSynth, invented demo scenario) with a known init sequence, sent
 * partly as low-power data and partly in high-speed bursts, and three known command-mode frames.
 * Packets are built with the reference ECC and CRC of RefCodes (docs/reference-facts.md#dsi-packets-ecc-and-checksum equations;
 * CRC RevEng catalogue CRC-16/MCRF4XX), not with the production code.
 */
class DsiBurstTest {
    static final long US = 1_000_000_000L;
    static final int W = 16;
    static final int H = 12;

    static int pixel(int frame, int x, int y) {
        return ((x * 16 + frame * 40) & 0xFF) << 16 | ((y * 20) & 0xFF) << 8 | ((x ^ y) * 9 + frame) & 0xFF;
    }

    static byte[] pixels(int frame) {
        byte[] b = new byte[W * H * 3];
        for (int y = 0; y < H; y++) {
            for (int x = 0; x < W; x++) {
                int p = pixel(frame, x, y);
                int i = (y * W + x) * 3;
                b[i] = (byte) (p >> 16);
                b[i + 1] = (byte) (p >> 8);
                b[i + 2] = (byte) p;
            }
        }
        return b;
    }

    static byte[] withCmd(int cmd, byte[] p, int from, int to) {
        byte[] b = new byte[to - from + 1];
        b[0] = (byte) cmd;
        System.arraycopy(p, from, b, 1, to - from);
        return b;
    }

    /** The packets of the first high-speed burst (settings); index of the 0xB0 long write returned via constants. */
    static byte[] settingsBurst() {
        return RefCodes.cat(
                RefCodes.shortPacket(0, 0x15, 0x3A, 0x77),
                RefCodes.shortPacket(0, 0x15, 0x36, 0x00),
                RefCodes.longPacket(0, 0x39, RefCodes.bytes(0xB0, 0x5A, 0xA5, 0x01)),
                RefCodes.longPacket(0, 0x29, RefCodes.bytes(0xE0, 1, 2, 3, 4, 5, 6, 7, 8)),
                RefCodes.shortPacket(0, 0x15, 0x35, 0x00));
    }

    /** Offset of the first payload byte of the 0xB0 write inside settingsBurst(). */
    static final int B0_PAYLOAD = 4 + 4 + 4;

    static LinkSynth scenario(byte[] settings) {
        LinkSynth s = new LinkSynth(2);
        s.idle(US);
        s.lpdt(RefCodes.shortPacket(0, 0x05, 0x01, 0x00));
        s.idle(4900 * US);
        s.lpdt(RefCodes.shortPacket(0, 0x05, 0x11, 0x00));
        s.idle(1900 * US);
        s.hs(settings);
        s.idle(200 * US);
        s.hs(RefCodes.shortPacket(0, 0x05, 0x29, 0x00));
        s.idle(900 * US);
        for (int f = 0; f < 3; f++) {
            byte[] px = pixels(f);
            s.hs(RefCodes.cat(
                    RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2A, 0, 0, 0, W - 1)),
                    RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2B, 0, 0, 0, H - 1)),
                    RefCodes.longPacket(0, 0x39, withCmd(0x2C, px, 0, px.length / 2)),
                    RefCodes.longPacket(0, 0x39, withCmd(0x3C, px, px.length / 2, px.length))));
            s.idle(500 * US);
        }
        return s;
    }

    static StageHarness run(LinkSynth s, int block, boolean bitsFirst) {
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 2, "profile", "dsi"));
        s.feed(h, block, bitsFirst);
        return h;
    }

    static String file(StageHarness h, String name) {
        return new String(artifact(h, name).content(), StandardCharsets.UTF_8);
    }

    static Artifact artifact(StageHarness h, String name) {
        return h.outputs("files", Artifact.class).stream().filter(a -> a.fileName().equals(name)).findFirst()
                .orElseThrow(() -> new AssertionError("no file " + name));
    }

    static List<String> problems(StageHarness h) {
        return h.annotations().stream().filter(a -> a.severity() != Severity.INFO).map(a -> a.kind() + ": " + a.label()).toList();
    }

    static Map<String, List<Annotation>> byTrack(StageHarness h) {
        return h.annotations().stream().collect(Collectors.groupingBy(Annotation::track, java.util.TreeMap::new, Collectors.toList()));
    }

    @Test
    void cleanLinkDecodesExactly() throws Exception {
        StageHarness h = run(scenario(settingsBurst()), 65536, false);
        assertEquals(List.of(), problems(h));
        List<String> names = h.annotations("command").stream().map(a -> a.fields().get("name").value().toString()).toList();
        assertEquals(List.of("soft_reset", "exit_sleep_mode", "set_pixel_format", "set_address_mode", "raw-0xB0", "generic-0xE0",
                "set_tear_on", "set_display_on",
                "set_column_address", "set_page_address", "write_memory_start", "write_memory_continue",
                "set_column_address", "set_page_address", "write_memory_start", "write_memory_continue",
                "set_column_address", "set_page_address", "write_memory_start", "write_memory_continue"), names);
        assertEquals(2, h.annotations("escape-entry").size());
        assertEquals(2, h.annotations("escape-command").size());
        assertEquals(5 * 2, h.annotations("hs-entry").size());
        assertEquals(5 * 2, h.annotations("hs-exit").size());
        assertEquals(List.of("lp", "lp", "hs"), h.annotations("command").stream().limit(3)
                .map(a -> a.fields().get("mode").value().toString()).toList());
        Annotation fmt = h.annotations("command").get(2);
        assertEquals("set_pixel_format: interface 24-bit, memory 24-bit", fmt.label());
        assertArrayEquals(new byte[] {0x77}, (byte[]) fmt.fields().get("params").value());
        assertEquals("set_column_address: columns 0..15", h.annotations("command").get(8).label());

        // init sequence: JSON, CSV and C array
        String json = file(h, "dut-commands.json");
        org.lanesift.json.JsonValue commands = org.lanesift.testkit.JsonScan.parse("dut-commands.json", json);
        org.lanesift.json.JsonValue init = org.lanesift.testkit.JsonScan.members(commands).stream()
                .filter(m -> m.name().equals("initSequence")).findFirst().orElseThrow(() -> new AssertionError(json)).value();
        assertEquals(11, org.lanesift.testkit.JsonScan.count(init, "index"), json);
        // one command of the sequence repeats three times, as a block of three
        assertTrue(org.lanesift.testkit.JsonScan.members(init).stream().anyMatch(m -> m.name().equals("repeat")
                && "3".equals(m.value().toString())
                && "3".equals(String.valueOf(init.at(m.pointer().substring(0, m.pointer().lastIndexOf('/')) + "/repeatBlock")))),
                json);
        String csv = file(h, "dut-commands.csv");
        assertEquals(21, csv.split("\n").length);
        assertTrue(csv.contains(",set_pixel_format,1,77,"), csv);
        String c = file(h, "dut-init.h");
        // records: flags (LP 1, long 2, DCS 4), data id, count, data as sent, wait in us (4 bytes LE); layout in docs/init-sequence.md
        // soft_reset in LP, then 4.9 ms idle plus the LP exit and entry: 4900 us and a bit, rounded up
        assertTrue(c.contains("0x05, 0x05, 0x02, 0x00, 0x01, 0x00,"), c);
        assertTrue(c.contains("/* soft_reset, lp short DCS, then wait 49"), c);
        assertTrue(c.contains("0x04, 0x15, 0x02, 0x00, 0x3A, 0x77, 0x00, 0x00, 0x00, 0x00, /* set_pixel_format, hs short DCS */"), c);
        assertTrue(c.contains("0x02, 0x29, 0x09, 0x00, 0xE0, 0x01, 0x02, 0x03, 0x04, 0x05, 0x06, 0x07, 0x08,"), c);
        assertTrue(c.contains("/* set_display_on, hs short DCS, then wait 9"), c);
        assertTrue(c.contains("_INIT_RECORDS 8\n"), c);
        // the frame window of the first frame apart from the init part; memory writes summarised
        assertTrue(c.contains("0x06, 0x39, 0x05, 0x00, 0x2A, 0x00, 0x00, 0x00, 0x0F,"), c);
        assertTrue(c.contains("_FRAME_WINDOW_RECORDS 2\n"), c);
        assertTrue(c.contains("_FRAME_WRITES 3 "), c);
        assertTrue(c.contains("_FRAME_PIXEL_BYTES " + (W * H * 3) + " "), c);
        assertTrue(c.contains("_LINK_LANES 2 ") && c.contains("_LINK_PIXEL_BITS 24 ") && c.contains("_LINK_VIDEO_MODE 0 "), c);

        // measured delay after soft_reset: 4.9 ms idle plus the low-power exit and entry (from the generator)
        double delay = Double.parseDouble(json.split("\"delayToNextMs\": ")[1].split("[,}]")[0]);
        assertEquals(4.9, delay, 0.02);

        // frames
        List<Frame> frames = h.outputs("frames", Frame.class);
        assertEquals(3, frames.size());
        for (int f = 0; f < 3; f++) {
            Frame fr = frames.get(f);
            assertEquals(W, fr.width());
            assertEquals(H, fr.height());
            assertFalse(fr.suspect());
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    assertEquals(pixel(f, x, y), fr.rgb()[y * W + x], "frame " + f + " pixel " + x + "," + y);
                }
            }
            BufferedImage img = ImageIO.read(new ByteArrayInputStream(artifact(h, String.format("dut-frame-%04d.png", f)).content()));
            assertEquals(pixel(f, 5, 7), img.getRGB(5, 7) & 0xFFFFFF);
        }
        String timing = file(h, "dut-timing.json");
        org.lanesift.json.JsonValue t = org.lanesift.testkit.JsonScan.parse("dut-timing.json", timing);
        assertEquals("command", org.lanesift.testkit.JsonScan.first(t, "mode").value().asString(), timing);
        assertEquals(3, org.lanesift.testkit.JsonScan.number(t, "frames"), timing);

        // packets output: bytes of all bursts, lanes alternating, no flags but packet structure
        List<WordStream> ws = h.outputs("packets", WordStream.class);
        assertEquals(2 + 5, ws.size());
        WordStream settings = ws.get(2);
        byte[] sent = settingsBurst();
        assertEquals(sent.length, settings.count());
        for (int i = 0; i < sent.length; i++) {
            assertEquals(sent[i] & 0xFF, settings.values()[i]);
            assertEquals(i % 2, settings.lane()[i]);
            assertEquals(0, settings.flags()[i] & (DsiDecoder.FLAG_CHECKSUM_BAD | DsiDecoder.FLAG_UNPARSED | WordStream.FLAG_SUSPECT));
        }
        assertEquals(DsiDecoder.FLAG_PACKET_START | DsiDecoder.FLAG_HEADER | WordStream.FLAG_GAP_BEFORE, settings.flags()[0]);
    }

    // Same link with one header bit flipped in the set_pixel_format packet: corrected and annotated,
    // everything else identical.
    @Test
    void flippedHeaderBitIsCorrected() {
        byte[] b = settingsBurst();
        b[1] ^= 0x04; // header bit 10 (second header byte, bit 2)
        StageHarness h = run(scenario(b), 65536, false);
        List<Annotation> fixed = h.annotations("ecc-corrected");
        assertEquals(1, fixed.size());
        assertEquals(10L, fixed.get(0).fields().get("bit").value());
        assertEquals(List.of("ecc-corrected: header bit 10 corrected"), problems(h));
        Annotation fmt = h.annotations("command").get(2);
        assertEquals("set_pixel_format", fmt.fields().get("name").value());
        assertArrayEquals(new byte[] {0x77}, (byte[]) fmt.fields().get("params").value());
        assertEquals(20, h.annotations("command").size());
        assertEquals(3, h.outputs("frames").size());
        assertTrue(org.lanesift.testkit.JsonScan.members(org.lanesift.testkit.JsonScan.parse("dut-commands.json", file(h, "dut-commands.json"))).stream()
                .anyMatch(m -> m.name().equals("eccCorrected") && m.value().isBoolean() && m.value().asBoolean()));
    }

    // Same link with one payload bit flipped in the 0xB0 long write: checksum failure annotated,
    // payload kept (with the flipped value) and marked in the log and on the packets output.
    @Test
    void flippedPayloadBitIsMarked() {
        byte[] b = settingsBurst();
        b[B0_PAYLOAD + 2] ^= 0x10; // A5 -> B5
        StageHarness h = run(scenario(b), 65536, false);
        assertEquals(1, h.annotations("checksum-mismatch").size());
        // the fault is found once: the command decoded from the bad packet is information referring to the mismatch
        assertEquals(List.of("checksum-mismatch"), h.annotations().stream().filter(a -> a.severity() != Severity.INFO)
                .map(Annotation::kind).collect(Collectors.toList()));
        Annotation raw = h.annotations("command").get(4);
        assertEquals("raw-0xB0", raw.fields().get("name").value());
        assertArrayEquals(RefCodes.bytes(0x5A, 0xB5, 0x01), (byte[]) raw.fields().get("params").value());
        assertEquals(Severity.INFO, raw.severity());
        assertTrue(raw.label().endsWith("(payload suspect, consequence: see the checksum-mismatch finding at "
                + org.lanesift.time.Femtos.format(h.annotations("checksum-mismatch").get(0).startFs()) + ")"), raw.label());
        WordStream settings = h.outputs("packets", WordStream.class).get(2);
        for (int i = 0; i < settings.count(); i++) {
            boolean inB0 = i >= B0_PAYLOAD && i < B0_PAYLOAD + 4 + 2;
            assertEquals(inB0, (settings.flags()[i] & DsiDecoder.FLAG_CHECKSUM_BAD) != 0, "byte " + i);
        }
        String csv = file(h, "dut-commands.csv");
        assertTrue(csv.contains("raw-0xB0,3,5A B5 01,") && csv.contains("checksum-bad"), csv);
        assertEquals(20, h.annotations("command").size());
    }

    // The same capture cut into other block sizes, with bits arriving before the legs, gives the
    // same annotations and files.
    @Test
    void blockBoundariesDoNotMatter() {
        LinkSynth s = scenario(settingsBurst());
        StageHarness a = run(s, 65536, false);
        StageHarness b = run(scenario(settingsBurst()), 777, true);
        // lanes report in the order their blocks arrive; per track the sequence must be identical
        assertEquals(byTrack(a), byTrack(b));
        for (String f : List.of("dut-commands.json", "dut-commands.csv", "dut-init.h", "dut-timing.json")) {
            assertEquals(file(a, f), file(b, f), f);
        }
    }
}
