package org.lanesift.plugin;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.time.TimeValue;

class OptionsTest {
    static final PluginDescriptor D = PluginDescriptor.builder("rx")
            .option(OptionSpec.number("thresholdVolts", "V", 0.0, -2.0, 2.0, "comparator threshold"))
            .option(OptionSpec.integer("lanes", 3L, 1, 16, "data lanes"))
            .option(OptionSpec.bool("invert", false, "swap polarity"))
            .option(OptionSpec.choice("mode", "ddr", "sampling mode", "ddr", "rising", "falling"))
            .option(OptionSpec.time("phase", TimeValue.Unit.PS, "0ps", "sample phase"))
            .option(OptionSpec.numbers("offsets", "ps", "per-channel offsets"))
            .option(OptionSpec.text("file", null, "capture file"))
            .build();

    @Test
    void defaultsAndTypedValues() {
        OptionValues v = OptionValues.validate(D, Map.of("file", "x.csv", "lanes", "4", "phase", "0.25UI",
                "offsets", List.of(10, -20.5), "invert", true));
        assertEquals(0.0, v.getDouble("thresholdVolts"));
        assertEquals(4, v.getInt("lanes"));
        assertEquals(true, v.getBoolean("invert"));
        assertEquals("ddr", v.getString("mode"));
        assertEquals(new TimeValue(0.25, TimeValue.Unit.UI), v.getTime("phase"));
        assertEquals(List.of(10.0, -20.5), v.getNumbers("offsets"));
        assertEquals(List.of(1.0, 2.0), OptionValues.validate(D, Map.of("file", "f", "offsets", "1, 2")).getNumbers("offsets"));
    }

    @Test
    void errorsNameTheOptionAndTheAllowedRange() {
        OptionException e = assertThrows(OptionException.class,
                () -> OptionValues.validate(D, Map.of("file", "f", "thresholdVolts", 5)));
        assertEquals("thresholdVolts", e.option());
        assertTrue(e.getMessage().contains("'rx'") && e.getMessage().contains("-2 to 2 V"), e.getMessage());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of("file", "f", "lanes", "many")));
        assertTrue(e.getMessage().contains("an integer in 1 to 16"), e.getMessage());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of("file", "f", "mode", "both")));
        assertTrue(e.getMessage().contains("ddr, rising, falling"), e.getMessage());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of("file", "f", "treshold", 1)));
        assertTrue(e.getMessage().contains("no option 'treshold'") && e.getMessage().contains("thresholdVolts"), e.getMessage());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of()));
        assertEquals("file", e.option());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of("file", "f", "invert", "yes")));
        assertTrue(e.getMessage().contains("true or false"), e.getMessage());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of("file", "f", "phase", "soon")));
        assertEquals("phase", e.option());
        e = assertThrows(OptionException.class, () -> OptionValues.validate(D, Map.of("file", "f", "thresholdVolts", "NaN")));
        assertEquals("thresholdVolts", e.option());
    }

    @Test
    void descriptorRejectsBadNames() {
        assertThrows(IllegalArgumentException.class, () -> PluginDescriptor.builder("Bad Id"));
        assertThrows(IllegalArgumentException.class, () -> PortSpec.of("a.b", org.lanesift.data.DataKind.EDGES, ""));
        assertThrows(IllegalArgumentException.class, () -> PluginDescriptor.builder("x")
                .option(OptionSpec.bool("a", true, "")).option(OptionSpec.bool("a", true, "")));
    }
}
