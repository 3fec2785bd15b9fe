package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class CableDelayTest {

    /** The speed of light c = 299 792 458 m/s exactly (SI Brochure, 9th edition, BIPM 2019, definition of the metre). */
    @Test
    void vacuumDelayFollowsTheSiSpeedOfLight() {
        assertEquals(1.0 / 299_792_458.0, CableDelay.secondsPerMetre(1.0), 1e-24);
        assertEquals(3.3356409519815204e-9, CableDelay.delaySeconds(1.0, 1.0), 1e-21); // 1 m / c
    }

    /** Solid polyethylene coax: velocity factor about 0.66, about 5.05 ns per metre (common practice). */
    @Test
    void solidPolyethyleneCoaxIsAboutFiveNanosecondsPerMetre() {
        assertEquals(5.05e-9, CableDelay.delaySeconds(1.0), 0.01e-9);
        assertEquals(5.05e-9, CableDelay.secondsPerMetre(CableDelay.SOLID_PE_VELOCITY_FACTOR), 0.01e-9);
        // 10 cm of extra cable is about 505 ps
        assertEquals(505.4, CableDelay.delayPs(0.10, 0.66), 0.1);
        assertEquals(-505.4, CableDelay.delayPs(-0.10, 0.66), 0.1);
    }

    /** A 100 MHz double-data-rate link carries 200 Mbit/s per lane: UI = 5 ns, so 10 cm of coax is about a tenth of it. */
    @Test
    void fractionOfAUnitInterval() {
        assertEquals(0.1011, CableDelay.fractionOfUnitInterval(0.10, 0.66, 200e6), 0.0001);
        assertEquals(0.5, CableDelay.fractionOfUnitInterval(2.5e-9, 200e6), 1e-12);
    }

    @Test
    void badArgumentsAreRejectedWithTheReason() {
        assertEquals("velocity factor must be greater than 0 and at most 1, got 1.5",
                assertThrows(IllegalArgumentException.class, () -> CableDelay.delaySeconds(1, 1.5)).getMessage());
        assertThrows(IllegalArgumentException.class, () -> CableDelay.fractionOfUnitInterval(1e-9, 0));
        assertThrows(IllegalArgumentException.class, () -> CableDelay.delaySeconds(Double.NaN, 0.66));
    }
}
