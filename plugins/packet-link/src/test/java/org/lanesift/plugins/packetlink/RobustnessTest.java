package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.WordStream;
import org.lanesift.testkit.StageHarness;

/** Unknown types, oversized bursts and a double-bit header error on the invented one-lane link. */
class RobustnessTest {
    @Test
    void unknownTypeKeptRaw() {
        LinkSynth s = new LinkSynth(1).idle(1_000_000_000L);
        byte[] reserved = RefCodes.shortPacket(2, 0x10, 0xAB, 0xCD);
        s.hs(RefCodes.cat(reserved, RefCodes.shortPacket(0, 0x05, 0x28, 0x00))).idle(1_000_000_000L);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 1));
        s.feed(h, 512, false);
        Annotation p = h.annotations("packet").get(0);
        assertEquals("reserved-0x10", p.fields().get("dataType").value());
        assertEquals(2L, p.fields().get("vc").value());
        assertArrayEquals(reserved, (byte[]) p.fields().get("raw").value());
        assertEquals("set_display_off", h.annotations("command").get(0).fields().get("name").value());
    }

    @Test
    void oversizedBurstIsCutAndReported() {
        LinkSynth s = new LinkSynth(1).idle(1_000_000_000L);
        s.hs(RefCodes.longPacket(0, 0x39, new byte[200])).idle(1_000_000_000L);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 1, "maxBurstBytes", 64));
        s.feed(h, 512, false);
        assertEquals(1, h.annotations("burst-too-long").size());
        assertEquals(Severity.ERROR, h.annotations("burst-too-long").get(0).severity());
        assertEquals(1, h.annotations("packet-truncated").size());
        WordStream w = h.outputs("packets", WordStream.class).get(0);
        assertEquals(64, w.count());
        assertTrue((w.flags()[10] & DsiDecoder.FLAG_UNPARSED) != 0);
    }

    @Test
    void doubleHeaderErrorStopsTheBurstOnly() {
        LinkSynth s = new LinkSynth(1).idle(1_000_000_000L);
        byte[] a = RefCodes.cat(RefCodes.shortPacket(0, 0x05, 0x11, 0x00), RefCodes.shortPacket(0, 0x05, 0x29, 0x00));
        a[4] ^= 0x21; // two bits of the second header
        s.hs(a).idle(1_000_000_000L);
        s.hs(RefCodes.shortPacket(0, 0x05, 0x13, 0x00)).idle(1_000_000_000L);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 1));
        s.feed(h, 512, false);
        assertEquals(1, h.annotations("ecc-uncorrectable").size());
        assertEquals(List.of("exit_sleep_mode", "enter_normal_mode"),
                h.annotations("command").stream().map(x -> x.fields().get("name").value()).toList());
    }
}
