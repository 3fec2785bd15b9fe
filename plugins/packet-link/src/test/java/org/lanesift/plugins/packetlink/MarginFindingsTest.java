package org.lanesift.plugins.packetlink;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.testkit.StageHarness;

/**
 * Timing margins are checked only inside high-speed bursts: the bits a sampler on a running
 * clock flags between bursts (the LP-11 to LP-01 transition lands at any clock phase) give no
 * finding, and a run of flagged bits inside a burst gives exactly one {@code margin-low} warning
 * naming its lane, at the time of its first bit, however the input is cut into blocks.
 */
class MarginFindingsTest {
    static final long US = 1_000_000_000L;

    private static LinkSynth link(boolean faultInBurst) {
        LinkSynth s = new LinkSynth(2);
        s.flagAroundBursts = true;
        s.idle(US);
        s.hs(RefCodes.cat(RefCodes.shortPacket(0, 0x05, 0x11, 0x00), RefCodes.shortPacket(0, 0x05, 0x29, 0x00)));
        s.idle(US);
        s.hs(RefCodes.longPacket(0, 0x39, RefCodes.bytes(0xB0, 1, 2, 3, 4, 5, 6, 7, 8, 9)));
        if (faultInBurst) {
            // three bits of lane 1, starting 10 bits after the sync byte of the second burst
            long from = s.lastHsStartFs() + (24 + 8 + 10) * LinkSynth.UI_FS;
            s.flagBits(1, from, from + 3 * LinkSynth.UI_FS);
        }
        s.idle(US);
        return s;
    }

    /**
     * The margin findings; besides them only information, and {@code suspect} packets and as many
     * commands marked suspect (the decode of the flagged bits, not a second finding of the fault).
     */
    private static List<Annotation> marginFindings(LinkSynth s, int blockSamples, int suspectPackets) {
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 2));
        s.feed(h, blockSamples, false);
        int suspect = 0;
        for (Annotation a : h.annotations()) {
            if ((a.kind().equals("packet") || a.kind().equals("command")) && a.severity() == Severity.WARNING) {
                suspect++; // the packet holding the flagged bits, and its command, are marked suspect
            } else if (!a.kind().equals("margin-low")) {
                assertTrue(a.severity() == Severity.INFO, "unexpected finding " + a);
            }
        }
        assertEquals(2 * suspectPackets, suspect, "packets and commands marked suspect");
        return h.annotations("margin-low");
    }

    @Test
    void flagsBetweenBurstsGiveNoFinding() {
        for (int block : new int[] {64, 997, 1 << 20}) {
            assertEquals(List.of(), marginFindings(link(false), block, 0), "blocks of " + block);
        }
    }

    @Test
    void aRunInsideABurstIsOneFindingNamingItsLane() {
        LinkSynth s = link(true);
        long expectStart = s.lastHsStartFs() + (24 + 8 + 10) * LinkSynth.UI_FS;
        for (int block : new int[] {64, 997, 1 << 20}) {
            List<Annotation> found = marginFindings(link(true), block, 1);
            assertEquals(1, found.size(), "blocks of " + block + ": " + found);
            Annotation a = found.get(0);
            assertEquals(Severity.WARNING, a.severity());
            assertEquals(expectStart, a.startFs(), "blocks of " + block);
            assertEquals(expectStart + 2 * LinkSynth.UI_FS, a.endFs());
            assertEquals("lane1", a.track());
            assertTrue(a.label().startsWith("bits1: 3 flagged bits"), a.label());
            assertEquals(LinkSynth.UI_FS / 20, ((Number) a.fields().get("minHoldFs").value()).doubleValue(), 0.0);
        }
    }
}
