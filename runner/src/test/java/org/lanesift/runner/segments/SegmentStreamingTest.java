package org.lanesift.runner.segments;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.ChainSpec;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.runner.capture.RawSource;
import org.lanesift.runner.fakes.FakeEdges;

/**
 * The segment being stitched is handed on while it is decoded: its blocks reach the outputs
 * before a segment decoded beside it has finished, so no segment's output is held whole.
 */
class SegmentStreamingTest {
    @TempDir
    Path dir;

    /**
     * The test plugin {@code fake-edges} (crossings of 0.5 V), except that a stage that did not
     * start at frame 0 finishes only once the outputs have had a block, or after 20 s with a problem
     * noted.
     */
    static final class HeldEdges implements PluginProvider {
        final PluginProvider edges = new FakeEdges();
        final CountDownLatch handedOn = new CountDownLatch(1);
        final List<String> problems = new ArrayList<>();

        @Override
        public PluginDescriptor descriptor() {
            return edges.descriptor();
        }

        @Override
        public Stage open(StageContext ctx) throws Exception {
            Stage inner = edges.open(ctx);
            return new Stage() {
                long firstIndex = -1;

                @Override
                public void accept(int input, Block block) throws Exception {
                    if (firstIndex < 0) {
                        firstIndex = ((AnalogBlock) block).firstIndex();
                    }
                    inner.accept(input, block);
                }

                @Override
                public void finish() throws Exception {
                    if (firstIndex > 0 && !handedOn.await(20, TimeUnit.SECONDS)) {
                        synchronized (problems) {
                            problems.add("the segment from frame " + firstIndex + " finished with nothing handed on before it");
                        }
                    }
                    inner.finish();
                }
            };
        }
    }

    @Test
    void theHeadSegmentReachesTheOutputsWhileTheNextOneIsStillDecoding() throws Exception {
        Path bin = dir.resolve("cap.bin");
        int n = 100_000;
        byte[] b = new byte[n];
        for (int i = 0; i < n; i++) {
            b[i] = (byte) ((i / 37) % 2 == 0 ? 20 : 200);
        }
        Files.write(bin, b);
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"uint8\", \"markClipped\": false,"
                + " \"channels\": [{\"name\": \"A\", \"gain\": 0.004}]}");
        HeldEdges held = new HeldEdges();
        PluginRegistry registry = new PluginRegistry().add(new RawSource()).add(held);
        ChainSpec spec = new ChainSpec(List.of(
                new ChainSpec.Node("cap", "raw", Map.of("file", bin.toString(), "blockSamples", 4096L)),
                new ChainSpec.Node("e", "fake-edges", Map.of())),
                List.of(new ChainSpec.Wire("cap.A", "e.in")));
        List<Edges> out = new ArrayList<>();
        SegmentedRun run = new SegmentedRun(SegmentPlan.of(spec, registry), registry, 2, 20_000,
                (id, port, block) -> {
                    out.add((Edges) block);
                    held.handedOn.countDown();
                }, (src, a) -> { }, (done, total) -> { });
        assertTrue(run.segments() >= 3, "segments: " + run.segments());
        run.run();
        assertEquals(List.of(), held.problems);
        // and the stitched stream is whole: contiguous spans, every transition of the square wave once
        int transitions = 0;
        for (int i = 0; i < out.size(); i++) {
            transitions += out.get(i).count();
            if (i > 0) {
                assertEquals(out.get(i - 1).endFs(), out.get(i).startFs(), "block " + i + " starts where the one before ended");
            }
        }
        assertEquals((n - 1) / 37, transitions);
    }
}
