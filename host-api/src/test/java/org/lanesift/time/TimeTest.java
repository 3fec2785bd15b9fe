package org.lanesift.time;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class TimeTest {
    @Test
    void oneHourKeepsFemtosecondResolution() {
        long hour = Femtos.fromSeconds(3600);
        assertEquals(3_600_000_000_000_000_000L, hour);
        // one femtosecond past an hour is still distinct and exact
        assertEquals(hour + 1, Math.addExact(hour, 1L));
        assertTrue(Femtos.MAX_SECONDS > 2 * 3600, "at least two hours either side of the origin");
    }

    @Test
    void periodsAndRates() {
        assertEquals(1e6, Femtos.periodFs(1e9), 0);
        assertEquals(400_000, Femtos.periodFs(2.5e9), 1e-9);
        assertEquals(3e9, Femtos.rateHz(Femtos.periodFs(3e9)), 1e-3);
        assertThrows(IllegalArgumentException.class, () -> Femtos.periodFs(-1));
        assertThrows(IllegalArgumentException.class, () -> Femtos.fromSeconds(1e5));
    }

    @Test
    void formatting() {
        assertEquals("1.250 ns", Femtos.format(1_250_000));
        assertEquals("150.0 ps", Femtos.format(150_000));
        assertEquals("12 fs", Femtos.format(12));
    }

    @Test
    void parsesEveryUnit() {
        assertEquals(150_000, TimeValue.parse("150ps", TimeValue.Unit.NS).toFs(0, 0), 0);
        assertEquals(-1_500_000, TimeValue.parse("-1.5 ns", TimeValue.Unit.PS).toFs(0, 0), 0);
        assertEquals(3 * 400_000.0, TimeValue.parse("3samples", TimeValue.Unit.PS).toFs(400_000, 0), 1e-9);
        assertEquals(0.25 * 5e6, TimeValue.parse("0.25UI", TimeValue.Unit.PS).toFs(0, 5e6), 1e-9);
        assertEquals(42_000, TimeValue.parse("42", TimeValue.Unit.PS).toFs(0, 0), 0);
        assertEquals(2e-3 * Femtos.PER_S, TimeValue.parse("2ms", TimeValue.Unit.PS).toFs(0, 0), 1);
        assertEquals("150ps", TimeValue.parse("150 ps", TimeValue.Unit.NS).toString());
    }

    @Test
    void badTimesNameWhatWasExpected() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> TimeValue.parse("fast", TimeValue.Unit.PS));
        assertTrue(e.getMessage().contains("150ps"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> TimeValue.parse("3 parsecs", TimeValue.Unit.PS));
        assertTrue(e.getMessage().contains("unknown time unit"), e.getMessage());
        assertThrows(IllegalStateException.class, () -> TimeValue.parse("1UI", TimeValue.Unit.PS).toFs(1, Double.NaN));
    }
}
