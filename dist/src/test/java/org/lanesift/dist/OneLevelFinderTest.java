package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.BufferedWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.AnalogBlock;
import org.lanesift.plugins.differential.DifferentialPlugin;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.runner.capture.Inspector;
import org.lanesift.testkit.StageHarness;

/**
 * The threshold {@code inspect} suggests for a leg is the one the {@code differential} plugin learns
 * on the same samples (mode single, mid-level reference): both use the one level finder. The
 * capture is shorter than the plugin's warm-up and than inspect's thinning limit, so both see every
 * sample. An invented leg: 0.2 / 1.0 V with ringing edges, noise and 2 mV codes.
 */
class OneLevelFinderTest {
    @Test
    void inspectAndDifferentialAgree(@TempDir Path dir) throws Exception {
        int n = 6000;
        double rate = 5e9;
        float[] v = new float[n];
        Random r = new Random(17);
        boolean bit = false;
        double since = 0;
        for (int i = 0; i < n; i++) {
            if (i % 23 == 0 && r.nextBoolean()) {
                bit = !bit;
                since = 0;
            }
            double level = bit ? 1.0 : 0.2;
            double ring = (bit ? 0.1 : -0.1) * Math.exp(-since / 3) * Math.cos(since);
            v[i] = (float) (0.002 * Math.rint((level + ring + 0.004 * r.nextGaussian()) / 0.002));
            since++;
        }
        Path f = dir.resolve("leg.csv");
        try (BufferedWriter w = Files.newBufferedWriter(f)) {
            w.write("Time (s),D0_P (V)\n");
            for (int i = 0; i < n; i++) {
                w.write(String.format(Locale.ROOT, "%.12e,%.3f%n", i / rate, v[i]));
            }
        }
        InspectReport.Channel c = Inspector.inspect(f, Map.of()).channels().get(0);

        StageHarness h = StageHarness.of(new DifferentialPlugin(), Map.of("mode", "single", "reference", "mid-level"));
        // the same values the CSV holds, as the reader parses them
        float[] parsed = new float[n];
        for (int i = 0; i < n; i++) {
            parsed[i] = Float.parseFloat(String.format(Locale.ROOT, "%.3f", v[i]));
        }
        h.push("in", new AnalogBlock("D0_P", 0, 0, 1e15 / rate, parsed, n, null)).finish();
        List<Annotation> learned = h.annotations("threshold-learned");
        assertEquals(1, learned.size(), h.annotations().toString());
        double thr = ((Number) learned.get(0).fields().get("thresholdVolts").value()).doubleValue();
        double low = ((Number) learned.get(0).fields().get("lowLevelVolts").value()).doubleValue();
        double high = ((Number) learned.get(0).fields().get("highLevelVolts").value()).doubleValue();
        assertEquals(thr, c.threshold(), 1e-9);
        assertEquals(low, c.lowLevel(), 1e-9);
        assertEquals(high, c.highLevel(), 1e-9);
        assertEquals(0.6, thr, 0.01);
    }
}
