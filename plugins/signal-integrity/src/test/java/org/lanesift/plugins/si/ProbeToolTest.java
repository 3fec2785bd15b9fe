package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ServiceLoader;
import org.junit.jupiter.api.Test;
import org.lanesift.testkit.ToolHarness;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Tool;

class ProbeToolTest {
    record Run(int code, String out, String err) {
    }

    /**
     * Runs the tool on "SUBJECT --name value ..." (or --name=value) without the command-line host;
     * parsing proper (missing values, unknown options, --help) is tested in dist (ToolCommandsTest).
     */
    static Run run(String... args) {
        ToolHarness h = ToolHarness.of(new ProbeTool());
        int i = 0;
        if (args.length > 0 && !args[0].startsWith("--")) {
            h.command(args[i++]);
        }
        for (; i < args.length; i++) {
            String name = args[i].substring(2);
            int eq = name.indexOf('=');
            if (eq >= 0) {
                h.option(name.substring(0, eq), name.substring(eq + 1));
            } else {
                h.option(name, args[++i]);
            }
        }
        ToolHarness.Result r = h.run();
        return new Run(r.code(), r.out(), r.err());
    }

    @Test
    void dividerFormulasOnHandWorkedCases() {
        // Worked by hand (formulas: common practice, docs/reference-facts.md#probe-and-bench-rules-of-thumb):
        // 10:1 into 50 ohm: R = 50 (10 - 1) = 450 ohm; (450 + 50) / 50 = 10 exactly; loading 500 ohm.
        assertEquals(450, ProbeMath.seriesForRatio(10, 50), 1e-12);
        assertEquals(10, ProbeMath.ratio(450, 50), 1e-12);
        assertEquals(500, ProbeMath.loading(450, 50), 1e-12);
        // E96 453 ohm: ratio 503 / 50 = 10.06; on a 50 ohm source 503 / 553 = 0.90958 -> -9.042 %
        assertEquals(10.06, ProbeMath.ratio(453, 50), 1e-12);
        assertEquals(-0.090416, ProbeMath.amplitudeError(453, 50, 50), 1e-6);
        // 20:1: R = 950; 1 kohm source with 450 ohm: 500 / 1500 = 1/3 -> -66.67 %
        assertEquals(950, ProbeMath.seriesForRatio(20, 50), 1e-12);
        assertEquals(-2.0 / 3, ProbeMath.amplitudeError(450, 50, 1000), 1e-12);
        // 5 V RMS at the tip of 450 ohm + 50 ohm: I = 5 / 500 = 10 mA; 45 mW in R, 5 mW and 0.5 V in the input
        double i = ProbeMath.current(5, 450, 50);
        assertEquals(0.010, i, 1e-15);
        assertEquals(0.045, i * i * 450, 1e-12);
        assertEquals(0.005, i * i * 50, 1e-12);
        // rise: 0.35 / 500 MHz = 700 ps; 1 ns measured: sqrt(1 - 0.49) ns = 714.1 ps
        assertEquals(700e-12, ProbeMath.riseFromBandwidth(500e6), 1e-20);
        assertEquals(Math.sqrt(0.51) * 1e-9, ProbeMath.correctedRise(1e-9, 700e-12), 1e-18);
        assertTrue(Double.isNaN(ProbeMath.correctedRise(600e-12, 700e-12)));
        // lead: 100 mm -> 100 nH; with 10 pF: 1 / (2 pi sqrt(1e-18)) = 1e9 / (2 pi) = 159.15 MHz
        assertEquals(100e-9, ProbeMath.leadInductance(100), 1e-20);
        assertEquals(159.1549e6, ProbeMath.resonance(100e-9, 10e-12), 100);
        // longest lead for 1 GHz with 1 pF: L = 1/((2 pi 1e9)^2 1e-12) = 25.33 nH -> 25.33 mm
        assertEquals(25.33, ProbeMath.longestLead(1e9, 1e-12), 0.01);
    }

    @Test
    void dividerOutputStatesRatioLoadingAssumptionsAndCautions() {
        Run r = run("divider", "--ratio", "10");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("442 ohm gives 9.84:1, 453 ohm gives 10.06:1; nearest: 453 ohm"), r.out());
        assertTrue(r.out().contains("(453 + 50) / 50 = 10.06:1"), r.out());
        assertTrue(r.out().contains("DC loading           503 ohm"), r.out());
        assertTrue(r.out().contains("-9.04 % on a 50 ohm source"), r.out());
        assertTrue(r.out().contains("Assumptions"));
        assertTrue(r.out().contains("from memory: check your instrument"));
        assertTrue(r.out().contains(ProbeTool.CAUTIONS), "cautions with every voltage result");
        assertTrue(r.out().contains("Mains") && r.out().contains("ESD") && r.out().contains("licensed practice"));
        Run e24 = run("divider", "--ratio=10", "--series", "e24");
        assertTrue(e24.out().contains("nearest: 470 ohm") && e24.out().contains("= 10.4:1"), e24.out());
    }

    @Test
    void powerWarningsNearAndOverTheInputRating() {
        // 45 V RMS at the tip of 450 + 50 ohm: the input sees 4.5 V RMS = 90 % of 5 V, and 0.405 W = 81 % of 0.5 W
        Run near = run("divider", "--resistor", "450", "--level", "45V", "--resistor-watts", "25");
        assertTrue(near.out().contains("WARNING: scope input voltage 4.5 V RMS is 90 % of its 5 V RMS rating"), near.out());
        assertTrue(near.out().contains("WARNING: scope input power 0.405 W is 81 % of its 0.5 W rating"), near.out());
        assertFalse(near.out().contains("OVER LIMIT"), near.out());
        Run over = run("divider", "--resistor", "450", "--level", "60");
        assertTrue(over.out().contains("OVER LIMIT: scope input voltage 6 V RMS exceeds 5 V RMS"), over.out());
        assertTrue(over.out().contains("OVER LIMIT: resistor power"), over.out());
        assertTrue(over.out().contains(ProbeTool.CAUTIONS));
        Run low = run("divider", "--resistor", "4.7k", "--level", "1");
        assertFalse(low.out().contains("WARNING") || low.out().contains("OVER LIMIT"), low.out());
        assertTrue(low.out().contains("4.7 kohm (not an E96 value; neighbours 4.64 kohm and 4.75 kohm)"), low.out());
    }

    @Test
    void riseAndLeadResults() {
        Run r = run("rise", "--bandwidth", "500MHz", "--measured", "1ns");
        assertEquals(0, r.code());
        assertTrue(r.out().contains("0.35 / BW = 700 ps"), r.out());
        assertTrue(r.out().contains("= 714.1 ps"), r.out());
        assertTrue(r.out().contains("common practice"));
        Run l = run("lead", "--length", "10cm");
        assertTrue(l.out().contains("about 100 nH") && l.out().contains("159.2 MHz"), l.out());
        assertTrue(l.out().contains("from memory"), l.out());
        Run fast = run("rise", "--bandwidth", "1G", "--measured", "300p");
        assertTrue(fast.out().contains("no correction possible"), fast.out());
    }

    @Test
    void badInputExitsTwoWithOneLine() {
        for (String[] args : new String[][] {
            {}, {"divider"}, {"divider", "--ratio", "ten"}, {"divider", "--ratio", "0.5"},
            {"divider", "--ratio", "10", "--resistor", "450"}, {"divider", "--colour", "red"},
            {"divider", "--ratio", "10", "--series", "E7"}, {"rise"}, {"lead", "--length", "far"},
            {"lead", "--length", "-3mm"}, {"rise", "--bandwidth", "500mhz"}}) {
            Run r = run(args);
            assertEquals(2, r.code(), String.join(" ", args));
            assertEquals(1, r.err().strip().lines().count(), r.err());
            assertEquals("", r.out(), "nothing on stdout for " + String.join(" ", args));
        }
        assertEquals("option '--ratio': expected a number in 1.000001 to 1000000, got 'ten'\n",
                run("divider", "--ratio", "ten").err());
        assertEquals("option '--length': -3mm is outside the allowed range 0.001 to 100000 mm\n", run("lead", "--length", "-3mm").err());
    }

    @Test
    void toolAndPluginsAreDiscoverable() {
        boolean found = false;
        for (Tool t : ServiceLoader.load(Tool.class)) {
            found |= t.name().equals("probe");
        }
        assertTrue(found, "probe tool registered in META-INF/services");
        PluginRegistry reg = PluginRegistry.discover(getClass().getClassLoader());
        for (String id : new String[] {"eye-diagram", "edge-metrics", "ringing", "jitter"}) {
            assertTrue(reg.find(id) != null, id);
        }
    }
}
