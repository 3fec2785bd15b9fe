package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.report.Source;

/** report.md shows after each finding where its numbers come from (issue 17 item 8). */
class FindingSourceTest {
    private static final String LVDS = Source.standard("ANSI/TIA/EIA-644-A, values from memory", "lvds-electrical-levels").text();

    @Test
    void aCheckedValueIsMeasuredAndItsLimitCitesTheStandard() {
        Annotation a = Annotation.on("CLK.levels", "level-check").span(0, 10).label("vod-high 353.4 mV, limit 247 to 454 mV")
                .number("valueVolts", 0.3534, "V").number("minVolts", 0.247, "V").text("source", LVDS).build();
        assertEquals("measured; limit standard: ANSI/TIA/EIA-644-A, values from memory (docs/reference-facts.md#lvds-electrical-levels)",
                FindingSource.of(a));
        assertTrue(FindingSource.isStandard(LVDS));
    }

    @Test
    void aGivenValueSaysSoAndIsNoCitedLimit() {
        String given = Source.given("the offsetsFile skew table, method legs-xcorr").text();
        Annotation a = Annotation.on("D0_N", "skew-applied").span(0, 0).label("offset +37.019 ps")
                .number("offsetPs", 37.019, "ps").text("source", given).build();
        assertEquals(given, FindingSource.of(a));
        assertFalse(FindingSource.isStandard(given));
        assertTrue(FindingSource.isStandard("MIPI D-PHY (docs/reference-facts.md#d-phy-levels-and-states)"), "a plain citation counts as a standard");
    }

    @Test
    void aNumberWithoutASourceIsMeasuredAnEventShowsNone() {
        Annotation eye = Annotation.on("d0", "eye-opening").span(0, 0).label("eye 666 mV x 7076 ps").number("eyeHeightMv", 666, "mV")
                .build();
        assertEquals("measured", FindingSource.of(eye));
        Annotation frame = Annotation.on("panel", "frame").span(0, 0).label("frame 1").text("state", "complete").build();
        assertEquals("", FindingSource.of(frame));
        Annotation counts = Annotation.on("legs", "kernel-margin").span(0, 0).label("the first 8 samples are not produced")
                .number("startSamples", 8, "").build();
        assertEquals("", FindingSource.of(counts), "a count is no measurement");
    }
}
