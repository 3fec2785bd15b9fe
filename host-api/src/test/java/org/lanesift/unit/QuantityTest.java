package org.lanesift.unit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.time.TimeValue;

/** Values with units and SI prefixes. Source: SI Brochure, 9th edition (BIPM 2019), table 7 (prefixes), from memory. */
class QuantityTest {
    @Test
    void formatChoosesThePrefixThatPutsTheValueBetweenOneAndAThousand() {
        assertEquals("5.714 ns", Quantity.format(40e-9 / 7, "s"));
        assertEquals("350.0 MHz", Quantity.format(3.5e8, "Hz"));
        assertEquals("1.000 GS/s", Quantity.format(999.99e6, "S/s"));
        assertEquals("-120.0 ps", Quantity.format(-120e-12, "s"));
        assertEquals("0.000 V", Quantity.format(0, "V"));
        assertEquals("12.00 us", Quantity.format(12e-6, "s"));
        // what it writes, the parser reads back (to the four digits written)
        for (double v : new double[] {3.3e-15, 2.5e9, 7.1e-10, 47.0, 0.12}) {
            String t = Quantity.format(v, "s").replace(" ", "");
            assertEquals(v, Quantity.parse(t, "s"), Math.abs(v) * 1e-3, t);
        }
    }

    @Test
    void prefixesAndUnitsScaleToTheDeclaredUnit() {
        assertEquals(0.1, Quantity.parse("10cm", "m"));
        assertEquals(0.1, Quantity.parse("100mm", "m"));
        assertEquals(0.1, Quantity.parse("0.1", "m"));
        assertEquals(0.1, Quantity.parse("0.1 m", "m"));
        assertEquals(100.0, Quantity.parse("10cm", "mm"), "a prefixed declared unit: the result is in mm");
        assertEquals(100.0, Quantity.parse("100", "mm"), "a bare number is in the declared unit");
        assertEquals(500e6, Quantity.parse("500MHz", "Hz"));
        assertEquals(2e-9, Quantity.parse("2ns", "s"));
        assertEquals(2000.0, Quantity.parse("2ns", "ps"));
        assertEquals(4700.0, Quantity.parse("4.7k", "ohm"));
        assertEquals(4700.0, Quantity.parse("4.7 k\u03a9", "ohm"));
        assertEquals(450.0, Quantity.parse("450ohm", "ohm"));
        assertEquals(200e6, Quantity.parse("200Mbit/s", "bit/s"));
        assertEquals(-3e-3, Quantity.parse("-3mV", "V"));
        assertEquals(1.5e-3, Quantity.parse("1.5e-3", ""));
    }

    @Test
    void microHasThreeSpellings() {
        for (String mu : new String[] {"u", "\u00b5", "\u03bc"}) {
            assertEquals(1.5e-6, Quantity.parse("1.5" + mu + "s", "s"), 1e-21, mu);
            assertEquals(1500.0, TimeValue.parse("1.5" + mu + "s", TimeValue.Unit.PS).toFs(1, 1) / 1e6, 1e-9, mu);
        }
    }

    @Test
    void prefixesAreCaseSensitiveAndGarbageIsRefusedWithAnExample() {
        assertEquals(1e-3, Quantity.parse("1m", ""));
        assertEquals(1e6, Quantity.parse("1M", ""));
        for (String bad : new String[] {"", "fast", "500mhz", "1x", "1.5 kk", "10 cm m", "NaN", "Infinity", "0x10"}) {
            IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Quantity.parse(bad, "Hz"), bad);
            assertTrue(e.getMessage().contains("such as 500MHz") && e.getMessage().contains("'" + bad + "'"), e.getMessage());
        }
    }

    @Test
    void optionSpecNumbersUseIt() {
        OptionSpec volts = OptionSpec.number("thresholdVolts", "V", 0.0, -2.0, 2.0, "threshold");
        assertEquals(0.05, volts.parse("p", "50mV"));
        assertEquals(0.05, volts.parse("p", 0.05));
        OptionException e = assertThrows(OptionException.class, () -> volts.parse("rx", "3V"));
        assertEquals("option 'thresholdVolts' of plugin 'rx': 3V is outside the allowed range -2 to 2 V", e.getMessage());
        e = assertThrows(OptionException.class, () -> volts.parse("rx", "high"));
        assertEquals("option 'thresholdVolts' of plugin 'rx': expected a number in -2 to 2 V, got 'high'", e.getMessage());
        assertEquals(Map.of("x", 1L).get("x"), OptionSpec.integer("n", 0L, 0, 10, "").convert("1"));
    }

    @Test
    void timesTakeMinutesAndHours() {
        assertEquals(120e15, TimeValue.parse("2min", TimeValue.Unit.S).toFs(1, 1));
        assertEquals(120e15, TimeValue.parse("2m", TimeValue.Unit.S).toFs(1, 1));
        assertEquals(3600e15, TimeValue.parse("1h", TimeValue.Unit.S).toFs(1, 1));
        assertEquals(500e12, TimeValue.parse("500ms", TimeValue.Unit.S).toFs(1, 1));
        assertThrows(IllegalArgumentException.class, () -> TimeValue.parse("2 cs", TimeValue.Unit.S));
    }
}
