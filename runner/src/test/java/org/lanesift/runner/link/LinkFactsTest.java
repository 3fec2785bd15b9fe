package org.lanesift.runner.link;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.runner.capture.InspectReport;

class LinkFactsTest {
    static InspectReport report(int dataPairs, double legMin, double legMax) {
        List<InspectReport.Channel> ch = new ArrayList<>();
        List<LinkChains.Pair> pairs = pairs(dataPairs);
        for (LinkChains.Pair p : pairs) {
            ch.add(LinkPairsTest.analog(p.p(), legMin, legMax));
            ch.add(LinkPairsTest.analog(p.n(), legMin, legMax));
        }
        return new InspectReport("c.bin", "raw", ch, List.of(), List.of(new InspectReport.Clock("C_P", 35e6, 0.001, "C_N")));
    }

    static List<LinkChains.Pair> pairs(int dataPairs) {
        List<LinkChains.Pair> pairs = new ArrayList<>(List.of(new LinkChains.Pair("C", "C_P", "C_N")));
        for (int k = 0; k < dataPairs; k++) {
            pairs.add(new LinkChains.Pair("D" + k, "D" + k + "_P", "D" + k + "_N"));
        }
        return pairs;
    }

    @Test
    void pixelLinkUnitIntervalIsTheClockPeriodOverSevenAndTheMappingFollowsTheLaneCount() {
        // LVDS legs around 1.2 V never reach the D-PHY low-power low level: a pixel link
        LinkFacts three = LinkFacts.of(report(3, 1.0, 1.4), pairs(3), "auto");
        assertFalse(three.packet());
        // Source: docs/reference-facts.md#pixel-link-clock-and-slot-mappings: seven slots per clock
        assertEquals(1e15 / 35e6 / 7, three.unitIntervalFs(), 1e-6);
        assertEquals("bits-18", three.mapping());
        assertEquals("", three.mappingAlso());
        LinkFacts four = LinkFacts.of(report(4, 1.0, 1.4), pairs(4), "auto");
        assertEquals("vesa-24", four.mapping());
        assertEquals("jeida-24", four.mappingAlso());
        InputFormatException e = assertThrows(InputFormatException.class, () -> LinkFacts.of(report(2, 1.0, 1.4), pairs(2), "pixel"));
        assertTrue(e.getMessage().contains("3 data pairs (18-bit) or 4 (24-bit), found 2"), e.getMessage());
    }

    @Test
    void packetLinkIsRecognisedByItsLowPowerLevelsAndItsUnitIntervalIsHalfTheClockPeriod() {
        // Source: docs/reference-facts.md#d-phy-levels-and-states: LP high above 880 mV, LP low below 550 mV
        LinkFacts f = LinkFacts.of(report(2, 0.0, 1.2), pairs(2), "auto");
        assertTrue(f.packet());
        assertTrue(f.kindSource().text().startsWith("measured: D0_P"), f.kindSource().text());
        assertEquals(1e15 / 35e6 / 2, f.unitIntervalFs(), 1e-6);
        assertFalse(LinkFacts.of(report(3, 0.0, 1.2), pairs(3), "pixel").packet());
    }
}
