package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * Cautions where the voltage is: above extra-low voltage the divider calculator says the circuit is
 * hazardous and that a rated probe is the right tool, and it never offers a tip level beyond what the
 * parts can be assumed to withstand. Source of the limits: IEC 61140 / IEC 60449 voltage bands,
 * extra-low voltage at most 50 V AC RMS or 120 V ripple-free DC (from memory).
 */
class ProbeHazardTest {
    private static final Pattern HIGHEST = Pattern.compile("highest tip level\\s+([0-9.e+]+) V RMS");

    private static double highest(String out) {
        Matcher m = HIGHEST.matcher(out);
        assertTrue(m.find(), out);
        return Double.parseDouble(m.group(1));
    }

    @Test
    void threeHundredVoltsOnAHomeMadeDividerIsHazardousAndOverTheResistorsWorkingVoltage() {
        ProbeToolTest.Run r = ProbeToolTest.run("divider", "--ratio", "1000", "--resistor-watts", "5", "--level", "300");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("HAZARDOUS: 300 V RMS is above extra-low voltage (50 V AC RMS, 120 V DC)"), r.out());
        assertTrue(r.out().contains(ProbeTool.HAZARD), r.out());
        assertTrue(r.out().contains("a probe rated for the voltage and the category"), r.out());
        // 300 V over 49.95 kohm + 50 ohm: the resistor takes 299.7 V, above its assumed 200 V working voltage
        assertTrue(r.out().contains("OVER LIMIT: resistor working voltage 299.7 V RMS exceeds 200 V RMS"), r.out());
    }

    @Test
    void aHighImpedanceInputNoLongerYieldsKilovoltTipLimits() {
        // 1000:1 into 1 Mohm: R = 999 Mohm; only its working voltage bounds the tip, at 200 x 1e9 / 999e6 = 200.2 V
        ProbeToolTest.Run r = ProbeToolTest.run("divider", "--ratio", "1000", "--input-ohms", "1M");
        assertEquals(0, r.code(), r.err());
        double tip = highest(r.out());
        assertTrue(tip <= 200.5 && tip >= 199.5, r.out());
        assertTrue(r.out().contains(ProbeTool.HAZARD), "a tip level above 50 V RMS comes with the hazard block: " + r.out());
    }

    @Test
    void extraLowVoltageWorkIsNotFlagged() {
        ProbeToolTest.Run tenToOne = ProbeToolTest.run("divider", "--ratio", "10");
        assertFalse(tenToOne.out().contains("HAZARDOUS"), tenToOne.out());
        assertTrue(highest(tenToOne.out()) <= ProbeTool.EXTRA_LOW_VOLTAGE_AC_RMS, tenToOne.out());
        ProbeToolTest.Run at50 = ProbeToolTest.run("divider", "--resistor", "4.5k", "--resistor-watts", "25", "--level", "50");
        assertFalse(at50.out().contains("HAZARDOUS:"), at50.out());
        ProbeToolTest.Run at51 = ProbeToolTest.run("divider", "--resistor", "4.5k", "--resistor-watts", "25", "--level", "51");
        assertTrue(at51.out().contains("HAZARDOUS: 51 V RMS"), at51.out());
    }

    @Test
    void theHighestTipLevelIsTheLowestOfTheLimits() {
        for (String[] args : new String[][] {{"divider", "--ratio", "10"}, {"divider", "--ratio", "100", "--resistor-watts", "2"},
            {"divider", "--resistor", "10M", "--resistor-max-volts", "1k", "--input-ohms", "1M"}}) {
            ProbeToolTest.Run r = ProbeToolTest.run(args);
            Matcher m = Pattern.compile("tip limits\\s+scope input reaches \\S+ V RMS at (\\S+) V RMS and \\S+ W at (\\S+) V RMS at the tip; "
                    + "the resistor reaches half its \\S+ W at (\\S+) V RMS and its \\S+ V working voltage at (\\S+) V RMS").matcher(r.out());
            assertTrue(m.find(), r.out());
            double min = Double.MAX_VALUE;
            for (int g = 1; g <= 4; g++) {
                min = Math.min(min, Double.parseDouble(m.group(g)));
            }
            assertEquals(min, highest(r.out()), 1e-9 + 1e-3 * min, r.out());
        }
    }
}
