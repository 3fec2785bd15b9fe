package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.function.Consumer;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.testkit.BlockKeeper;

/**
 * The differential declares {@code readsLentBlocks}, so the raw and packed-logic sources reuse the
 * arrays of the blocks they send it. The test suite runs with lent blocks poisoned once recycled
 * (root pom, {@code lanesift.poisonLentBlocks}), so every decode here runs twice: with the legs
 * lent, and with a host tap on every source output (taps may keep blocks, so nothing is lent); the
 * edges, logic and level reports must be the same. A witness stage that declares the rule and
 * keeps its blocks shows that the lent run really was lent and poisoned.
 */
class DifferentialLentBlocksTest {
    private static final int FRAMES = 20_000;

    /** Seeded legs: a random bit stream with soft edges, noise and a slow common-mode drift; some NaN samples. */
    private static float[][] legs(long seed, int frames, int samplesPerBit) {
        SplittableRandom r = new SplittableRandom(seed);
        float[] p = new float[frames];
        float[] n = new float[frames];
        double level = -1;
        boolean bit = false;
        for (int i = 0; i < frames; i++) {
            if (i % samplesPerBit == 0) {
                bit = r.nextBoolean();
            }
            level += ((bit ? 1 : -1) - level) * 0.35;
            double cm = 1.2 + 0.05 * Math.sin(i * 1e-3);
            p[i] = (float) (cm + 0.175 * level + r.nextGaussian() * 0.01);
            n[i] = (float) (cm - 0.175 * level + r.nextGaussian() * 0.01);
            if (r.nextInt(5000) == 0) {
                p[i] = Float.NaN;
            }
        }
        return new float[][] {p, n};
    }

    private static Path rawFile(Path dir, String name, float[][] channels, String[] names) throws Exception {
        Path bin = dir.resolve(name);
        int frames = channels[0].length;
        ByteBuffer bb = ByteBuffer.allocate(frames * channels.length * 4).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < frames; i++) {
            for (float[] c : channels) {
                bb.putFloat(c[i]);
            }
        }
        Files.write(bin, bb.array());
        StringBuilder ch = new StringBuilder();
        for (String s : names) {
            ch.append(ch.length() == 0 ? "" : ", ").append("{\"name\": \"").append(s).append("\"}");
        }
        Files.writeString(Path.of(bin + ".json"), "{\"rateHz\": 2.5e9, \"format\": \"float32le\", \"channels\": [" + ch + "]}");
        return bin;
    }

    /** What the chain's differential stages put out, rendered for comparison. */
    private static List<String> decode(ChainSpec spec, boolean lend, BlockKeeper witness) {
        PluginRegistry reg = PluginRegistry.discover(DifferentialLentBlocksTest.class.getClassLoader()).add(witness);
        ChainBuilder b = Chain.builder(reg);
        spec.build().accept(b);
        b.add("witness", "lent-witness").wire(spec.witnessAt(), "witness");
        if (!lend) {
            for (String out : spec.sourceOutputs()) {
                b.tap(out, blk -> { });
            }
        }
        List<String> seen = new ArrayList<>();
        for (String out : spec.decodedOutputs()) {
            b.tap(out, blk -> seen.add(out + " " + render(blk)));
        }
        try (Chain c = b.build()) {
            c.run();
        }
        return seen;
    }

    private static String render(Block blk) {
        if (blk instanceof Edges e) {
            return "edges " + e.startFs() + ".." + e.endFs() + " " + e.initialLevel() + " " + Arrays.toString(Arrays.copyOf(e.timesFs(), e.count()))
                    + " unknown " + (e.invalidSpans() == null ? "[]" : Arrays.toString(Arrays.copyOf(e.invalidSpans(), 2 * e.invalidCount())));
        }
        if (blk instanceof LogicBlock l) {
            int words = (l.length() + 63) >>> 6;
            return "logic " + l.firstIndex() + " " + l.length() + " " + Arrays.toString(Arrays.copyOf(l.bits(), words)) + " "
                    + (l.invalid() == null ? "-" : Arrays.toString(Arrays.copyOf(l.invalid(), words)));
        }
        if (blk instanceof Artifact a) {
            return "artifact " + a.fileName() + " " + new String(a.content(), java.nio.charset.StandardCharsets.UTF_8);
        }
        return blk.toString();
    }

    /**
     * A chain under test.
     *
     * @param build          adds the sources and the differential
     * @param sourceOutputs  the source outputs the differential reads (tapped in the run that lends nothing)
     * @param decodedOutputs what is compared
     * @param witnessAt      the source output the witness listens to
     */
    record ChainSpec(Consumer<ChainBuilder> build, List<String> sourceOutputs, List<String> decodedOutputs, String witnessAt) {
    }

    private static ChainSpec onePair(Path bin, Map<String, Object> diffOptions, int blockSamples) {
        return new ChainSpec(b -> {
            b.add("cap", "raw", Map.of("file", bin.toString(), "blockSamples", blockSamples)).add("rx", "differential", diffOptions)
                    .wire("cap.p", "rx.p").wire("cap.n", "rx.n");
        }, List.of("cap.p", "cap.n"), List.of("rx.edges", "rx.logic", "rx.report"), "cap.p");
    }

    private static void assertSameWhenLent(ChainSpec spec, String what) {
        assertSameWhenLent(spec, what, DataKind.ANALOG);
    }

    private static void assertSameWhenLent(ChainSpec spec, String what, DataKind legs) {
        BlockKeeper lentWitness = new BlockKeeper("lent-witness", legs, true);
        List<String> lent = decode(spec, true, lentWitness);
        BlockKeeper ownWitness = new BlockKeeper("lent-witness", legs, true);
        List<String> own = decode(spec, false, ownWitness);
        assertTrue(lentWitness.changed() > 0, what + ": the witness beside the differential was lent poisoned blocks");
        assertEquals(0, ownWitness.changed(), what + ": with taps on the source nothing is lent");
        assertFalse(own.isEmpty(), what);
        assertTrue(own.stream().anyMatch(s -> s.startsWith("rx.edges") && !s.contains(" [] ")), what + ": edges were found");
        assertEquals(own, lent, what + ": the differential decodes lent blocks as it decodes blocks of its own");
    }

    @Test
    void poisonModeIsOn() {
        assertTrue(Boolean.getBoolean("lanesift.poisonLentBlocks"), "the root pom runs the tests with lent blocks poisoned");
    }

    @Test
    void aPairFromOneSourceDecodesTheSameLentUnderEveryOptionSet(@TempDir Path dir) throws Exception {
        Path bin = rawFile(dir, "pair.raw", legs(19, FRAMES, 7), new String[] {"p", "n"});
        List<Map<String, Object>> sets = List.of(
                Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.02, "levelReport", false),
                Map.of("thresholdVolts", 0.0),
                Map.of(),
                Map.of("interpolation", "cubic", "windowSamples", 1000, "statsStride", 1),
                Map.of("warmupSamples", 3000, "detectSwap", true, "swapPattern", "idle-low"),
                Map.of("diffOutput", true, "commonOutput", true, "thresholdVolts", 0.01, "hysteresisVolts", 0.0));
        int[] blocks = {1000, 777, 4096};
        for (int k = 0; k < sets.size(); k++) {
            Map<String, Object> o = new LinkedHashMap<>(sets.get(k));
            assertSameWhenLent(onePair(bin, o, blocks[k % blocks.length]), "options " + o + ", blocks of " + blocks[k % blocks.length]);
        }
    }

    @Test
    void oneChannelModesDecodeTheSameLent(@TempDir Path dir) throws Exception {
        float[][] l = legs(7, FRAMES, 5);
        float[] d = new float[FRAMES];
        for (int i = 0; i < FRAMES; i++) {
            d[i] = l[0][i] - l[1][i];
        }
        Path bin = rawFile(dir, "one.raw", new float[][] {d, l[0]}, new String[] {"p", "n"});
        for (Map<String, Object> o : List.of(Map.<String, Object>of("mode", "differential"),
                Map.<String, Object>of("mode", "single", "reference", "fixed", "referenceVolts", 1.2, "hysteresisVolts", 0.01))) {
            String channel = o.get("mode").equals("single") ? "cap.n" : "cap.p";
            ChainSpec spec = new ChainSpec(b -> {
                b.add("cap", "raw", Map.of("file", bin.toString(), "blockSamples", 999)).add("rx", "differential", o).wire(channel, "rx.in");
            }, List.of(channel), List.of("rx.edges", "rx.logic", "rx.report"), channel);
            assertSameWhenLent(spec, "options " + o);
        }
    }

    @Test
    void legsFromTwoSourcesWaitForEachOtherInCopies(@TempDir Path dir) throws Exception {
        float[][] l = legs(23, FRAMES, 9);
        Path pBin = rawFile(dir, "p.raw", new float[][] {l[0]}, new String[] {"p"});
        Path nBin = rawFile(dir, "n.raw", new float[][] {l[1]}, new String[] {"n"});
        ChainSpec spec = new ChainSpec(b -> {
            // different block lengths, so one leg's blocks wait across the other source's calls
            b.add("capP", "raw", Map.of("file", pBin.toString(), "blockSamples", 1500))
                    .add("capN", "raw", Map.of("file", nBin.toString(), "blockSamples", 640))
                    .add("rx", "differential", Map.of()).wire("capP.p", "rx.p").wire("capN.n", "rx.n");
        }, List.of("capP.p", "capN.n"), List.of("rx.edges", "rx.logic", "rx.report"), "capP.p");
        assertSameWhenLent(spec, "two sources");
    }

    @Test
    void logicPairLegsFromTwoPackedLogicSourcesWaitInCopies(@TempDir Path dir) throws Exception {
        SplittableRandom r = new SplittableRandom(5);
        byte[] p = new byte[FRAMES];
        byte[] n = new byte[FRAMES];
        boolean level = false;
        for (int i = 0; i < FRAMES; i++) {
            if (r.nextInt(6) == 0) {
                level = !level;
            }
            p[i] = (byte) (level ? 1 : 0);
            // mostly the complement; now and then both legs agree (invalid samples)
            n[i] = (byte) (r.nextInt(50) == 0 ? p[i] : 1 - p[i]);
        }
        Path pBin = dir.resolve("p.bin");
        Path nBin = dir.resolve("n.bin");
        Files.write(pBin, p);
        Files.write(nBin, n);
        Files.writeString(Path.of(pBin + ".json"), "{\"rateHz\": 5e8, \"format\": \"logic8\", \"channels\": [{\"name\": \"p\", \"bit\": 0}]}");
        Files.writeString(Path.of(nBin + ".json"), "{\"rateHz\": 5e8, \"format\": \"logic8\", \"channels\": [{\"name\": \"n\", \"bit\": 0}]}");
        ChainSpec spec = new ChainSpec(b -> {
            b.add("capP", "packed-logic", Map.of("file", pBin.toString(), "blockSamples", 1024))
                    .add("capN", "packed-logic", Map.of("file", nBin.toString(), "blockSamples", 320))
                    .add("rx", "differential", Map.of("mode", "logic-pair")).wire("capP.p", "rx.p").wire("capN.n", "rx.n");
        }, List.of("capP.p", "capN.n"), List.of("rx.edges", "rx.logic"), "capP.p");
        assertSameWhenLent(spec, "logic-pair", DataKind.LOGIC);
    }
}
