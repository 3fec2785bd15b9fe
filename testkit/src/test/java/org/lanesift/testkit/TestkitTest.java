package org.lanesift.testkit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

class TestkitTest {
    /** Sums samples above a threshold; emits a count annotation on finish. */
    static final class Above implements PluginProvider {
        public PluginDescriptor descriptor() {
            return PluginDescriptor.builder("above").option(OptionSpec.number("levelVolts", "V", 0.5, null, null, ""))
                    .input(PortSpec.of("in", DataKind.ANALOG, "")).output(PortSpec.of("out", DataKind.ANALOG, "")).build();
        }

        public Stage open(StageContext ctx) {
            double level = ctx.options().getDouble("levelVolts");
            return new Stage() {
                long n;

                public void accept(int input, Block b) {
                    AnalogBlock a = (AnalogBlock) b;
                    for (int i = 0; i < a.length(); i++) {
                        if (a.volts()[i] > level) {
                            n++;
                        }
                    }
                    ctx.emit(0, a);
                }

                public void finish() {
                    ctx.annotate(Annotation.on("t", "count").label(Long.toString(n)).build());
                }
            };
        }
    }

    @Test
    void harnessRunsOnePluginAlone() {
        AnalogBlock sine = Synth.analog("s", 1e9, 1000, t -> Math.sin(2 * Math.PI * 10e6 * t));
        StageHarness h = StageHarness.of(new Above(), Map.of("levelVolts", 0.0));
        for (AnalogBlock part : Synth.split(sine, 7, 300, 64)) {
            h.push("in", part);
        }
        h.finish();
        assertEquals(1000, h.outputs("out", AnalogBlock.class).stream().mapToInt(AnalogBlock::length).sum());
        // 10 cycles of a sine sampled 100 times per cycle: half the samples strictly positive, minus the zero crossings
        long n = Long.parseLong(h.annotations("count").get(0).label());
        assertEquals(495, n, 5);
        assertThrows(IllegalArgumentException.class, () -> h.push("nope", sine));
        assertThrows(IllegalArgumentException.class, () -> h.outputs("nope"));
    }

    @Test
    void synthBuilders() {
        Edges clk = Synth.clock("clk", 10e6, 0.5, 1_000_000, 3);
        assertEquals(6, clk.count());
        assertEquals(6_000_000, clk.timesFs()[1]);
        Edges d = Synth.nrz("d", new boolean[] {true, true, false, true}, 0, 1e6, false);
        assertEquals(3, d.count());
        List<Edges> parts = Synth.split(d, 1_500_000, 2_500_000);
        assertEquals(3, parts.size());
        assertEquals(true, parts.get(1).initialLevel());
        assertEquals(false, parts.get(2).initialLevel());
        LogicBlock r = Synth.randomLogic("r", 1e9, 200, 1);
        List<LogicBlock> lp = Synth.split(r, 63, 70);
        assertEquals(200, lp.stream().mapToInt(LogicBlock::length).sum());
        assertEquals(r.get(150), lp.get(2).get(150 - 133));
        assertEquals(r.timeFs(133), lp.get(2).startFs());
        AnalogBlock noisy = Synth.withNoise(Synth.analog("z", 1e9, 10000, t -> 0), 0.01, 3);
        double ss = 0;
        for (int i = 0; i < noisy.length(); i++) {
            ss += noisy.volts()[i] * noisy.volts()[i];
        }
        assertEquals(0.01, Math.sqrt(ss / noisy.length()), 0.001);
    }

    @Test
    void pollReturnsOnceTheConditionHoldsAndFailsNamingItOtherwise() throws Exception {
        int[] calls = {0};
        Poll.until(java.time.Duration.ofSeconds(10), "the third check", () -> ++calls[0] >= 3);
        assertEquals(3, calls[0], "returns at the first check that holds, not later");
        AssertionError e = org.junit.jupiter.api.Assertions.assertThrows(AssertionError.class,
                () -> Poll.until(java.time.Duration.ofMillis(30), "a condition that never holds", () -> false));
        assertEquals("waited 30 ms for a condition that never holds; it did not happen", e.getMessage());
    }

    @Test
    void externalToolsAreFoundOnThePath() {
        assertTrue(ExternalTool.find("sh") != null, "every Debian image has sh");
        assertEquals(null, ExternalTool.find("no-such-program-lanesift-test"));
    }

    @Test
    void pythonModulesAreLookedUpInDebiansPython() throws Exception {
        // a module every Python has; where Debian's interpreter exists it is the one returned, even
        // when another python3 (a version manager's) comes first on the PATH
        java.nio.file.Path python = ExternalTool.requirePythonModule("json", "python3");
        if (java.nio.file.Files.isExecutable(ExternalTool.DEBIAN_PYTHON)) {
            assertEquals(ExternalTool.DEBIAN_PYTHON, python);
        } else {
            assertEquals(ExternalTool.find("python3"), python);
        }
        // a missing module skips the check, or fails it under CI
        Throwable missing = assertThrows(Throwable.class,
                () -> ExternalTool.requirePythonModule("no_such_module_lanesift_test", "none"));
        assertEquals(ExternalTool.underCi() ? "AssertionError" : "TestAbortedException", missing.getClass().getSimpleName());
        assertTrue(missing.getMessage().startsWith(python + " cannot import no_such_module_lanesift_test"), missing.getMessage());
    }

    @Test
    void jsonScanFindsMembersInDocumentOrder() {
        var root = JsonScan.parse("t", "{\"a\": {\"lane\": 0, \"min\": 5}, \"b\": [{\"lane\": 1, \"min\": 7, \"ok\": true}], \"n\": null}");
        assertEquals(5, JsonScan.number(root, "min"));
        assertEquals(7, JsonScan.number(JsonScan.after(root, "lane", "1", "min")));
        assertEquals("/b/0/min", JsonScan.after(root, "lane", "1", "min").pointer());
        assertEquals(1, JsonScan.number(root, "ok"));
        assertTrue(Double.isNaN(JsonScan.number(root, "n")));
        assertEquals(2, JsonScan.count(root, "lane"));
        assertThrows(AssertionError.class, () -> JsonScan.number(root, "absent"));
        assertThrows(AssertionError.class, () -> JsonScan.after(root, "lane", "2", "min"));
        assertThrows(AssertionError.class, () -> JsonScan.number(root, "a"), "an object is not a number");
    }
}
