package org.lanesift.runner.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.ToolHarness;

/** The planning figures against values worked by hand, each with its rule; and the check of a capture. */
class PlanToolTest {
    @TempDir
    Path dir;

    static Map<String, Double> figures(ToolHarness.Result r) {
        assertEquals(0, r.code(), r.err());
        JsonValue j = JsonReader.parse("plan", r.out());
        Map<String, Double> m = new LinkedHashMap<>();
        for (JsonValue f : j.get("figures").elements()) {
            m.put(f.get("name").asString(), f.get("value").asDouble());
        }
        return m;
    }

    @Test
    void aPixelLinkAt25MHzWorkedByHand() {
        Map<String, Double> f = figures(ToolHarness.of(new PlanTool()).option("clock", "25MHz").option("lanes", "3")
                .option("frames", "2").option("json", "true").run());
        // Source: docs/reference-facts.md#pixel-link-clock-and-slot-mappings: UI = clock period / 7 = 40 ns / 7
        assertEquals(5.714285714e-9, f.get("unitIntervalS"), 1e-17);
        assertEquals(175e6, f.get("laneBitRate"), 1);
        // docs/sampling-rate.md: 2 samples per UI -> 2 / 5.714 ns = 350 MS/s
        assertEquals(350e6, f.get("decodeRateHz"), 1);
        // docs/reference-facts.md#edge-rates-of-the-link-standards: LVDS at least 0.26 ns (from memory)
        assertEquals(0.26e-9, f.get("riseTimeS"), 1e-18);
        // common practice (docs/reference-facts.md#probe-and-bench-rules-of-thumb): 0.35 / 0.26 ns = 1.3462 GHz
        assertEquals(1.3462e9, f.get("passBandwidthHz"), 1e5);
        // a third of the rise time: 0.35 / 0.08667 ns = 4.0385 GHz; 2.5 samples per Hz: 10.096 GS/s
        assertEquals(4.0385e9, f.get("measureBandwidthHz"), 1e5);
        assertEquals(10.096e9, f.get("measureRateHz"), 1e6);
        // two complete frames at 60 Hz: (2 + 1) / 60 = 50 ms; at 350 MS/s 17.5 M samples
        assertEquals(0.05, f.get("recordS"), 1e-12);
        assertEquals(17.5e6, f.get("recordSamplesDecode"), 1);
    }

    @Test
    void aPacketLinkAt500MHzWithAGivenRiseTimeWorkedByHand() {
        Map<String, Double> f = figures(ToolHarness.of(new PlanTool()).option("link", "packet").option("clock", "500MHz")
                .option("lanes", "2").option("rise-time", "150ps").option("json", "true").run());
        // Source: docs/reference-facts.md#d-phy-levels-and-states: data on both clock edges, UI = 2 ns / 2 = 1 ns
        assertEquals(1e-9, f.get("unitIntervalS"), 1e-18);
        assertEquals(2e9, f.get("decodeRateHz"), 1);
        // 0.35 / 150 ps = 2.3333 GHz; / (50 ps) = 7 GHz; x 2.5 = 17.5 GS/s
        assertEquals(2.3333e9, f.get("passBandwidthHz"), 1e5);
        assertEquals(7e9, f.get("measureBandwidthHz"), 1);
        assertEquals(17.5e9, f.get("measureRateHz"), 10);
    }

    /** A packed logic capture of a 25 MHz 7:1 clock and one lane, at {@code rateHz} for {@code seconds}. */
    Path logicCapture(String name, double rateHz, double seconds) throws IOException {
        int n = (int) (rateHz * seconds);
        byte[] b = new byte[n];
        Random r = new Random(3);
        int[] clock = {1, 1, 0, 0, 0, 1, 1};
        double ui = 40e-9 / 7;
        int slotBits = 0;
        long lastSlot = -1;
        for (int i = 0; i < n; i++) {
            long slot = (long) Math.floor(i / rateHz / ui);
            if (slot != lastSlot) {
                slotBits = r.nextInt(2);
                lastSlot = slot;
            }
            b[i] = (byte) (clock[(int) (slot % 7)] | slotBits << 1);
        }
        Path f = dir.resolve(name);
        Files.write(f, b);
        Files.writeString(dir.resolve(name + ".json"), "{\"rateHz\": " + rateHz + ", \"format\": \"logic8\", \"channels\": ["
                + "{\"name\": \"CLK\", \"bit\": 0}, {\"name\": \"D0\", \"bit\": 1}]}");
        return f;
    }

    static Map<String, String> verdicts(ToolHarness.Result r) {
        JsonValue j = JsonReader.parse("plan", r.out());
        Map<String, String> m = new LinkedHashMap<>();
        for (JsonValue c : j.get("checks").elements()) {
            m.put(c.get("rule").asString(), c.get("verdict").asString());
        }
        return m;
    }

    @Test
    void aCaptureIsCheckedAgainstTheSameRules() throws IOException {
        // one frame at 20 kHz needs 2 / 20 kHz = 100 us
        Path good = logicCapture("good.bin", 500e6, 120e-6);
        ToolHarness.Result ok = ToolHarness.of(new PlanTool()).option("clock", "25MHz").option("lanes", "1")
                .option("frame-rate", "20kHz").option("capture", good.toString()).option("json", "true").run();
        assertEquals(0, ok.code(), ok.out() + ok.err());
        Map<String, String> v = verdicts(ok);
        assertEquals("meets", v.get("sample rate to decode"));
        assertEquals("meets", v.get("record length"));
        assertEquals("meets", v.get("channels"));
        assertEquals("meets", v.get("clock"));
        assertEquals("not_judged", v.get("sample rate to measure edges and eyes"));

        // 300 MS/s is 1.71 samples per 5.714 ns UI (< 2), 60 us is short of 100 us, and 2 channels are
        // fewer than a clock and 3 lanes
        Path slow = logicCapture("slow.bin", 300e6, 60e-6);
        ToolHarness.Result bad = ToolHarness.of(new PlanTool()).option("clock", "25MHz").option("lanes", "3")
                .option("frame-rate", "20kHz").option("capture", slow.toString()).option("json", "true").run();
        assertEquals(PlanTool.EXIT_FAILS, bad.code(), bad.out() + bad.err());
        v = verdicts(bad);
        assertEquals("fails", v.get("sample rate to decode"));
        assertEquals("fails", v.get("record length"));
        assertEquals("fails", v.get("channels"));
        assertEquals("meets", v.get("clock"));
        String text = ToolHarness.of(new PlanTool()).option("clock", "25MHz").option("lanes", "3").option("frame-rate", "20kHz")
                .option("capture", slow.toString()).run().out();
        assertTrue(text.contains("1.71 samples per unit interval of 5.714 ns; at least 2 needed, so at least 350.0 MS/s"), text);
        assertTrue(text.contains("Safety:"), text);

        // a clock other than the one found fails the clock rule
        ToolHarness.Result other = ToolHarness.of(new PlanTool()).option("clock", "27MHz").option("lanes", "1")
                .option("frame-rate", "20kHz").option("capture", good.toString()).option("json", "true").run();
        assertEquals("fails", verdicts(other).get("clock"));
    }

    @Test
    void aMissingCaptureIsBadInput() {
        ToolHarness.Result r = ToolHarness.of(new PlanTool()).option("clock", "25MHz").option("capture", dir.resolve("none.bin").toString()).run();
        assertEquals(2, r.code());
        assertTrue(r.err().contains("none.bin: no such file"), r.err());
    }
}
