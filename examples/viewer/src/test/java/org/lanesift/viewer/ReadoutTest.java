package org.lanesift.viewer;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;

class ReadoutTest {
    @Test
    void analogValuesAreInterpolatedBetweenSamples() {
        // samples 0 V, 1 V, -1 V at 1 ns from 10 ns
        AnalogTrace a = AnalogTrace.of("P", 10_000_000, 1_000_000, new float[] {0f, 1f, -1f}, 3);
        Row r = new Row("P", a, null, null, 1, null);
        assertEquals("0.2500 V", Readout.valueOf(r, 10_250_000));
        assertEquals("0.0000 V", Readout.valueOf(r, 11_500_000));
        assertEquals("-1.0000 V", Readout.valueOf(r, 12_000_000));
        assertEquals("-", Readout.valueOf(r, 9_000_000));
        assertEquals("-", Readout.valueOf(r, 12_000_001));
    }

    @Test
    void logicLevelsFollowTheEdges() {
        LogicTrace l = new LogicTrace("CLK", 0, 100, true, new long[] {10, 20, 20, 30}, 4);
        Row r = new Row("CLK", null, l, null, 1, null);
        assertEquals("1", Readout.valueOf(r, 5));
        assertEquals("0", Readout.valueOf(r, 10));
        assertEquals("0", Readout.valueOf(r, 25), "two edges at 20 fs cancel");
        assertEquals("1", Readout.valueOf(r, 99));
        assertEquals("-", Readout.valueOf(r, 100));
    }

    @Test
    void noteRowsReadTheLabelUnderTheCursor() {
        NoteTrack t = new NoteTrack("p", List.of(
                Annotation.on("p", "packet").span(100, 200).label("long packet").severity(Severity.INFO).build(),
                Annotation.on("p", "crc").span(150, 150).label("crc bad").severity(Severity.ERROR).build()));
        Row r = new Row("p", null, null, t, 1, null);
        assertEquals("long packet", Readout.valueOf(r, 120));
        assertEquals("-", Readout.valueOf(r, 200));
        assertEquals("-", Readout.valueOf(r, 99));
    }

    @Test
    void theTimeLineGivesTheDifferenceAndItsInverse() {
        // 20 ns apart is 50 MHz: f = 1 / T
        assertEquals("t 1.020 us   dt 20.00 ns   1/dt 50.00 MHz", Readout.timeLine(1_020_000_000, 1_000_000_000));
        assertEquals("t 1.020 us", Readout.timeLine(1_020_000_000, Double.NaN));
    }

    @Test
    void ticksFarFromTheOriginStillReadApart() {
        // 290.2 us + 0.2 ns steps: one more decimal than the step's size in the time's unit needs
        assertEquals("290.2000 us", Readout.time(290_200_000_000.0, 200_000));
        assertEquals("290.2002 us", Readout.time(290_200_200_000.0, 200_000));
        assertEquals("290.200 us", Readout.time(290_200_000_000.0, 1_000_000));
        assertEquals("0 fs", Readout.time(0, 1_000_000));
        assertEquals("5 ns", Readout.time(5_000_000, 1_000_000));
        assertEquals("-1.5 ns", Readout.time(-1_500_000, 100_000));
    }
}
