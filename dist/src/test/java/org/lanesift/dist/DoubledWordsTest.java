package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import org.junit.jupiter.api.Test;

/** The rule itself: it finds the doubled names the demo once wrote and passes the ones it writes now. */
class DoubledWordsTest {
    @Test
    void findsAWordFollowedByItselfOrByAWordItBegins() {
        assertEquals("eye eye", DoubledWords.find("pixel/eye-eye.png"));
        assertEquals("jitter jitter", DoubledWords.find("jitter-jitter.json"));
        assertEquals("ring ringing", DoubledWords.find("ring-ringing.json"));
        assertEquals("edges edges", DoubledWords.find("edges-edges.png"));
        assertEquals("edge edges", DoubledWords.find("D0_edge-edges.json"));
        assertEquals("eye eye", DoubledWords.find("eye eye diagram"));
    }

    @Test
    void passesNamesThatSayTheSignalAndTheMeasurementOnce() {
        for (String ok : new String[] {"pixel/d0-eye.png", "d1-edges.json", "clk-p-ringing.json", "clk-jitter.json",
            "clk-bathtub.png", "panel-frame-0000-partial.png", "rx-D0-levels.json", "captures/pixel-link.bin.json",
            "packet/dsi-init.h", "eye diagram of D0 (P-N)"}) {
            assertNull(DoubledWords.find(ok), ok);
        }
    }
}
