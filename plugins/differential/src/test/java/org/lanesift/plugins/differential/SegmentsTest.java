package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Edges;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The segment claim of {@link DifferentialPlugin#segments}: with a fixed threshold and hysteresis
 * and no level report, an instance started in the middle of a capture gives the same edges as one
 * that saw it from the start, once past the declared warm-up; whatever is learned or reported over
 * the whole capture is refused, naming the option.
 */
class SegmentsTest {
    private static final PluginDescriptor D = new DifferentialPlugin().descriptor();
    private static final Map<String, Object> FIXED = Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.04, "levelReport", false);

    private static SegmentSupport support(Map<String, Object> o) {
        return D.segmentSupport(OptionValues.validate(D, o));
    }

    private static Map<String, Object> with(Map<String, Object> base, Object... kv) {
        Map<String, Object> m = new HashMap<>(base);
        for (int i = 0; i < kv.length; i += 2) {
            m.put((String) kv[i], kv[i + 1]);
        }
        return m;
    }

    @ParameterizedTest
    @CsvSource({"linear, 11", "cubic, 23"})
    void aSegmentGivesTheEdgesOfOnePassAfterTheWarmUp(String interpolation, long seed) {
        AnalogBlock[] c = SplitPropertyTest.capture(seed);
        Map<String, Object> o = with(FIXED, "interpolation", interpolation);
        int cut = 4096;
        long[] whole = edges(o, c[0], c[1]);
        List<AnalogBlock> p = Synth.split(c[0], cut);
        List<AnalogBlock> n = Synth.split(c[1], cut);
        long[] seg = edges(o, p.get(1), n.get(1), p.get(2), n.get(2));
        long warmFs = support(o).warmupFs(c[0].periodFs());
        long from = c[0].startFs() + Math.round(cut * c[0].periodFs()) + warmFs;
        long[] a = Arrays.stream(whole).filter(t -> t >= from).toArray();
        long[] b = Arrays.stream(seg).filter(t -> t >= from).toArray();
        assertTrue(a.length > 50, "edges after the warm-up: " + a.length);
        assertArrayEquals(a, b);
    }

    private static long[] edges(Map<String, Object> o, AnalogBlock... pn) {
        try (StageHarness h = StageHarness.of(new DifferentialPlugin(), o)) {
            for (int i = 0; i < pn.length; i += 2) {
                h.push("p", pn[i]).push("n", pn[i + 1]);
            }
            h.finish();
            assertTrue(h.outputs("report").isEmpty(), "no levels report with levelReport=false");
            assertTrue(h.annotations().stream().noneMatch(x -> x.kind().startsWith("level")), "no level annotations");
            return TestSignals.times(h.outputs("edges", Edges.class));
        }
    }

    @Test
    void aSegmentGivesTheSameDifferenceAndCommonModeSamplesWithTheCaptureSampleNumbers() {
        AnalogBlock[] c = SplitPropertyTest.capture(31);
        Map<String, Object> o = with(FIXED, "diffOutput", true, "commonOutput", true);
        int cut = 4096;
        List<AnalogBlock> p = Synth.split(c[0], cut);
        List<AnalogBlock> n = Synth.split(c[1], cut);
        for (String port : new String[] {"diff", "common"}) {
            Map<Long, Float> whole = samples(o, port, c[0], c[1]);
            Map<Long, Float> seg = samples(o, port, p.get(1), n.get(1), p.get(2), n.get(2));
            assertEquals(c[0].length() - cut, seg.size(), port + ": the segment's samples");
            for (Map.Entry<Long, Float> e : seg.entrySet()) {
                assertEquals(whole.get(e.getKey()), e.getValue(), port + " at capture sample " + e.getKey());
            }
            assertEquals(cut + c[0].firstIndex(), seg.keySet().stream().mapToLong(Long::longValue).min().orElse(-1));
        }
    }

    /** The samples of an analog output by capture sample number, checking each block's time against its number. */
    private static Map<Long, Float> samples(Map<String, Object> o, String port, AnalogBlock... pn) {
        Map<Long, Float> out = new HashMap<>();
        try (StageHarness h = StageHarness.of(new DifferentialPlugin(), o)) {
            for (int i = 0; i < pn.length; i += 2) {
                h.push("p", pn[i]).push("n", pn[i + 1]);
            }
            h.finish();
            AnalogBlock first = pn[0];
            for (AnalogBlock b : h.outputs(port, AnalogBlock.class)) {
                long k = b.firstIndex() - first.firstIndex();
                assertEquals(first.startFs() + Math.round(k * first.periodFs()), b.startFs(), 1, port + " block time");
                for (int i = 0; i < b.length(); i++) {
                    out.put(b.firstIndex() + i, b.volts()[i]);
                }
            }
        }
        return out;
    }

    @Test
    void theLevelReportIsOnlyAReport() {
        AnalogBlock[] c = SplitPropertyTest.capture(5);
        long[] without = edges(FIXED, c[0], c[1]);
        try (StageHarness h = TestSignals.runPair(with(FIXED, "levelReport", true), c[0], c[1])) {
            assertArrayEquals(TestSignals.times(h.outputs("edges", Edges.class)), without);
            assertEquals(1, h.outputs("report").size());
        }
    }

    @Test
    void whatIsLearnedOrReportedOverTheWholeCaptureIsRefusedNamingTheOption() {
        assertTrue(support(FIXED).supported());
        assertEquals(Comparator.MAX_BACK + 4, support(FIXED).warmupSamples());
        assertBlockedBy("thresholdVolts", Map.of("hysteresisVolts", 0.04, "levelReport", false));
        assertBlockedBy("hysteresisVolts", Map.of("thresholdVolts", 0.0, "levelReport", false));
        assertBlockedBy("levelReport", with(FIXED, "levelReport", true));
        assertBlockedBy("detectSwap", with(FIXED, "detectSwap", true));
        assertBlockedBy("reference", Map.of("mode", "single", "hysteresisVolts", 0.04, "levelReport", false));
        assertBlockedBy("logic-pair", Map.of("mode", "logic-pair", "levelReport", false));
        assertTrue(support(Map.of("mode", "single", "reference", "fixed", "referenceVolts", 1.2, "hysteresisVolts", 0.04,
                "levelReport", false)).supported());
    }

    private static void assertBlockedBy(String option, Map<String, Object> o) {
        SegmentSupport s = support(o);
        assertFalse(s.supported(), o.toString());
        assertTrue(s.blocker().contains(option), s.blocker());
    }
}
