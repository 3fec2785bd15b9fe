package org.lanesift.dist;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.chain.BlockSink;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.ChainFileReader;
import org.lanesift.chain.ChainSpec;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.examples.demo.CaptureFiles;
import org.lanesift.examples.demo.Impairments;
import org.lanesift.examples.demo.PacketLinkScene;
import org.lanesift.examples.demo.PixelLinkScene;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.runner.link.ChainModels;
import org.lanesift.runner.link.LinkChains;
import org.lanesift.runner.output.OutputSelection;
import org.lanesift.runner.output.ReportWriter;
import org.lanesift.runner.output.RunOutputs;
import org.lanesift.runner.output.RunSummary;
import org.lanesift.testkit.BitsKeeper;

/**
 * Every kind of receiver of the sampler's bits, decoded twice from the same seeded capture (the
 * demo scenario's generators): once as wired, where the sampler sends its per-bit margins only if a
 * receiver reads them, and once with a host tap on every bit output, which makes it send them
 * everywhere. Every file the run writes (decoder exports, pictures, reports, VCD, bits, words,
 * annotations, report.md) must be byte for byte the same (the VCD but for its {@code $date}, the
 * time it was written); a watcher that does not read margins
 * shows which runs really went without them. The receivers: pixel-link and framed packet-link
 * (do not read them), packet-link with line states (reads them: its margin findings), the run's
 * packed binary bits (does not) and its bits CSV (does).
 */
class BitMarginsOnDemandTest {
    @TempDir
    static Path dir;
    static Path pixelCapture;
    static Path packetCapture;

    @BeforeAll
    static void captures() throws Exception {
        PixelLinkScene.Capture px = PixelLinkScene.render(Impairments.pixelLinkDefaults(), PixelLinkScene.FIRST_LINE, 60, true);
        pixelCapture = dir.resolve("pixel.bin");
        CaptureFiles.writeRaw(pixelCapture, px.channels(), px.volts(), px.sampleRateHz(), 50e-6);
        PacketLinkScene.Capture pk = PacketLinkScene.render(Impairments.packetLinkDefaults());
        packetCapture = dir.resolve("packet.bin");
        CaptureFiles.writeRaw(packetCapture, pk.channels(), pk.volts(), pk.sampleRateHz(), 50e-6);
    }

    private static LinkChains.Capture capture(Path file, String... names) {
        List<LinkChains.Pair> pairs = new ArrayList<>();
        for (String n : names) {
            pairs.add(new LinkChains.Pair(n, n + "_P", n + "_N"));
        }
        return new LinkChains.Capture("raw", file.toAbsolutePath().toString(), pairs);
    }

    private static Map<String, Object> pixel() {
        return LinkChains.pixelOneRun("margins test, pixel link", capture(pixelCapture, "CLK", "D0", "D1", "D2"), "7142.857ps",
                "bits-18");
    }

    private static Map<String, Object> packet() {
        return LinkChains.packetOneRun("margins test, packet link", capture(packetCapture, "HSCLK", "L0", "L1"));
    }

    /** The packet chain with the decoder on the framed profile, without line states: its leg wires removed. */
    @SuppressWarnings("unchecked")
    private static Map<String, Object> framed() {
        Map<String, Object> m = packet();
        for (Map<String, Object> n : (List<Map<String, Object>>) m.get("nodes")) {
            if (n.get("id").equals("dsi")) {
                Map<String, Object> o = new LinkedHashMap<>((Map<String, Object>) n.get("options"));
                o.put("profile", "framed");
                o.put("lpStates", false);
                o.put("idleBits", 64);
                n.put("options", o);
            }
        }
        ((List<Map<String, Object>>) m.get("wires")).removeIf(w -> ((String) w.get("to")).matches("dsi\\.lane\\d[pn]"));
        return m;
    }

    /** The packet chain without its decoder: the sampler's bits go to the run's outputs. */
    @SuppressWarnings("unchecked")
    private static Map<String, Object> bitsToFiles() {
        Map<String, Object> m = packet();
        ((List<Map<String, Object>>) m.get("nodes")).removeIf(n -> n.get("id").equals("dsi"));
        ((List<Map<String, Object>>) m.get("wires")).removeIf(w -> ((String) w.get("to")).startsWith("dsi."));
        return m;
    }

    /** What one decode wrote, file name to bytes, and whether the watched bits carried margins. */
    private record Written(Map<String, byte[]> files, Set<Boolean> margins) {
    }

    /**
     * Decodes a chain model into a fresh folder through the run's outputs, as {@code run} does.
     *
     * @param forceMargins  a host tap on every bit output of the sampler
     */
    private static Written decode(String name, Map<String, Object> model, List<String> outputs, boolean forceMargins) throws Exception {
        Path chainFile = dir.resolve(name + (forceMargins ? "-forced" : "") + ".json");
        ChainModels.write(chainFile, model);
        ChainSpec spec = new ChainFileReader().read(chainFile, chainFile.getFileName().toString()).spec();
        BitsKeeper watcher = new BitsKeeper("test.watch", false);
        PluginRegistry reg = PluginRegistry.discover(BitMarginsOnDemandTest.class.getClassLoader()).add(watcher);
        Set<String> wired = new HashSet<>();
        spec.wires().forEach(w -> wired.add(w.from()));
        Map<String, DataKind> results = new LinkedHashMap<>();
        int lanes = 0;
        for (ChainSpec.Node n : spec.nodes()) {
            PluginDescriptor d = reg.find(n.plugin()).descriptor();
            for (PortSpec p : d.outputs(OptionValues.validate(d, n.options()))) {
                if (!wired.contains(n.id() + "." + p.name())) {
                    results.put(n.id() + "." + p.name(), p.kind());
                }
                if (n.id().equals("sampler") && p.kind() == DataKind.BITS) {
                    lanes++;
                }
            }
        }
        assertTrue(lanes > 0, name + ": the chain has a sampler");
        Path out = dir.resolve(name + "-" + (outputs == null ? "default" : String.join("+", outputs)) + (forceMargins ? "-forced" : ""));
        Set<Boolean> seen = new HashSet<>();
        Instant started = Instant.parse("2026-01-01T00:00:00Z");
        try (RunOutputs outs = new RunOutputs(out, "test", OutputSelection.of(outputs, results.keySet(), List.of()))) {
            results.forEach((k, v) -> outs.declare(k.substring(0, k.indexOf('.')), k.substring(k.indexOf('.') + 1), v));
            ChainBuilder b = ChainBuilder.fromSpec(spec, reg).annotations(outs).outputs(new BlockSink() {
                @Override
                public void accept(String id, String port, Block block) {
                    if (block instanceof BitStream s) {
                        seen.add(s.hasMargins());
                    }
                    outs.accept(id, port, block);
                }

                @Override
                public boolean wants(String id, String port) {
                    return outs.wants(id, port);
                }

                @Override
                public boolean readsBitMargins(String id, String port) {
                    return outs.readsBitMargins(id, port);
                }
            });
            boolean bitsWired = wired.contains("sampler.bits0");
            if (bitsWired) {
                b.add("watch", "test.watch").wire("sampler.bits0", "watch.in");
            }
            for (int k = 0; k < lanes && forceMargins; k++) {
                b.tap("sampler.bits" + k, blk -> seen.add(((BitStream) blk).hasMargins()));
            }
            try (Chain c = b.build()) {
                c.run();
            }
            watcher.kept().forEach(s -> seen.add(s.hasMargins()));
            outs.close();
            ReportWriter.write(new RunSummary(name + ".json", "", "test", started, 0, "completed", Map.of(),
                    List.of(), List.of(), List.of()), outs);
        }
        Map<String, byte[]> files = new TreeMap<>();
        try (Stream<Path> all = Files.walk(out)) {
            for (Path p : all.filter(Files::isRegularFile).toList()) {
                files.put(out.relativize(p).toString(), Files.readAllBytes(p));
            }
        }
        return new Written(files, seen);
    }

    /** Decodes with and without forced margins; the files must be identical, and the plain run must have sent margins as expected. */
    private static void check(String name, Map<String, Object> model, List<String> outputs, boolean marginsRead, String... mustWrite)
            throws Exception {
        Written plain = decode(name, model, outputs, false);
        Written forced = decode(name, model, outputs, true);
        assertEquals(Set.of(marginsRead), plain.margins(), name + ": margins sent only when a receiver reads them");
        assertEquals(Set.of(true), forced.margins(), name + ": a tap gets them");
        for (String f : mustWrite) {
            assertTrue(plain.files().containsKey(f), name + ": " + f + " in " + plain.files().keySet());
        }
        assertEquals(plain.files().keySet(), forced.files().keySet(), name);
        for (Map.Entry<String, byte[]> e : plain.files().entrySet()) {
            assertArrayEquals(undated(e.getKey(), e.getValue()), undated(e.getKey(), forced.files().get(e.getKey())), name + ": " + e.getKey());
        }
    }

    /** A VCD without the one varying line, the time it was written (its {@code $date}); any other file as it is. */
    private static byte[] undated(String file, byte[] content) {
        if (!file.endsWith(".vcd")) {
            return content;
        }
        String text = new String(content, StandardCharsets.ISO_8859_1);
        String without = text.replaceFirst("\\$date\n[^\n]*\n\\$end\n", "\\$date\n\\$end\n");
        assertTrue(without.length() < text.length(), file + ": has its $date");
        return without.getBytes(StandardCharsets.ISO_8859_1);
    }

    @Test
    void pixelLinkDoesNotReadThemAndDecodesTheSame() throws Exception {
        check("pixel", pixel(), null, false, "annotations.jsonl", "report.md", "sampler-margins.json", "panel-timing.json",
                "panel-frame-0000-partial.png");
    }

    @Test
    void packetLinkWithLineStatesReadsThem() throws Exception {
        check("packet", packet(), null, true, "annotations.jsonl", "report.md", "sampler-margins.json", "dsi-timing.json",
                "dsi-packets.jsonl");
    }

    @Test
    void framedPacketLinkDoesNotReadThemAndDecodesTheSame() throws Exception {
        check("framed", framed(), List.of("standard", "binary"), false, "annotations.jsonl", "report.md", "sampler-margins.json",
                "dsi-packets.words");
    }

    @Test
    void packedBinaryBitsDoNotReadThemTheBitsCsvDoes() throws Exception {
        check("bits-binary", bitsToFiles(), List.of("binary", "artifacts", "annotations"), false, "sampler-bits0.bits",
                "sampler-bits1.bits", "sampler-margins.json", "annotations.jsonl");
        check("bits-csv", bitsToFiles(), List.of("csv", "binary", "annotations"), true, "sampler-bits0-bits.csv",
                "sampler-bits0.bits");
    }
}
