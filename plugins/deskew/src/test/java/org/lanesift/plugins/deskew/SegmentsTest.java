package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.lanesift.data.AnalogBlock;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/**
 * The segment claim of {@link DeskewPlugin#segments}: an instance that starts in the middle of a
 * capture gives, once past the declared warm-up, exactly the samples of an instance that saw the
 * capture from the start.
 */
class SegmentsTest {
    private static final PluginDescriptor D = new DeskewPlugin().descriptor();

    private static SegmentSupport support(Map<String, ?> o) {
        return D.segmentSupport(OptionValues.validate(D, o));
    }

    @ParameterizedTest
    @CsvSource({"sinc, 37.5", "sinc, -1234.5", "cubic, 250", "sinc, 0"})
    void aSegmentMatchesOnePassAfterTheWarmUp(String interpolator, double offsetPs) {
        Map<String, Object> o = Map.of("kind", "analog", "channels", 1, "offsets", List.of(offsetPs), "interpolator", interpolator);
        AnalogBlock whole = Synth.withNoise(Synth.analog("d", DeskewAnalogTest.RATE, 30_000, DeskewAnalogTest::signal), 0.01, 7);
        List<AnalogBlock> blocks = Synth.split(whole, 4096);
        int first = 3;                                   // the segment starts with block 3
        float[] onePass = flatten(DeskewAnalogTest.run(blocks, o).blocks(), whole.length());
        float[] seg = flatten(DeskewAnalogTest.run(blocks.subList(first, blocks.size()), o).blocks(), whole.length());
        SegmentSupport s = support(o);
        assertTrue(s.supported());
        long warm = (long) Math.ceil(s.warmupFs(whole.periodFs()) / whole.periodFs());
        int from = (int) (first * 4096L + warm);
        int to = (int) (whole.length() - warm);
        for (int i = from; i < to; i++) {
            assertEquals(Float.floatToIntBits(onePass[i]), Float.floatToIntBits(seg[i]), "sample " + i);
        }
        if (offsetPs > 0) {
            // a delay reads earlier input: the segment's first sample has no history and is marked invalid
            assertTrue(Float.isNaN(seg[first * 4096]) && !Float.isNaN(onePass[first * 4096]), "first sample of the segment");
        }
    }

    /** Output samples by capture index; NaN where the output had none or marked it invalid. */
    private static float[] flatten(List<AnalogBlock> out, int n) {
        float[] v = new float[n];
        java.util.Arrays.fill(v, Float.NaN);
        for (AnalogBlock b : out) {
            for (int i = 0; i < b.length(); i++) {
                v[(int) (b.firstIndex() + i)] = b.isValid(i) ? b.volts()[i] : Float.NaN;
            }
        }
        return v;
    }

    @Test
    void theWarmUpCoversTheLargestOffsetAndTheKernel() {
        SegmentSupport edges = support(Map.of("kind", "edges", "channels", 2, "offsets", List.of(-250, 120)));
        assertEquals(250_000, edges.warmupFs());
        assertEquals(0, edges.warmupSamples());
        SegmentSupport analog = support(Map.of("kind", "analog", "channels", 2, "offsets", List.of(3, -2), "offsetUnit", "samples"));
        assertEquals(2 * 8 + 3 + 2, analog.warmupSamples());
    }

    @Test
    void offsetsFromATableAreReadAndABadTableIsNamed(@TempDir Path dir) throws IOException {
        Path good = dir.resolve("t.json");
        Files.writeString(good, new SkewTable("manual", List.of(new SkewTable.Entry("D0", -80.0, 1, "manual", 0),
                new SkewTable.Entry("D1", 255.5, 1, "manual", 0))).toJson());
        assertEquals(255_500, support(Map.of("kind", "edges", "channels", 2, "offsetsFile", good.toString())).warmupFs());
        Path bad = dir.resolve("bad.json");
        Files.writeString(bad, "{ not json");
        SegmentSupport s = support(Map.of("kind", "edges", "channels", 2, "offsetsFile", bad.toString()));
        assertFalse(s.supported());
        assertTrue(s.blocker().contains("offsetsFile"), s.blocker());
    }
}
