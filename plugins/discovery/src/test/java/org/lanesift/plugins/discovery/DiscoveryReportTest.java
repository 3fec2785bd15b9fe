package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.Artifact;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.WordStream;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugins.dualedge.DualEdgePlugin;
import org.lanesift.plugins.packetlink.PacketLinkPlugin;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.StageHarness;

/**
 * Hand-written cases: a two-lane double-edge link with 8-bit words sent LSB first after the sync
 * byte B8 (as MIPI DSI sends it; docs/reference-facts.md), a CRC-16/MCRF4XX at the end of every
 * burst (the DSI checksum's parameters) and a clock that stops between bursts. The report must
 * say so in its own words, and the generated chain, rerun through the chain engine with the
 * real sampler and framed decoder, must give back every word that was sent.
 */
class DiscoveryReportTest {
    private static final String B8_LSB_FIRST = "00011101";

    private static LinkFormatGenerator.Link link() {
        return new LinkFormatGenerator(77).fixed(8, false, "double-edge", 2, LaneDistribution.WORD, B8_LSB_FIRST, true,
                CrcCatalogueTest.byName("CRC-16/MCRF4XX"), false, PixelFormat.RGB888, 48, 30);
    }

    private static Map<String, Artifact> run(LinkFormatGenerator.Link l) {
        StageHarness h = StageHarness.of(new LinkDiscoveryPlugin(), Map.of("lanes", 2, "capture", "unknown-link.vcd"));
        h.push("clock", clockEdges(l.input));
        for (int k = 0; k < 2; k++) {
            h.push("lane" + k, laneEdges(l.input, k));
        }
        h.finish();
        Map<String, Artifact> files = new HashMap<>();
        for (Artifact a : h.outputs("files", Artifact.class)) {
            files.put(a.fileName().substring(a.fileName().indexOf('-') + 1), a);
        }
        return files;
    }

    @Test
    void reportStatesTheFoundFormatInItsOwnWords() {
        Map<String, Artifact> f = run(link());
        assertEquals(Map.of(), missing(f, "hypotheses.json", "hypotheses.md", "pictures.png", "chain.json"));
        String md = text(f.get("hypotheses.md"));
        assertTrue(md.contains("Best hypothesis: 8-bit words, lsb first, lanes word, double-edge, sync 00011101 (wire order)."), md);
        assertTrue(md.contains("8 bits `00011101` in wire order (0xB8 read lsb first)"), md);
        assertTrue(md.contains("CRC-16/MCRF4XX (width 16, poly 0x1021, init 0xFFFF, refin true, refout true, xorout 0x0; check value 0x6F91"), md);
        assertTrue(md.contains("boundaries from clock pauses"), md);
        JsonValue j = JsonScan.parse("hypotheses.json", text(f.get("hypotheses.json")));
        assertEquals("double-edge", j.get("clocking").get("best").asString());
        assertEquals(8, j.get("wordLength").elements().get(0).get("bits").asDouble());
        assertEquals("B8", j.get("sync").get("hex").asString());
        assertEquals("CRC-16/MCRF4XX", j.get("checksum").get("model").asString());
        JsonValue best = j.get("pictures").elements().get(0);
        assertEquals("rgb888", best.get("format").asString());
        assertEquals(48, best.get("lineLength").asDouble());
        byte[] png = f.get("pictures.png").content();
        assertArrayEquals(new byte[] {(byte) 0x89, 'P', 'N', 'G'}, Arrays.copyOf(png, 4));
    }

    @Test
    void generatedChainDecodesEveryBurstThroughTheEngine() {
        LinkFormatGenerator.Link l = link();
        Map<String, Map<String, Object>> opts = chainOptions(run(l));
        assertEquals("ddr", opts.get("dual-edge").get("mode"));
        assertEquals("B8", opts.get("packet-link").get("syncPattern"));
        assertEveryBurstWhole(l, opts);
    }

    /** A streaming two-lane link: 8-bit words MSB first, a 20-bit sync (invented), bursts of several lengths back to back. */
    private static LinkFormatGenerator.Link streaming() {
        return new LinkFormatGenerator(78).fixedStreaming(16, true, "double-edge", 2, LaneDistribution.WORD, "110100111000101101100101", null,
                true, PixelFormat.RGB565, 64, 40);
    }

    @Test
    void generatedChainRestartsAtEverySyncOfAStreamingLink() {
        LinkFormatGenerator.Link l = streaming();
        Map<String, Artifact> f = run(l);
        String md = text(f.get("hypotheses.md"));
        assertTrue(md.contains("boundaries from the sync alone: the link streams without pauses"), md);
        assertTrue(md.contains("The generated chain restarts the word alignment at every sync on a word boundary (`syncRestart`)"), md);
        JsonValue j = JsonScan.parse("hypotheses.json", text(f.get("hypotheses.json")));
        assertEquals("streaming", j.at("/bursts/boundaries").asString());
        assertEquals("110100111000101101100101", j.at("/sync/wire").asString());
        Map<String, Map<String, Object>> opts = chainOptions(f);
        assertEquals(true, opts.get("packet-link").get("syncRestart"));
        // 24-bit sync: two wrong bits match a random word boundary with probability (1 + 24 + 276) / 2^24 (binomial count)
        assertEquals(j.at("/bursts/restartAtSync/syncErrors").asDouble(), ((Long) opts.get("packet-link").get("syncErrors")).doubleValue());
        assertEquals(SyncTolerance.chance(24, (int) j.at("/bursts/restartAtSync/syncErrors").asDouble()),
                j.at("/bursts/restartAtSync/chancePerBoundary").asDouble(), 1e-12);
        assertEquals(301.0 / (1 << 24), SyncTolerance.chance(24, 2), 1e-15);
        assertEveryBurstWhole(l, opts);
    }

    @Test
    void withoutSyncRestartTheStreamingLinkIsNotCutIntoItsBursts() {
        LinkFormatGenerator.Link l = streaming();
        Map<String, Map<String, Object>> opts = chainOptions(run(l));
        opts.get("packet-link").remove("syncRestart");
        opts.get("packet-link").remove("syncErrors");
        List<WordStream> words = decode(l, opts);
        // one endless run of words, emitted in pieces as they come, not one stream per burst
        long whole = 0;
        for (int i = 0; i < words.size() && i < l.sentWire.size(); i++) {
            if (Arrays.equals(l.sentWords(i), Arrays.copyOf(words.get(i).values(), words.get(i).count()))) {
                whole++;
            }
        }
        assertTrue(whole < l.sentWire.size() / 2, whole + " of " + l.sentWire.size());
    }

    private static Map<String, Map<String, Object>> chainOptions(Map<String, Artifact> files) {
        JsonValue chain = JsonScan.parse("chain.json", text(files.get("chain.json")));
        Map<String, Map<String, Object>> opts = new HashMap<>();
        for (JsonValue node : chain.get("nodes").elements()) {
            Map<String, Object> o = new HashMap<>();
            node.get("options").members().forEach((k, v) -> o.put(k, v.isString() ? v.asString() : v.isBoolean() ? v.asBoolean()
                    : (Object) (long) v.asDouble()));
            opts.put(node.get("plugin").asString(), o);
        }
        return opts;
    }

    /** The generated chain's sampler and framed decoder, run through the chain engine, give every burst's words as sent. */
    private static void assertEveryBurstWhole(LinkFormatGenerator.Link l, Map<String, Map<String, Object>> opts) {
        List<WordStream> words = decode(l, opts);
        assertEquals(l.sentWire.size(), words.size(), "one word stream per burst");
        for (int i = 0; i < words.size(); i++) {
            WordStream w = words.get(i);
            assertArrayEquals(l.sentWords(i), Arrays.copyOf(w.values(), w.count()), "burst " + i);
        }
    }

    private static List<WordStream> decode(LinkFormatGenerator.Link l, Map<String, Map<String, Object>> opts) {
        PluginRegistry reg = new PluginRegistry().add(new DualEdgePlugin()).add(new PacketLinkPlugin());
        List<WordStream> words = new ArrayList<>();
        ChainBuilder b = Chain.builder(reg).input("clk", DataKind.EDGES).input("d0", DataKind.EDGES).input("d1", DataKind.EDGES)
                .add("sampler", "dual-edge", opts.get("dual-edge")).add("words", "packet-link", opts.get("packet-link"))
                .wire("clk", "sampler.clock").wire("d0", "sampler.lane0").wire("d1", "sampler.lane1")
                .wire("sampler.bits0", "words.bits0").wire("sampler.bits1", "words.bits1")
                .tap("words.packets", x -> words.add((WordStream) x));
        try (Chain c = b.build()) {
            c.push("clk", clockEdges(l.input));
            c.push("d0", laneEdges(l.input, 0));
            c.push("d1", laneEdges(l.input, 1));
            c.finish();
        }
        return words;
    }

    static Edges clockEdges(LinkEdgesInput in) {
        long[] t = new long[in.nRising() + in.nFalling()];
        System.arraycopy(in.risingFs(), 0, t, 0, in.nRising());
        System.arraycopy(in.fallingFs(), 0, t, in.nRising(), in.nFalling());
        Arrays.sort(t);
        return new Edges(in.clockName(), 0, t[t.length - 1] + 1_000_000, false, t, t.length, null, 0);
    }

    static Edges laneEdges(LinkEdgesInput in, int k) {
        long end = Math.max(in.risingFs()[in.nRising() - 1], in.fallingFs()[in.nFalling() - 1]) + 1_000_000;
        return new Edges(in.laneNames()[k], 0, end, in.laneInitial()[k], in.laneEdgesFs()[k], in.laneCounts()[k], null, 0);
    }

    private static String text(Artifact a) {
        return new String(a.content(), StandardCharsets.UTF_8);
    }

    private static Map<String, String> missing(Map<String, Artifact> f, String... names) {
        Map<String, String> m = new HashMap<>();
        for (String n : names) {
            if (!f.containsKey(n)) {
                m.put(n, "missing; got " + f.keySet());
            }
        }
        return m;
    }
}
