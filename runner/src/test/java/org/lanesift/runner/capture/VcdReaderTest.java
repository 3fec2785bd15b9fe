package org.lanesift.runner.capture;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.data.DataKind;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PortSpec;

/**
 * The VCD source on a hand-written dump (resources/capture/scopes-and-states.vcd) whose meaning
 * follows from IEEE 1364-2005 clause 18: $timescale 10 ps, x/z values, a vector value shorter
 * than its width (left-extended with 0, clause 18.2.1), $dumpoff making every variable x until
 * $dumpon. Every block size must give the same joined result.
 */
class VcdReaderTest {
    private static final long U = 10_000L; // one time unit, 10 ps, in fs
    private static final String FILE = CsvReaderTest.res("scopes-and-states.vcd").toString();

    @Test
    void portsFromTheDeclarations() {
        OptionValues ov = OptionValues.validate(VcdSource.DESCRIPTOR, Map.of("file", FILE));
        List<PortSpec> ports = VcdSource.DESCRIPTOR.outputs(ov);
        assertEquals(List.of("lvds_clk", "data", "other_clk", "word", "v"), ports.stream().map(PortSpec::name).toList(),
                "shortest unique suffix of the scope path");
        assertEquals(List.of(DataKind.EDGES, DataKind.EDGES, DataKind.EDGES, DataKind.WORDS, DataKind.ANALOG),
                ports.stream().map(PortSpec::kind).toList());
    }

    @Test
    void valuesUnknownSpansWordsAndRealsForEveryBlockSize() {
        for (int block : new int[] {1, 2, 3, 5, 1000}) {
            Collected c = Collected.run(new VcdSource(), Map.of("file", FILE, "blockSamples", block, "realRateHz", 1e11));
            String at = " (blockSamples " + block + ")";
            assertArrayEquals(new long[] {5 * U, 10 * U, 40 * U}, c.edgeTimes("lvds_clk"), "clk" + at);
            assertArrayEquals(new long[] {30 * U, 40 * U}, c.unknownSpans("lvds_clk"), "clk unknown" + at);
            assertArrayEquals(new long[] {5 * U, 10 * U, 30 * U, 40 * U}, c.edgeTimes("data"), "data" + at);
            assertArrayEquals(new long[] {0, 5 * U, 20 * U, 40 * U}, c.unknownSpans("data"), "data z and dump off" + at);
            assertArrayEquals(new long[0], c.edgeTimes("other_clk"), "x all along" + at);
            assertArrayEquals(new long[] {0, 51 * U}, c.unknownSpans("other_clk"), "x all along" + at);
            assertEquals(51 * U, c.lastEdges("data").endFs(), "the capture ends one unit after the last time" + at);

            List<long[]> w = c.words("word");
            long[][] exp = {
                {0, 0, 5 * U, WordStream.FLAG_SUSPECT},
                {1, 5 * U, 10 * U, 0},                          // b1 is 001
                {5, 10 * U, 30 * U, WordStream.FLAG_SUSPECT},   // b1x1, the x bit read as 0 and flagged
                {0, 30 * U, 40 * U, WordStream.FLAG_SUSPECT},   // dump off
                {2, 40 * U, 51 * U, WordStream.FLAG_GAP_BEFORE},
            };
            assertEquals(exp.length, w.size(), "words" + at);
            for (int i = 0; i < exp.length; i++) {
                assertArrayEquals(exp[i], w.get(i), "word " + i + at);
            }
            double[] v = c.analog("v");
            assertEquals(51, v.length, "one sample per 10 ps unit" + at);
            for (int k = 0; k < v.length; k++) {
                if (k >= 30 && k < 40) {
                    assertTrue(Double.isNaN(v[k]), "invalid while off, sample " + k + at);
                } else {
                    assertEquals(k < 10 ? 0.5 : k < 30 ? -1.25 : 3.0, v[k], 0.0, "sample " + k + at);
                }
            }
        }
    }
}
