package org.lanesift.runner.segments;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.ChainSpec;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.runner.capture.RawSource;
import org.lanesift.runner.fakes.FakeEdges;

/**
 * The margin each segment is read with: the warm-up plus a comparison zone at least as long, in
 * whole blocks; no more, since every margin frame is decoded twice.
 */
class SegmentMarginTest {
    @TempDir
    Path dir;

    @Test
    void aShortWarmUpCostsOneBlockEitherSide() throws Exception {
        Path bin = dir.resolve("cap.bin");
        Files.write(bin, new byte[100_000]);
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"uint8\", \"channels\": [{\"name\": \"A\"}]}");
        PluginRegistry registry = new PluginRegistry().add(new RawSource()).add(new FakeEdges());
        ChainSpec spec = new ChainSpec(List.of(
                new ChainSpec.Node("cap", "raw", Map.of("file", bin.toString(), "blockSamples", 4096L)),
                new ChainSpec.Node("e", "fake-edges", Map.of())),
                List.of(new ChainSpec.Wire("cap.A", "e.in")));
        SegmentPlan plan = SegmentPlan.of(spec, registry);
        // fake-edges declares a warm-up of one sample: warm-up and zone fit in one block of 4096 frames
        SegmentedRun run = new SegmentedRun(plan, registry, 2, 20_000, (id, port, block) -> { }, (src, a) -> { },
                (done, total) -> { });
        assertEquals(4096, run.marginFrames());
        assertEquals(20_480, run.segmentFrames(), "segments are whole blocks");
    }
}
