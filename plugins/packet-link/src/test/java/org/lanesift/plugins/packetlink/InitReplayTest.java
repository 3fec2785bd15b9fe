package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.ExternalTool;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.StageHarness;

/**
 * The two closed loops of the init-sequence header ({@code docs/init-sequence.md}).
 *
 * <p>1. A C harness (src/test/c/replay_tx.c), compiled with {@code gcc -Wall -Wextra -Werror}
 * against the generated header, replays every record into a test transmitter that re-encodes the
 * packet: header ECC from the parity bit lists and the payload checksum from the CRC rule of
 * docs/reference-facts.md#dsi-packets-ecc-and-checksum (CRC-16/MCRF4XX in the CRC RevEng
 * catalogue). Its bytes must equal the packets of the capture, which the test built with RefCodes,
 * and its waits must be the measured gaps rounded up to whole microseconds.
 *
 * <p>2. The harness's packets and waits, sent again as a two-lane capture (LinkSynth), decode to
 * the same command log, and no gap of the replay is shorter than the captured one.
 *
 * <p>The scenario is invented: LP and HS commands, DCS and generic, short and long, virtual
 * channels 0 to 2, a 12.4 us gap after exit_sleep_mode and two command-mode frames.
 */
class InitReplayTest {
    static final long US = 1_000_000_000L;
    static final long NS = 1_000_000L;

    /** Packets of the init part as the capture carries them, with their mode. */
    record Sent(String mode, byte[] packet) {
    }

    static final List<Sent> INIT = List.of(
            new Sent("lp", RefCodes.shortPacket(0, 0x05, 0x01, 0x00)),
            new Sent("lp", RefCodes.shortPacket(0, 0x05, 0x11, 0x00)),
            new Sent("hs", RefCodes.shortPacket(0, 0x15, 0x3A, 0x77)),
            new Sent("hs", RefCodes.shortPacket(1, 0x23, 0xC0, 0x11)),
            new Sent("hs", RefCodes.shortPacket(0, 0x03, 0x00, 0x00)),
            new Sent("hs", RefCodes.longPacket(0, 0x39, RefCodes.bytes(0xB0, 0x5A, 0xA5, 0x01))),
            new Sent("hs", RefCodes.longPacket(2, 0x29, RefCodes.bytes(0xE0, 1, 2, 3, 4, 5, 6, 7, 8))),
            new Sent("hs", RefCodes.shortPacket(0, 0x37, 0x10, 0x00)),
            new Sent("lp", RefCodes.longPacket(0, 0x39, RefCodes.bytes(0xB1, 0x22))),
            new Sent("hs", RefCodes.shortPacket(0, 0x05, 0x29, 0x00)));

    static LinkSynth scenario() {
        LinkSynth s = new LinkSynth(2);
        s.idle(US);
        s.lpdt(INIT.get(0).packet());
        s.idle(4900 * US);
        s.lpdt(INIT.get(1).packet());
        s.idle(12_400 * NS); // 12.4 us after exit_sleep_mode: must not become a wait of 0
        s.hs(RefCodes.cat(INIT.get(2).packet(), INIT.get(3).packet(), INIT.get(4).packet(), INIT.get(5).packet(),
                INIT.get(6).packet(), INIT.get(7).packet()));
        s.idle(37 * US);
        s.lpdt(INIT.get(8).packet());
        s.idle(200 * US);
        s.hs(INIT.get(9).packet());
        s.idle(900 * US);
        for (int f = 0; f < 2; f++) {
            byte[] px = DsiBurstTest.pixels(f);
            s.hs(RefCodes.cat(
                    RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2A, 0, 0, 0, DsiBurstTest.W - 1)),
                    RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2B, 0, 0, 0, DsiBurstTest.H - 1)),
                    RefCodes.longPacket(0, 0x39, DsiBurstTest.withCmd(0x2C, px, 0, px.length / 2)),
                    RefCodes.longPacket(0, 0x39, DsiBurstTest.withCmd(0x3C, px, px.length / 2, px.length))));
            s.idle(500 * US);
        }
        return s;
    }

    /** One line of the harness output. */
    record Replayed(String mode, long waitUs, byte[] packet) {
        static Replayed parse(String line) {
            String[] f = line.trim().split(" ");
            byte[] b = new byte[f.length - 2];
            for (int i = 2; i < f.length; i++) {
                b[i - 2] = (byte) Integer.parseInt(f[i], 16);
            }
            return new Replayed(f[0], Long.parseLong(f[1]), b);
        }
    }

    @Test
    void replayedRecordsReEncodeToTheCapturedPacketsAndDecodeToTheSameLog(@TempDir Path dir) throws Exception {
        Path gcc = ExternalTool.require("gcc");
        StageHarness h = DsiBurstTest.run(scenario(), 65536, false);
        assertEquals(List.of(), DsiBurstTest.problems(h));
        // the low-power packet after the settings burst is settled on lane 0 before that burst has ended on
        // lane 1; the packets output still follows the capture's time order (signals.vcd needs it)
        long prevStart = Long.MIN_VALUE;
        for (org.lanesift.data.WordStream w : h.outputs("packets", org.lanesift.data.WordStream.class)) {
            assertTrue(w.startFs() >= prevStart, "packets out of time order at " + w.startFs());
            prevStart = w.startFs();
        }
        String header = DsiBurstTest.file(h, "dut-init.h");
        Files.writeString(dir.resolve("dut-init.h"), header);
        Files.copy(Path.of("src", "test", "c", "replay_tx.c"), dir.resolve("replay_tx.c"));
        ExternalTool.run(dir, Duration.ofSeconds(60), List.of(gcc.toString(), "-std=c99", "-Wall", "-Wextra", "-Werror", "-o", "replay_tx",
                "replay_tx.c"));
        List<String> out = ExternalTool.run(dir, Duration.ofSeconds(60), List.of(dir.resolve("replay_tx").toString())).lines().toList();
        int sep = out.indexOf("--");
        assertTrue(sep > 0, out::toString);
        List<Replayed> init = out.subList(0, sep).stream().map(Replayed::parse).toList();
        List<Replayed> window = out.subList(sep + 1, sep + 3).stream().map(Replayed::parse).toList();

        // loop 1: bytes equal the captured packets, mode kept
        assertEquals(INIT.size(), init.size(), header);
        for (int i = 0; i < INIT.size(); i++) {
            assertEquals(HexFormat.of().formatHex(INIT.get(i).packet()), HexFormat.of().formatHex(init.get(i).packet()), "record " + i);
            assertEquals(INIT.get(i).mode(), init.get(i).mode(), "record " + i);
        }
        assertEquals(HexFormat.of().formatHex(RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2A, 0, 0, 0, DsiBurstTest.W - 1))),
                HexFormat.of().formatHex(window.get(0).packet()));
        assertEquals(HexFormat.of().formatHex(RefCodes.longPacket(0, 0x39, RefCodes.bytes(0x2B, 0, 0, 0, DsiBurstTest.H - 1))),
                HexFormat.of().formatHex(window.get(1).packet()));
        assertEquals("config 2 500000000 24 0", out.get(sep + 3));
        int frameBytes = DsiBurstTest.W * DsiBurstTest.H * 3;
        assertEquals("frames 2 " + frameBytes + " 2", out.get(sep + 4));

        // the folded memory write describes the whole frame, as its payloadBytes does
        JsonValue write = JsonScan.parse("dut-commands.json", DsiBurstTest.file(h, "dut-commands.json")).get("initSequence").elements()
                .stream().filter(e -> e.get("name").asString().equals("write_memory_start")).findFirst().orElseThrow();
        assertEquals(frameBytes, write.get("payloadBytes").asDouble());
        assertEquals(frameBytes + " bytes of pixel data in 2 packets", write.get("meaning").asString());

        // waits: the measured gap rounded up to whole microseconds, never shorter
        JsonValue log = JsonScan.parse("dut-commands.json", DsiBurstTest.file(h, "dut-commands.json")).get("commands");
        List<JsonValue> cmds = log.elements();
        for (int i = 0; i < INIT.size(); i++) {
            JsonValue d = cmds.get(i).get("delayToNextMs");
            double measuredUs = d.asDouble() * 1000;
            long w = init.get(i).waitUs();
            assertTrue(w >= measuredUs - 1e-3 && w < measuredUs + 1 + 1e-3, "record " + i + ": wait " + w + " us for " + measuredUs + " us");
        }
        // the 12.4 us gap after exit_sleep_mode (plus the LP exit and HS entry around it) is kept
        assertTrue(init.get(1).waitUs() >= 13 && init.get(1).waitUs() <= 14, "exit_sleep_mode wait " + init.get(1).waitUs());
        assertTrue(header.contains("exit_sleep_mode, lp short DCS, then wait " + init.get(1).waitUs() + " us"), header);
        assertTrue(header.contains("generic-0xE0, hs long generic, vc 2"), header);

        // loop 2: the replayed packets as a two-lane capture decode to the same command log
        LinkSynth again = new LinkSynth(2);
        again.idle(US);
        List<Replayed> all = new ArrayList<>(init);
        all.addAll(window);
        List<byte[]> burst = new ArrayList<>();
        for (int i = 0; i < all.size(); i++) {
            Replayed r = all.get(i);
            if (r.mode().equals("lp")) {
                again.lpdt(r.packet());
                again.idle(Math.max(1, r.waitUs()) * US);
                continue;
            }
            burst.add(r.packet());
            boolean nextJoins = r.waitUs() == 0 && i + 1 < all.size() && all.get(i + 1).mode().equals("hs");
            if (!nextJoins) {
                again.hs(RefCodes.cat(burst.toArray(new byte[0][])));
                burst.clear();
                again.idle(Math.max(1, r.waitUs()) * US);
            }
        }
        StageHarness h2 = DsiBurstTest.run(again, 65536, false);
        assertEquals(List.of(), DsiBurstTest.problems(h2));
        List<JsonValue> cmds2 = JsonScan.parse("replay", DsiBurstTest.file(h2, "dut-commands.json")).get("commands").elements();
        assertEquals(all.size(), cmds2.size());
        for (int i = 0; i < all.size(); i++) {
            for (String k : List.of("mode", "vc", "dataType", "command", "name", "params")) {
                assertEquals(cmds.get(i).get(k), cmds2.get(i).get(k), "command " + i + " " + k);
            }
            if (i < INIT.size() - 1) {
                double before = cmds.get(i).get("delayToNextMs").asDouble();
                double after = cmds2.get(i).get("delayToNextMs").asDouble();
                assertTrue(after >= before, String.format(Locale.ROOT, "command %d: replay gap %.6f ms < captured %.6f ms", i, after, before));
            }
        }
    }

    @Test
    void waitsRoundUpToWholeMicroseconds() {
        assertEquals(0, InitHeader.replayWaitUs(0));
        assertEquals(1, InitHeader.replayWaitUs(1));
        assertEquals(12, InitHeader.replayWaitUs(12 * US));
        assertEquals(13, InitHeader.replayWaitUs(12 * US + 1));
        assertEquals(13, InitHeader.replayWaitUs(12_400 * NS));
        assertEquals(InitHeader.MAX_WAIT_US, InitHeader.replayWaitUs(Long.MAX_VALUE));
    }
}
