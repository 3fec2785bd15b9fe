package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainException;
import org.lanesift.chain.StageFailure;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/** The plugin found through ServiceLoader and run in a chain; option errors that name the option. */
class ChainAndOptionsTest {
    static AnalogBlock[] legs() {
        AnalogBlock d = Synth.analog("d", 5e9, 30_000, t -> 0.175 * Math.signum(Math.sin(2 * Math.PI * 97e6 * t + 0.1)));
        return new AnalogBlock[] {TestSignals.legP(d, 1.25), TestSignals.legN(d, 1.25)};
    }

    /** Pushes the legs into inputs {@code p} and {@code n} in blocks of 4096, then finishes and closes the chain. */
    static void pushLegs(Chain c, AnalogBlock[] l) {
        List<AnalogBlock> ps = Synth.split(l[0], 4096);
        List<AnalogBlock> ns = Synth.split(l[1], 4096);
        for (int i = 0; i < ps.size(); i++) {
            c.push("p", ps.get(i));
            c.push("n", ns.get(i));
        }
        c.finish();
        c.close();
    }

    @Test
    void runsInAChainWithTwoExternalInputsAndATap() {
        PluginRegistry reg = PluginRegistry.discover(getClass().getClassLoader());
        assertTrue(reg.find("differential") instanceof DifferentialPlugin, "registered through META-INF/services");
        List<Block> edges = new ArrayList<>();
        List<Block> logic = new ArrayList<>();
        List<Block> other = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        Chain c = Chain.builder(reg)
                .input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
                .add("rx0", "differential", Map.of("mode", "pair", "name", "lane0"))
                .wire("p", "rx0.p").wire("n", "rx0.n")
                .tap("rx0.edges", edges::add).tap("rx0.logic", logic::add)
                .outputs((id, port, b) -> other.add(b))
                .annotations((src, a) -> notes.add(src + ":" + a.kind()))
                .build();
        AnalogBlock[] l = legs();
        pushLegs(c, l);
        long[] t = TestSignals.times(edges.stream().map(Edges.class::cast).toList());
        // a 97 MHz square wave for 6 us: two transitions per period, about 1164
        assertEquals(1164, t.length, 2);
        assertEquals("lane0", edges.get(0).channel());
        assertEquals(30_000, logic.stream().mapToInt(b -> ((LogicBlock) b).length()).sum());
        Artifact report = (Artifact) other.stream().filter(b -> b instanceof Artifact).findFirst().orElseThrow();
        assertEquals("rx0-levels.json", report.fileName());
        assertTrue(notes.contains("rx0:level-summary"), notes.toString());
        // the same capture through the harness in one block gives the same edges
        StageHarness h = TestSignals.runPair(Map.of("name", "lane0"), l[0], l[1]);
        assertArrayEquals(TestSignals.times(h.outputs("edges", Edges.class)), t);
    }

    @Test
    void aGapBetweenBlocksIsANamedError() {
        StageHarness h = StageHarness.of(new DifferentialPlugin(), Map.of("mode", "differential"));
        AnalogBlock d = Synth.analog("d", 1e9, 1000, t -> 0.2);
        h.push("in", d);
        AnalogBlock late = new AnalogBlock("d", 2000, 2_000_000_000L, 1e6, d.volts(), 1000, null);
        StageFailure f = assertThrows(StageFailure.class, () -> h.push("in", late));
        assertTrue(f.getMessage().contains("input 'in'") && f.getMessage().contains("without gaps"), f.getMessage());
    }

    @Test
    void legsStartingAtDifferentSamplesAreAlignedAndLeftoversReported() {
        AnalogBlock[] l = legs();
        // n starts 100 samples later and ends 50 samples earlier than p
        int n = l[1].length();
        AnalogBlock nLate = new AnalogBlock("n", 100, Math.round(100 * l[1].periodFs()), l[1].periodFs(),
                java.util.Arrays.copyOfRange(l[1].volts(), 100, n - 50), n - 150, null);
        StageHarness h = TestSignals.runPair(Map.of(), l[0], nLate);
        StageHarness whole = TestSignals.runPair(Map.of(), l[0], l[1]);
        long[] t = TestSignals.times(h.outputs("edges", Edges.class));
        long[] all = TestSignals.times(whole.outputs("edges", Edges.class));
        long first = h.outputs("edges", Edges.class).get(0).startFs();
        assertEquals(Math.round(100 * l[1].periodFs()), first, "the output starts where both legs are known");
        // every edge of the aligned run is an edge of the full run, except around the shortened ends
        int matched = 0;
        for (long x : t) {
            for (long y : all) {
                if (Math.abs(x - y) <= 1) {
                    matched++;
                    break;
                }
            }
        }
        assertTrue(matched >= t.length - 2, matched + " of " + t.length);
        var left = h.annotations("legs-unequal-length");
        assertEquals(1, left.size());
        assertEquals(50L, left.get(0).fields().get("samples").value());
        assertEquals(org.lanesift.annotation.Severity.INFO, left.get(0).severity(), "samples left unused are information");
    }

    static String optionError(Map<String, Object> options) {
        PluginRegistry reg = new PluginRegistry().add(new DifferentialPlugin());
        ChainException e = assertThrows(ChainException.class, () -> {
            var b = Chain.builder(reg).add("rx", "differential", options);
            String mode = (String) options.getOrDefault("mode", "pair");
            if (mode.equals("pair")) {
                b.input("p", DataKind.ANALOG).input("n", DataKind.ANALOG).wire("p", "rx.p").wire("n", "rx.n");
            } else {
                b.input("in", DataKind.ANALOG).wire("in", "rx.in");
            }
            b.build();
        });
        return e.getMessage() + " @" + e.pointer();
    }

    @Test
    void optionErrorsNameTheOptionAndWhatIsExpected() {
        assertTrue(optionError(Map.of("mode", "single", "thresholdVolts", 0.5))
                .contains("option 'thresholdVolts' of plugin 'differential'"));
        String m = optionError(Map.of("mode", "single", "reference", "fixed"));
        assertTrue(m.contains("'referenceVolts'") && m.contains("required with reference=fixed"), m);
        m = optionError(Map.of("levelProfile", "dphy-lp"));
        assertTrue(m.contains("'levelProfile'") && m.contains("mode 'single'"), m);
        m = optionError(Map.of("adaptTimeConstant", "3UI"));
        assertTrue(m.contains("'adaptTimeConstant'") && m.contains("unit interval"), m);
        m = optionError(Map.of("hysteresisFraction", 2.0));
        assertTrue(m.contains("'hysteresisFraction'") && m.contains("0 to 0.9"), m);
        m = optionError(Map.of("mode", "quad"));
        assertTrue(m.contains("expected one of pair, differential, single, logic-pair"), m);
        m = optionError(Map.of("thresholdVolt", 0.1));
        assertTrue(m.contains("has no option 'thresholdVolt'") && m.contains("thresholdVolts"), m);
        assertTrue(m.endsWith("@null") || m.contains("/options/"), m);
    }
}
