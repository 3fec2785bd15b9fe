package org.lanesift.dist.sift;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.kit.FramePictures;

/**
 * End to end from the command line: one 7:1 link with a repeating picture, captured as a two-channel
 * instrument would, in three acquisitions (the clock and the lane with the sync bits; that lane and
 * lane 0; that lane and lane 1), each triggered at another frame with its own trigger offset,
 * sample phase, probe skews and timing noise. The capture set (docs/capture-set.md) aligns them on
 * the shared lane to a fraction of a sample and decodes pixel-exact, from logic acquisitions and from a
 * scope's analog P legs alike. Content that does not repeat,
 * a shared channel that repeats every clock, acquisitions at another rate and an acquisition
 * without the shared channel are refused with exit 2 and one line naming the acquisition.
 */
class CaptureSetDecodeTest {
    /** 1 GS/s: 5.7 samples per 5.714 ns unit interval, room for the skews of channels from different acquisitions. */
    static final double RATE_HZ = 1e9;
    static final int SAMPLES = (int) (3.4 * LogicLink.FRAME_S * RATE_HZ);

    /** One two-channel acquisition: where it starts on the link and the delays of its two channels. */
    record Acq(String name, int[] lanes, String[] names, double startS, double[] delayS) {
    }

    static void write(Path dir, LogicLink link, Acq a, double rateHz, long seed) throws IOException {
        Random rnd = new Random(seed);
        boolean[][] ch = new boolean[2][];
        for (int k = 0; k < 2; k++) {
            ch[k] = link.sample(a.lanes()[k], a.startS(), rateHz, SAMPLES, a.delayS()[k], 40e-12, rnd);
        }
        Files.write(dir.resolve(a.name() + ".bin"), LogicLink.logic8(ch, new int[] {0, 1}, new Random(seed + 1)));
        Files.writeString(dir.resolve(a.name() + ".bin.json"), "{\"rateHz\": " + rateHz + ", \"format\": \"logic8\", \"channels\": ["
                + "{\"name\": \"" + a.names()[0] + "\", \"bit\": 0}, {\"name\": \"" + a.names()[1] + "\", \"bit\": 1}]}");
    }

    static Path setFile(Path dir, String shared, String... acqs) throws IOException {
        StringBuilder sb = new StringBuilder("{\"format\": \"lanesift-capture-set/1\", \"shared\": \"" + shared + "\", \"acquisitions\": [");
        for (int i = 0; i < acqs.length; i++) {
            sb.append(i == 0 ? "" : ", ").append("{\"name\": \"").append(acqs[i]).append("\", \"file\": \"").append(acqs[i]).append(".bin\"}");
        }
        Path p = dir.resolve("bench.set.json");
        Files.writeString(p, sb.append("]}").toString());
        return p;
    }

    static Path chain(Path dir, Path set) throws IOException {
        Path c = dir.resolve("chain.json");
        // recipe 3 of docs/fewer-channels.md, taken from the page, with this test's set file
        Files.writeString(c, FewerChannelsTest.chainOf("## 3. Two channels").replace("bench.set.json", set.getFileName().toString()));
        return c;
    }

    /** The three acquisitions: another frame each, trigger offsets of tens of ns, their own skews. */
    static List<Acq> acquisitions() {
        double f = LogicLink.FRAME_S;
        return List.of(
                new Acq("a1", new int[] {0, 3}, new String[] {"PCLK", "RX2"}, 0.23e-9, new double[] {0, 80e-12}),
                new Acq("a2", new int[] {3, 1}, new String[] {"RX2", "RX0"}, 2 * f + 37.31e-9, new double[] {-50e-12, 120e-12}),
                new Acq("a3", new int[] {3, 2}, new String[] {"RX2", "RX1"}, 5 * f - 61.77e-9, new double[] {30e-12, -90e-12}));
    }

    @Test
    void threeTwoChannelAcquisitionsDecodePixelExact(@TempDir Path dir) throws IOException {
        LogicLink link = new LogicLink(2207);
        List<Acq> acqs = acquisitions();
        for (int i = 0; i < acqs.size(); i++) {
            write(dir, link, acqs.get(i), RATE_HZ, 100 + i);
        }
        Path set = setFile(dir, "RX2", "a1", "a2", "a3");
        Path out = dir.resolve("out");
        SiftTest.Run r = SiftTest.lanesift("run", chain(dir, set).toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err());
        for (int fr = 1; fr <= 2; fr++) {
            SiftTest.assertFrameExact(out.resolve(FramePictures.fileName("panel", fr, false)), link.gen.frames.get(0));
        }
        // the alignment each acquisition got: file time of a transition is (link time - start + delay), so
        // acquisition k's shared transitions come (start1 - startk) + (delayk - delay1) later, modulo whole frames
        Map<String, Double> offsetFs = new HashMap<>();
        for (String line : Files.readAllLines(out.resolve("annotations.jsonl"))) {
            JsonValue a = JsonReader.parse("annotations.jsonl", line);
            if (a.get("kind").asString().equals("set-alignment")) {
                offsetFs.put(a.at("/fields/acquisition/value").asString(), a.at("/fields/offsetFs/value").asDouble());
                assertTrue(a.at("/fields/matched/value").asDouble() > 0.9, line);
            }
        }
        assertEquals(List.of("a2", "a3"), new ArrayList<>(new java.util.TreeSet<>(offsetFs.keySet())));
        for (int k = 1; k < 3; k++) {
            Acq a = acqs.get(k);
            double want = acqs.get(0).startS() - a.startS() + a.delayS()[0] - acqs.get(0).delayS()[1];
            want -= Math.rint(want / LogicLink.FRAME_S) * LogicLink.FRAME_S;
            // to a fifth of the 1 ns sample period
            assertEquals(want * 1e15, offsetFs.get(a.name()), 200e3, a.name());
        }

        // plan checks the set as one capture: four channels at 1 GS/s, the clock, two frames' length
        SiftTest.Run plan = SiftTest.lanesift("plan", "--clock", "25MHz", "--lanes", "3", "--frames", "2", "--frame-rate",
                String.valueOf(1 / LogicLink.FRAME_S), "--capture", set.toString(), "--json");
        assertEquals(0, plan.code(), plan.out() + plan.err());
        List<String> verdicts = new ArrayList<>();
        for (JsonValue c : JsonReader.parse("plan", plan.out()).get("checks").elements()) {
            verdicts.add(c.get("rule").asString() + ": " + c.get("verdict").asString());
        }
        assertEquals(List.of("sample rate to decode: meets", "sample rate to measure edges and eyes: not_judged", "record length: meets",
                "channels: meets", "clock: meets"), verdicts);
    }

    /** The same three acquisitions taken by a two-channel scope on the P legs: analog, 2.5 GS/s, float32. */
    @Test
    void threeTwoChannelScopeAcquisitionsOfPLegsDecodePixelExact(@TempDir Path dir) throws IOException {
        LogicLink link = new LogicLink(4409);
        double rate = 2.5e9;
        int n = (int) (3.4 * LogicLink.FRAME_S * rate);
        List<Acq> acqs = acquisitions();
        for (int i = 0; i < acqs.size(); i++) {
            Acq a = acqs.get(i);
            Random rnd = new Random(200 + i);
            java.nio.ByteBuffer bb = java.nio.ByteBuffer.allocate(8 * n).order(java.nio.ByteOrder.LITTLE_ENDIAN);
            float[] c0 = link.leg(a.lanes()[0], a.startS(), rate, n, a.delayS()[0], 0.5e-9, 0.005, rnd);
            float[] c1 = link.leg(a.lanes()[1], a.startS(), rate, n, a.delayS()[1], 0.5e-9, 0.005, rnd);
            for (int k = 0; k < n; k++) {
                bb.putFloat(c0[k]).putFloat(c1[k]);
            }
            Files.write(dir.resolve(a.name() + ".bin"), bb.array());
            Files.writeString(dir.resolve(a.name() + ".bin.json"), "{\"rateHz\": 2.5e9, \"format\": \"float32le\", \"channels\": ["
                    + "{\"name\": \"" + a.names()[0] + "\"}, {\"name\": \"" + a.names()[1] + "\"}]}");
        }
        Path set = setFile(dir, "RX2", "a1", "a2", "a3");
        // recipe 3 of docs/fewer-channels.md with analog acquisitions: one differential in mode single per channel
        String chain = FewerChannelsTest.chainOf("## 1. Four channels")
                .replace("{\"id\": \"cap\", \"plugin\": \"csv\", \"options\": {\"file\": \"p-legs.csv\"}}",
                        "{\"id\": \"cap\", \"plugin\": \"capture-set\", \"options\": {\"file\": \"" + set.getFileName() + "\"}}")
                .replace("_P\"", "\"");
        Files.writeString(dir.resolve("chain.json"), chain);
        Path out = dir.resolve("out");
        SiftTest.Run r = SiftTest.lanesift("run", dir.resolve("chain.json").toString(), "--out", out.toString(), "--quiet");
        assertEquals(0, r.code(), r.err() + chain);
        for (int fr = 1; fr <= 2; fr++) {
            SiftTest.assertFrameExact(out.resolve(FramePictures.fileName("panel", fr, false)), link.gen.frames.get(0));
        }
    }

    @Test
    void contentThatDoesNotRepeatOrRepeatsTooOftenIsRefusedNamingTheAcquisition(@TempDir Path dir) throws IOException {
        LogicLink link = new LogicLink(2207);
        List<Acq> acqs = acquisitions();
        write(dir, link, acqs.get(0), RATE_HZ, 1);
        write(dir, link, acqs.get(1), RATE_HZ, 2);
        // the probe meant for the sync lane sits on lane 0 in the third acquisition: other content
        Acq a3 = acqs.get(2);
        write(dir, link, new Acq("a3", new int[] {1, 2}, a3.names(), a3.startS(), a3.delayS()), RATE_HZ, 3);
        SiftTest.Run r = SiftTest.lanesift("run", chain(dir, setFile(dir, "RX2", "a1", "a2", "a3")).toString(), "--out",
                dir.resolve("o1").toString(), "--quiet");
        assertEquals(2, r.code(), r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().contains("bench.set.json: acquisition 'a3': the shared channel 'RX2' does not repeat what 'a1' holds"), r.err());

        // the clock in every acquisition: it repeats every 40 ns, so any whole clock period fits
        double f = LogicLink.FRAME_S;
        write(dir, link, new Acq("c1", new int[] {0, 3}, new String[] {"PCLK", "RX2"}, 0, new double[] {0, 0}), RATE_HZ, 4);
        write(dir, link, new Acq("c2", new int[] {0, 1}, new String[] {"PCLK", "RX0"}, f + 13e-9, new double[] {0, 0}), RATE_HZ, 5);
        write(dir, link, new Acq("c3", new int[] {0, 2}, new String[] {"PCLK", "RX1"}, 2 * f, new double[] {0, 0}), RATE_HZ, 6);
        SiftTest.Run amb = SiftTest.lanesift("run", chain(dir, setFile(dir, "PCLK", "c1", "c2", "c3")).toString(), "--out",
                dir.resolve("o2").toString(), "--quiet");
        assertEquals(2, amb.code(), amb.err());
        assertEquals(1, amb.err().lines().count(), amb.err());
        assertTrue(amb.err().contains("acquisition 'c2': the shared channel 'PCLK' aligns ambiguously on 'c1'"), amb.err());
    }

    @Test
    void acquisitionsAtAnotherRateOrWithoutTheSharedChannelAreBadInput(@TempDir Path dir) throws IOException {
        LogicLink link = new LogicLink(2207);
        List<Acq> acqs = acquisitions();
        write(dir, link, acqs.get(0), RATE_HZ, 1);
        write(dir, link, acqs.get(1), 0.8e9, 2);
        write(dir, link, acqs.get(2), RATE_HZ, 3);
        SiftTest.Run r = SiftTest.lanesift("run", chain(dir, setFile(dir, "RX2", "a1", "a2", "a3")).toString(), "--out",
                dir.resolve("o1").toString(), "--quiet");
        assertEquals(2, r.code(), r.err());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.err().contains("bench.set.json: acquisition 'a2' is sampled at 800.0 MS/s, the reference 'a1' at 1.000 GS/s;"
                + " expected every acquisition at the same sample rate"), r.err());

        write(dir, link, acqs.get(1), RATE_HZ, 2);
        write(dir, link, new Acq("a3", new int[] {0, 2}, new String[] {"CLK2", "RX1"}, 0, new double[] {0, 0}), RATE_HZ, 3);
        SiftTest.Run none = SiftTest.lanesift("run", chain(dir, setFile(dir, "RX2", "a1", "a2", "a3")).toString(), "--out",
                dir.resolve("o2").toString(), "--quiet");
        assertEquals(2, none.code(), none.err());
        assertEquals(1, none.err().lines().count(), none.err());
        assertTrue(none.err().contains("bench.set.json: acquisition 'a3' (a3.bin) has no channel 'RX2' (its channels: CLK2, RX1);"
                + " expected every acquisition to hold the shared channel"), none.err());
    }
}
