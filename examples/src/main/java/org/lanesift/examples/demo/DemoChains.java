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
 * (3) correct both and decode. Every path in them is relative to the chain file's folder, so the
 * output folder can be moved or copied whole.
 */
final class DemoChains {
    private final List<Map<String, Object>> nodes = new ArrayList<>();
    private final List<Map<String, Object>> wires = new ArrayList<>();
    private final String description;
    private final Path chainDir;

    private DemoChains(Path chainDir, String description) {
        this.chainDir = chainDir.toAbsolutePath().normalize();
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
        Map<String, Object> w = new LinkedHashMap<>(); // a fixed member order: the chain files are byte-identical run to run
        w.put("from", from);
        w.put("to", to);
        wires.add(w);
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

    /** A path as the chain file names it: relative to the chain file's folder, '/' between names on every system. */
    private String rel(Path p) {
        Path r = chainDir.relativize(p.toAbsolutePath().normalize());
        return r.toString().replace(java.io.File.separatorChar, '/');
    }

    private DemoChains capture(String plugin, Path file) {
        return node("cap", plugin, "file", rel(file));
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
        return receivers(pairs, legTable, packet, List.of());
    }

    /**
     * As above; the pairs named in {@code withDiff} also give their difference P-N (output
     * {@code diff}) for the signal-integrity instances.
     */
    private DemoChains receivers(String[][] pairs, Path legTable, boolean packet, List<String> withDiff) {
        node("legs", "deskew", "kind", "analog", "channels", 2 * pairs.length, "offsetsFile", rel(legTable));
        for (int k = 0; k < pairs.length; k++) {
            wire("cap." + pairs[k][1], "legs.in" + (2 * k)).wire("cap." + pairs[k][2], "legs.in" + (2 * k + 1));
            String id = "rx-" + pairs[k][0];
            if (!packet && withDiff.contains(pairs[k][0])) {
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "levelProfile", "lvds", "diffOutput", true);
            } else if (!packet) {
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "levelProfile", "lvds");
            } else if (k == 0) {
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "levelProfile", "dphy-hs");
            } else {
                // data lanes spend most of the time in low-power states (difference near 0 V in LP-11):
                // a fixed threshold with hysteresis instead of one learned from the histogram; the
                // low-power levels are checked by the packet-link decoder, not here
                node(id, "differential", "mode", "pair", "name", pairs[k][0], "thresholdVolts", 0.0, "hysteresisVolts", 0.05,
                        "levelProfile", "none");
            }
            wire("legs.out" + (2 * k), id + ".p").wire("legs.out" + (2 * k + 1), id + ".n");
        }
        return this;
    }

    static Map<String, Object> pixelLegs(Path chainDir, Path capture) {
        return new DemoChains(chainDir, "demo pixel link, pass 1: skew between the two legs of each pair")
                .capture("raw", capture).legEstimates(PIXEL_PAIRS).model();
    }

    static Map<String, Object> pixelLanes(Path chainDir, Path capture, Path legTable) {
        DemoChains c = new DemoChains(chainDir, "demo pixel link, pass 2: legs corrected; skew of each data pair against the clock pair")
                .capture("raw", capture).receivers(PIXEL_PAIRS, legTable, false);
        // on a 7:1 link every lane, the clock included, changes only on bit-slot boundaries: align them on the slot grid
        c.node("lanes", "skew-estimate", "mode", "lanes", "lanes", 4, "unitInterval", "7142.857ps");
        for (int k = 0; k < 4; k++) {
            c.wire("rx-" + PIXEL_PAIRS[k][0] + ".edges", "lanes.lane" + k);
        }
        return c.model();
    }

    static Map<String, Object> pixelDecode(Path chainDir, Path capture, Path legTable, Path laneTable) {
        DemoChains c = new DemoChains(chainDir, "demo pixel link, pass 3: both skews corrected; 7:1 sampling, frames, timing, eye, ringing, jitter")
                .capture("raw", capture).receivers(PIXEL_PAIRS, legTable, false, List.of("D0", "D1"));
        c.node("lanes", "deskew", "kind", "edges", "channels", 4, "offsetsFile", c.rel(laneTable));
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
        // signal integrity, each instance named after the signal it measures, so its files read
        // "<signal>-<what>": the eye and the edge metrics look at the differential signal P-N of a
        // pair (what the LVDS limits are defined on), the ringing at one leg, because the ringing
        // comes from the ground lead of that leg's probe, and the jitter at the clock lane's edges
        c.node("d0", "eye-diagram", "clockEdge", "rising", "uiPerClockInterval", 7, "uiCount", 2);
        c.wire("rx-D0.diff", "d0.signal").wire("lanes.out0", "d0.clock");
        c.node("clk-p", "ringing");
        c.wire("cap.CLK_P", "clk-p.signal");
        c.node("d1", "edge-metrics");
        c.wire("rx-D1.diff", "d1.signal");
        c.node("clk", "jitter", "edge", "rising");
        c.wire("lanes.out0", "clk.clock");
        return c.model();
    }

    static Map<String, Object> packetLegs(Path chainDir, Path capture) {
        return new DemoChains(chainDir, "demo packet link, pass 1: skew between the two legs of each pair")
                .capture("csv", capture).legEstimates(PACKET_PAIRS).model();
    }

    static Map<String, Object> packetLanes(Path chainDir, Path capture, Path legTable) {
        DemoChains c = new DemoChains(chainDir, "demo packet link, pass 2: legs corrected; skew of each data lane against the clock")
                .capture("csv", capture).receivers(PACKET_PAIRS, legTable, true);
        // the clock's edges sit in the middle of the data bits, and data change on both clock edges
        c.node("lanes", "skew-estimate", "mode", "clock", "lanes", 2, "alignment", "centre", "ddr", true);
        c.wire("rx-HSCLK.edges", "lanes.clock").wire("rx-L0.edges", "lanes.lane0").wire("rx-L1.edges", "lanes.lane1");
        return c.model();
    }

    static Map<String, Object> packetDecode(Path chainDir, Path capture, Path legTable, Path laneTable) {
        DemoChains c = new DemoChains(chainDir, "demo packet link, pass 3: skews corrected; DDR sampling, packets, commands, init sequence, frames")
                .capture("csv", capture).receivers(PACKET_PAIRS, legTable, true);
        c.node("lanes", "deskew", "kind", "edges", "channels", 3, "offsetsFile", c.rel(laneTable));
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
