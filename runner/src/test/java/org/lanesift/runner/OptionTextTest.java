package org.lanesift.runner;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.time.TimeValue;

/** The report's option values: as given, or the default in engineering units; never NaN or a unit glued to its number. */
class OptionTextTest {
    private static final OptionSpec VOLTS = OptionSpec.number("thresholdVolts", "V", Double.NaN, -10.0, 10.0, "t");
    private static final OptionSpec FRACTION = OptionSpec.number("hysteresisFraction", "", 0.1, 0.0, 0.9, "h");
    private static final OptionSpec SPAN = OptionSpec.time("adaptTimeConstant", TimeValue.Unit.SAMPLES, "1000000samples", "a");

    @Test
    void givenValuesAreWrittenAsTheUserGaveThem() {
        assertEquals("0.55 V", RunCommand.optionText(VOLTS, 0.55, 0.55));
        assertEquals("2 V", RunCommand.optionText(VOLTS, 2.0, 2.0));
        assertEquals("2ns", RunCommand.optionText(SPAN, "2ns", "2ns"));
    }

    @Test
    void defaultsAreReadable() {
        assertEquals("unset", RunCommand.optionText(VOLTS, null, Double.NaN));
        assertEquals("880.0 mV", RunCommand.optionText(VOLTS, null, 0.88));
        assertEquals("0 V", RunCommand.optionText(VOLTS, null, 0.0));
        assertEquals("0.1", RunCommand.optionText(FRACTION, null, 0.1));
        assertEquals("1000000 samples", RunCommand.optionText(SPAN, null, "1000000samples"));
        assertEquals("0 UI", RunCommand.optionText(SPAN, null, "0UI"));
    }
}
