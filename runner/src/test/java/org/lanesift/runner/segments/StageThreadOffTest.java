package org.lanesift.runner.segments;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.ChainSpec;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.runner.capture.RawSource;
import org.lanesift.runner.fakes.FakeEdges;

/**
 * The segments of {@code --jobs} already use the cores, so their front chains turn a stage's own
 * second thread off, by the same route as the source's read-ahead: the option
 * {@value org.lanesift.plugin.SegmentSupport#STAGE_THREAD_OPTION}, set false in every stage that declares it; one pass leaves it alone.
 */
class StageThreadOffTest {
    @TempDir
    Path dir;

    /** Test-only plugin: hands analog blocks on unchanged and records the stageThread option it was opened with. */
    static final class Threaded implements PluginProvider {
        final ConcurrentLinkedQueue<Boolean> opened = new ConcurrentLinkedQueue<>();
        private final PluginDescriptor d = PluginDescriptor.builder("fake-threaded").name("Fake threaded")
                .option(OptionSpec.bool(org.lanesift.plugin.SegmentSupport.STAGE_THREAD_OPTION, true, "use a second thread"))
                .input(PortSpec.of("in", DataKind.ANALOG, "voltage"))
                .output(PortSpec.of("out", DataKind.ANALOG, "the same"))
                .segments(o -> SegmentSupport.after(1, 0))
                .build();

        @Override
        public PluginDescriptor descriptor() {
            return d;
        }

        @Override
        public Stage open(StageContext ctx) {
            opened.add(ctx.options().getBoolean(org.lanesift.plugin.SegmentSupport.STAGE_THREAD_OPTION));
            return new Stage() {
                @Override
                public void accept(int input, org.lanesift.data.Block block) {
                    ctx.emit(0, block);
                }
            };
        }
    }

    @Test
    void segmentFrontChainsRunWithoutStageThreadsAndOnePassWith() throws Exception {
        Path bin = dir.resolve("cap.bin");
        byte[] samples = new byte[100_000];
        for (int i = 0; i < samples.length; i++) {
            samples[i] = (byte) ((i / 37) % 2 == 0 ? 0 : 1);
        }
        Files.write(bin, samples);
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 1e9, \"format\": \"uint8\", \"channels\": [{\"name\": \"A\"}]}");
        Threaded threaded = new Threaded();
        PluginRegistry registry = new PluginRegistry().add(new RawSource()).add(threaded).add(new FakeEdges());
        ChainSpec spec = new ChainSpec(List.of(
                new ChainSpec.Node("cap", "raw", Map.of("file", bin.toString(), "blockSamples", 4096L)),
                new ChainSpec.Node("t", "fake-threaded", Map.of()),
                new ChainSpec.Node("e", "fake-edges", Map.of())),
                List.of(new ChainSpec.Wire("cap.A", "t.in"), new ChainSpec.Wire("t.out", "e.in")));

        try (Chain one = ChainBuilder.fromSpec(spec, registry).outputs((id, port, block) -> { }).build()) {
            one.run();
        }
        assertEquals(List.of(true), List.copyOf(threaded.opened), "one pass keeps the option's default");

        threaded.opened.clear();
        SegmentedRun run = new SegmentedRun(SegmentPlan.of(spec, registry), registry, 2, 20_000, (id, port, block) -> { },
                (src, a) -> { }, (done, total) -> { });
        run.run();
        List<Boolean> seen = List.copyOf(threaded.opened);
        assertEquals(run.segments(), seen.size(), "one front chain a segment: " + seen);
        assertTrue(run.segments() > 1, "the capture is cut into segments");
        assertTrue(seen.stream().noneMatch(b -> b), "every segment's front stage was opened with stageThread=false: " + seen);
    }
}
