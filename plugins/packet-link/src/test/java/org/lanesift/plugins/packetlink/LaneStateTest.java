package org.lanesift.plugins.packetlink;

import org.lanesift.kit.LineState;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * Line-state sequences (MIPI D-PHY, from memory): high-speed entry LP-11, LP-01, LP-00; escape
 * entry LP-11, LP-10, LP-00, LP-01, LP-00; turnaround LP-11, LP-10, LP-00, LP-10, LP-00.
 */
class LaneStateTest {
    static StageHarness run(LinkSynth s) {
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 1));
        s.feed(h, 1000, false);
        return h;
    }

    @Test
    void wrongEntryTurnaroundAndUltraLowPower() {
        LinkSynth s = new LinkSynth(1);
        s.idle(1_000_000_000L);
        // straight from LP-11 through LP-00 into high speed: entry not as specified
        s.states(0, LineState.LP00, LineState.HS, LineState.LP11);
        s.idle(1_000_000_000L);
        s.states(0, LineState.LP10, LineState.LP00, LineState.LP10, LineState.LP00, LineState.LP11);
        s.idle(1_000_000_000L);
        // escape entry, then the ultra-low-power command 00011110 as spaced one-hot marks, exit
        s.states(0, LineState.LP10, LineState.LP00, LineState.LP01, LineState.LP00);
        for (int j = 7; j >= 0; j--) {
            s.states(0, (LaneStateTracker.ESC_ULPS >> j & 1) != 0 ? LineState.LP10 : LineState.LP01, LineState.LP00);
        }
        s.states(0, LineState.LP10, LineState.LP11);
        s.idle(1_000_000_000L);
        StageHarness h = run(s);
        List<Annotation> bad = h.annotations("hs-entry-bad");
        assertEquals(1, bad.size());
        assertEquals("LP-11, LP-00", bad.get(0).fields().get("sequence").value());
        assertEquals(Severity.WARNING, bad.get(0).severity());
        assertEquals(1, h.annotations("turnaround-request").size());
        assertEquals(1, h.annotations("escape-entry").size());
        Annotation esc = h.annotations("escape-command").get(0);
        assertEquals("ultra-low-power", esc.fields().get("command").value());
        assertEquals(0L, esc.fields().get("dataBits").value());
        // the high-speed interval had no bits at all: reported, nothing decoded
        assertEquals(1, h.annotations("hs-sync-missing").size());
        assertEquals(0, h.annotations("packet").size());
    }

    // Slow low-power edges (25 ns ramps) and noise: the transient high-speed-looking levels while
    // a leg falls through 0.14..0.55 V are shorter than minStateTime and must not count.
    @Test
    void slowEdgesDoNotFakeStates() {
        LinkSynth s = new LinkSynth(1);
        s.edgeFs = 25_000_000L;
        s.noiseVolts = 0.02;
        s.idle(1_000_000_000L);
        s.hs(RefCodes.shortPacket(0, 0x05, 0x11, 0x00));
        s.idle(1_000_000_000L);
        StageHarness h = run(s);
        assertEquals(List.of(), DsiBurstTest.problems(h));
        assertEquals(List.of("LP-11", "LP-01", "LP-00", "HS", "LP-11"),
                h.annotations("lane-state").stream().map(Annotation::label).toList());
        assertEquals("exit_sleep_mode", h.annotations("command").get(0).fields().get("name").value());
    }

    // Analog pieces of irregular sizes from the testkit's Synth.split give the same result.
    @Test
    void testkitSplitPieces() {
        LinkSynth s = DsiBurstTest.scenario(DsiBurstTest.settingsBurst());
        StageHarness ref = DsiBurstTest.run(s, 1 << 20, false);
        StageHarness h = StageHarness.of(new PacketLinkPlugin(), Map.of("lanes", 2));
        for (int k = 0; k < 2; k++) {
            h.push("bits" + k, s.bits(k));
        }
        List<List<AnalogBlock>> pieces = new java.util.ArrayList<>();
        for (int k = 0; k < 2; k++) {
            float[][] legs = s.legs(k);
            pieces.add(Synth.split(AnalogBlock.of("p", 0, LinkSynth.SAMPLE_FS, legs[0]), 5000, 3, 70001));
            pieces.add(Synth.split(AnalogBlock.of("n", 0, LinkSynth.SAMPLE_FS, legs[1]), 7, 33333));
        }
        int[] pos = new int[4];
        boolean more = true;
        while (more) {
            more = false;
            for (int i = 0; i < 4; i++) {
                if (pos[i] < pieces.get(i).size()) {
                    h.push("lane" + (i / 2) + (i % 2 == 0 ? "p" : "n"), pieces.get(i).get(pos[i]++));
                    more = true;
                }
            }
        }
        h.finish();
        assertEquals(DsiBurstTest.byTrack(ref), DsiBurstTest.byTrack(h));
        assertTrue(h.annotations("command").size() == 20);
    }
}
