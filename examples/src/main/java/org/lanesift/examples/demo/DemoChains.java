package org.lanesift.examples.demo;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The chain files the demo writes and runs, in the chain-file model (docs/chain-file.md). Each
 * link is decoded in three passes, as a practitioner would: (1) estimate the skew between the two
 * legs of every pair, (2) correct it and estimate the skew of every data pair against the clock,
 * (3) correct both and decode.
 */
final class DemoChains {
    private final List<Map<String, Object>> nodes = new ArrayList<>();
    private final List<Map<String, Object>> wires = new ArrayList<>();
    private final String description;

    private DemoChains(String description) {
        this.description = description;
    }

    private DemoChains node(String id, String plugin, Object... kv) {
        Map<String, Object> o = new LinkedHashMap<>();
        for (int i = 0; i < kv.length; i += 2) {
            o.put((String) kv[i], kv[i + 1]);
        }
        Map<String, Object> n = new LinkedHashMap<>();
        n.put("id", id);
        n.put("plugin", plugin);
        n.put("options", o);
        nodes.add(n);
        return this;
    }

    private DemoChains wire(String from, String to) {
        wires.add(Map.of("from", from, "to", to));
        return this;
    }

    Map<String, Object> model() {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("description", description);
        m.put("nodes", nodes);
        m.put("wires", wires);
        return m;
    }

    /** Pixel link pairs: output name, P leg, N leg. */
    static final String[][] PIXEL_PAIRS = {{"CLK", "CLK_P", "CLK_N"}, {"D0", "D0_P", "D0_N"}, {"D1", "D1_P", "D1_N"},
        {"D2", "D2_P", "D2_N"}};
    /** Packet link pairs. */
    static final String[][] PACKET_PAIRS = {{"HSCLK", "HSCLK_P", "HSCLK_N"}, {"L0", "L0_P", "L0_N"}, {"L1", "L1_P", "L1_N"}};

    private static String abs(Path p) {
        return p.toAbsolutePath().normalize().toString();
    }

    private DemoChains capture(String plugin, Path file) {
        return node("cap", plugin, "file", abs(file));
    }

    private DemoChains legEstimates(String[][] pairs) {
        for (String[] p : pairs) {
            node("legs-" + p[0], "skew-estimate", "mode", "legs");
            wire("cap." + p[1], "legs-" + p[0] + ".p").wire("cap." + p[2], "legs-" + p[0] + ".n");
        }
        return this;
    }

    /** Analog leg deskew of every channel, then one differential receiver per pair. */
    private DemoChains receivers(String[][] pairs, Path legTable, boolean packet) {
        node("legs", "deskew", "kind", "analog", "channels", 2 * pairs.length, "offsetsFile", abs(legTable));
        for (int k = 0; k < pairs.length; k++) {
            wire("cap." + pairs[k][1], "legs.in" + (2 * k)).wire("cap." + pairs[k][2], "legs.in" + (2 * k + 1));
            String id = "rx-" + pairs[k][0];
            if (!packet) {
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "levelProfile", "lvds");
            } else if (k == 0) {
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "levelProfile", "dphy-hs");
            } else {
                // data lanes spend most of the time in low-power states (difference near 0 V in LP-11):
                // a fixed threshold with hysteresis instead of one learned from the histogram; the
                // high-speed levels are checked here (the dphy-hs profile leaves LP-01/LP-10 samples
                // out of the level statistics), the low-power levels by the packet-link decoder
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "thresholdVolts", 0.0, "hysteresisVolts", 0.05,
                        "levelProfile", "dphy-hs");
            }
            wire("legs.out" + (2 * k), id + ".p").wire("legs.out" + (2 * k + 1), id + ".n");
        }
        return this;
    }

    static Map<String, Object> pixelLegs(Path capture) {
        return new DemoChains("demo pixel link, pass 1: skew between the two legs of each pair")
                .capture("raw", capture).legEstimates(PIXEL_PAIRS).model();
    }

    static Map<String, Object> pixelLanes(Path capture, Path legTable) {
        DemoChains c = new DemoChains("demo pixel link, pass 2: legs corrected; skew of each data pair against the clock pair")
                .capture("raw", capture).receivers(PIXEL_PAIRS, legTable, false);
        // on a 7:1 link every lane, the clock included, changes only on bit-slot boundaries: align them on the slot grid
        c.node("lanes", "skew-estimate", "mode", "lanes", "lanes", 4, "unitInterval", "7142.857ps");
        for (int k = 0; k < 4; k++) {
            c.wire("rx-" + PIXEL_PAIRS[k][0] + ".edges", "lanes.lane" + k);
        }
        return c.model();
    }

    static Map<String, Object> pixelDecode(Path capture, Path legTable, Path laneTable) {
        DemoChains c = new DemoChains("demo pixel link, pass 3: both skews corrected; 7:1 sampling, frames, timing, eye, ringing, jitter")
                .capture("raw", capture).receivers(PIXEL_PAIRS, legTable, false);
        c.node("lanes", "deskew", "kind", "edges", "channels", 4, "offsetsFile", abs(laneTable));
        for (int k = 0; k < 4; k++) {
            c.wire("rx-" + PIXEL_PAIRS[k][0] + ".edges", "lanes.in" + k);
        }
        c.node("sampler", "dual-edge", "mode", "multiplied", "slots", 7, "lanes", 3);
        c.wire("lanes.out0", "sampler.clock");
        for (int k = 0; k < 3; k++) {
            c.wire("lanes.out" + (k + 1), "sampler.lane" + k);
        }
        c.node("panel", "pixel-link", "mapping", "bits-18", "pictures", "all");
        for (int k = 0; k < 3; k++) {
            c.wire("sampler.bits" + k, "panel.lane" + k);
        }
        c.node("eye", "eye-diagram", "clockEdge", "rising", "uiPerClockInterval", 7, "uiCount", 2);
        c.wire("legs.out2", "eye.signal").wire("lanes.out0", "eye.clock");
        c.node("ring", "ringing");
        c.wire("cap.CLK_P", "ring.signal");
        c.node("edges", "edge-metrics");
        c.wire("cap.D0_P", "edges.signal");
        c.node("jitter", "jitter", "edge", "rising");
        c.wire("lanes.out0", "jitter.clock");
        return c.model();
    }

    static Map<String, Object> packetLegs(Path capture) {
        return new DemoChains("demo packet link, pass 1: skew between the two legs of each pair")
                .capture("csv", capture).legEstimates(PACKET_PAIRS).model();
    }

    static Map<String, Object> packetLanes(Path capture, Path legTable) {
        DemoChains c = new DemoChains("demo packet link, pass 2: legs corrected; skew of each data lane against the clock")
                .capture("csv", capture).receivers(PACKET_PAIRS, legTable, true);
        // the clock's edges sit in the middle of the data bits, and data change on both clock edges
        c.node("lanes", "skew-estimate", "mode", "clock", "lanes", 2, "alignment", "centre", "ddr", true);
        c.wire("rx-HSCLK.edges", "lanes.clock").wire("rx-L0.edges", "lanes.lane0").wire("rx-L1.edges", "lanes.lane1");
        return c.model();
    }

    static Map<String, Object> packetDecode(Path capture, Path legTable, Path laneTable) {
        DemoChains c = new DemoChains("demo packet link, pass 3: skews corrected; DDR sampling, packets, commands, init sequence, frames")
                .capture("csv", capture).receivers(PACKET_PAIRS, legTable, true);
        c.node("lanes", "deskew", "kind", "edges", "channels", 3, "offsetsFile", abs(laneTable));
        for (int k = 0; k < 3; k++) {
            c.wire("rx-" + PACKET_PAIRS[k][0] + ".edges", "lanes.in" + k);
        }
        c.node("sampler", "dual-edge", "mode", "ddr", "lanes", 2, "alignment", "center");
        c.wire("lanes.out0", "sampler.clock").wire("lanes.out1", "sampler.lane0").wire("lanes.out2", "sampler.lane1");
        c.node("dsi", "packet-link", "lanes", 2);
        c.wire("cap.L0_P", "dsi.lane0p").wire("cap.L0_N", "dsi.lane0n").wire("cap.L1_P", "dsi.lane1p").wire("cap.L1_N", "dsi.lane1n");
        c.wire("sampler.bits0", "dsi.bits0").wire("sampler.bits1", "dsi.bits1");
        return c.model();
    }
}
