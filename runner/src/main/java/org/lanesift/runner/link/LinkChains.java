package org.lanesift.runner.link;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Chain models (docs/chain-file.md) for decoding a differential link: (1) estimate the skew
 * between the two legs of every pair, (2) correct it and estimate the skew of every data pair
 * against the clock pair, (3) correct both and decode. Either as three chain files run one after
 * another with skew table files between them (the demo), or as one chain file whose estimators
 * feed the corrections through calibration wires, so one run does all three
 * ({@link #pixelOneRun}, {@link #packetOneRun}; what {@code sift} writes).
 * The first pair is the clock; the others are the data lanes in lane order. Paths are written as
 * given (the {@code sift} command gives them relative to the chain file, the demo absolute).
 * The models are plain maps and lists, written with {@link ChainModels#write}.
 */
public final class LinkChains {
    /**
     * One differential pair.
     *
     * @param name the pair's name (used for the receiver and its output channel)
     * @param p    the capture channel of the P leg
     * @param n    the capture channel of the N leg
     */
    public record Pair(String name, String p, String n) {
    }

    /**
     * Where the chains read from.
     *
     * @param plugin capture reader plugin id: csv, vcd or raw
     * @param file   the capture file as it goes into the chain file
     * @param pairs  the clock pair first, then the data pairs in lane order
     */
    public record Capture(String plugin, String file, List<Pair> pairs) {
        /** Copies the list; at least a clock and one data pair. */
        public Capture {
            pairs = List.copyOf(pairs);
            if (pairs.size() < 2) {
                throw new IllegalArgumentException("a link needs a clock pair and at least one data pair, got " + pairs);
            }
        }

        int dataLanes() {
            return pairs.size() - 1;
        }
    }

    private final List<Map<String, Object>> nodes = new ArrayList<>();
    private final List<Map<String, Object>> wires = new ArrayList<>();
    private final String description;
    private final Capture cap;

    private LinkChains(String description, Capture cap) {
        this.description = description;
        this.cap = cap;
        node("cap", cap.plugin(), "file", cap.file());
    }

    private LinkChains node(String id, String plugin, Object... kv) {
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

    private LinkChains wire(String from, String to) {
        Map<String, Object> w = new LinkedHashMap<>(); // a fixed member order: chain files are byte-identical run to run
        w.put("from", from);
        w.put("to", to);
        wires.add(w);
        return this;
    }

    private Map<String, Object> model() {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("description", description);
        m.put("nodes", nodes);
        m.put("wires", wires);
        return m;
    }

    /** Analog leg deskew of every channel, then one differential receiver per pair. */
    private LinkChains receivers(String legTable, boolean packet) {
        return receivers(legTable, packet, List.of());
    }

    /**
     * As above; the pairs named in {@code withDiff} also give their difference P-N (output
     * {@code diff}) for the signal-integrity instances.
     */
    private LinkChains receivers(String legTable, boolean packet, List<String> withDiff) {
        List<Pair> pairs = cap.pairs();
        if (legTable == null) {
            // estimated in the same run: one legs table per pair, filled by the calibration pass
            node("legs", "deskew", "kind", "analog", "channels", 2 * pairs.size(), "tables", pairs.size(),
                    "minConfidence", SkewTables.MIN_CONFIDENCE);
            for (int k = 0; k < pairs.size(); k++) {
                wire("legs-" + pairs.get(k).name() + ".table", "legs.table" + k);
            }
        } else {
            node("legs", "deskew", "kind", "analog", "channels", 2 * pairs.size(), "offsetsFile", legTable);
        }
        for (int k = 0; k < pairs.size(); k++) {
            Pair pr = pairs.get(k);
            wire("cap." + pr.p(), "legs.in" + (2 * k)).wire("cap." + pr.n(), "legs.in" + (2 * k + 1));
            String id = "rx-" + pr.name();
            if (!packet && withDiff.contains(pr.name())) {
                node(id, "differential", "mode", "pair", "name", pr.name(), "levelProfile", "lvds", "diffOutput", true);
            } else if (!packet) {
                node(id, "differential", "mode", "pair", "name", pr.name(), "levelProfile", "lvds");
            } else if (k == 0) {
                node(id, "differential", "mode", "pair", "name", pr.name(), "levelProfile", "dphy-hs");
            } else {
                // data lanes spend most of the time in low-power states (difference near 0 V in LP-11):
                // a fixed threshold with hysteresis instead of one learned from the histogram; the
                // high-speed levels are checked here (the dphy-hs profile leaves LP-01/LP-10 samples
                // out of the level statistics), the low-power levels by the packet-link decoder
                node(id, "differential", "mode", "pair", "name", pr.name(), "thresholdVolts", 0.0, "hysteresisVolts", 0.05,
                        "levelProfile", "dphy-hs");
            }
            wire("legs.out" + (2 * k), id + ".p").wire("legs.out" + (2 * k + 1), id + ".n");
        }
        return this;
    }

    /** An instance id from a pair name: lower case, anything but letters and digits as '-'. */
    private static String idOf(String name) {
        String id = name.toLowerCase(java.util.Locale.ROOT).replaceAll("[^a-z0-9]+", "-").replaceAll("^-|-$", "");
        return id.isEmpty() ? "pair" : id;
    }

    /** {@code id}, or {@code id-si} when an instance of that id already exists. */
    private String freeId(String id) {
        for (Map<String, Object> n : nodes) {
            if (id.equals(n.get("id"))) {
                return id + "-si";
            }
        }
        return id;
    }

    private LinkChains laneDeskew(String laneTable) {
        List<Pair> pairs = cap.pairs();
        if (laneTable == null) {
            node("lanes", "deskew", "kind", "edges", "channels", pairs.size(), "tables", 1, "minConfidence",
                    SkewTables.MIN_CONFIDENCE);
            wire(LANE_ESTIMATE + ".table", "lanes.table0");
        } else {
            node("lanes", "deskew", "kind", "edges", "channels", pairs.size(), "offsetsFile", laneTable);
        }
        for (int k = 0; k < pairs.size(); k++) {
            wire("rx-" + pairs.get(k).name() + ".edges", "lanes.in" + k);
        }
        return this;
    }

    /**
     * Pass 1 of either link: one {@code skew-estimate} in legs mode per pair.
     *
     * @param description the chain's description
     * @param cap         the capture
     * @return the chain model
     */
    public static Map<String, Object> legs(String description, Capture cap) {
        return new LinkChains(description, cap).legEstimates().model();
    }

    private LinkChains legEstimates() {
        for (Pair p : cap.pairs()) {
            node("legs-" + p.name(), "skew-estimate", "mode", "legs");
            wire("cap." + p.p(), "legs-" + p.name() + ".p").wire("cap." + p.n(), "legs-" + p.name() + ".n");
        }
        return this;
    }

    /** Instance id of the lane estimator in a one-run chain. */
    static final String LANE_ESTIMATE = "lanes-estimate";

    /**
     * A 7:1 pixel link in one run: leg skews estimated and corrected, lane skews estimated on the
     * leg-corrected lanes and corrected, then decoded as {@link #pixelDecode} does. The engine runs
     * the estimators in calibration passes before the decode (docs/chain-file.md, "Calibration wires").
     *
     * @param description  the chain's description
     * @param cap          the capture
     * @param unitInterval the slot time as an option value, such as "7142.857ps"
     * @param mapping      the pixel-link slot mapping
     * @return the chain model
     */
    public static Map<String, Object> pixelOneRun(String description, Capture cap, String unitInterval, String mapping) {
        LinkChains c = new LinkChains(description, cap).legEstimates()
                .receivers(null, false, diffPairs(cap)).pixelLaneEstimate(LANE_ESTIMATE, unitInterval).laneDeskew(null);
        return c.pixelDecoders(mapping).model();
    }

    /**
     * A packet link in one run: leg and lane skews estimated and corrected in the same run, then
     * decoded as {@link #packetDecode} does.
     *
     * @param description the chain's description
     * @param cap         the capture
     * @return the chain model
     */
    public static Map<String, Object> packetOneRun(String description, Capture cap) {
        LinkChains c = new LinkChains(description, cap).legEstimates()
                .receivers(null, true).packetLaneEstimate(LANE_ESTIMATE).laneDeskew(null);
        return c.packetDecoders().model();
    }

    /**
     * A 7:1 pixel link from a logic capture (one channel per lane, no legs): lane skew estimated
     * on the logic edges and corrected in the same run, then 7:1 sampling, frames, timing and the
     * clock's jitter (the analog measurements need legs).
     *
     * @param description  the chain's description
     * @param cap          the capture; every pair's N channel is empty
     * @param unitInterval the slot time as an option value
     * @param mapping      the pixel-link slot mapping
     * @param logicBlocks  true when the reader gives LOGIC samples (a logic CSV), false for edge lists (VCD)
     * @return the chain model
     */
    public static Map<String, Object> pixelLogicOneRun(String description, Capture cap, String unitInterval, String mapping,
                                                       boolean logicBlocks) {
        LinkChains c = new LinkChains(description, cap);
        List<Pair> pairs = cap.pairs();
        if (logicBlocks) {
            c.node("edges", "logic-edges", "channels", pairs.size());
            for (int k = 0; k < pairs.size(); k++) {
                c.wire("cap." + pairs.get(k).p(), "edges.in" + k);
            }
        }
        int n = pairs.size();
        c.node(LANE_ESTIMATE, "skew-estimate", "mode", "lanes", "lanes", n, "unitInterval", unitInterval);
        for (int k = 0; k < n; k++) {
            c.wire(logicBlocks ? "edges.out" + k : "cap." + pairs.get(k).p(), LANE_ESTIMATE + ".lane" + k);
        }
        c.node("lanes", "deskew", "kind", "edges", "channels", n, "tables", 1, "minConfidence", SkewTables.MIN_CONFIDENCE);
        c.wire(LANE_ESTIMATE + ".table", "lanes.table0");
        for (int k = 0; k < n; k++) {
            c.wire(logicBlocks ? "edges.out" + k : "cap." + pairs.get(k).p(), "lanes.in" + k);
        }
        return c.pixelSampling(mapping).model();
    }

    /** Front-end kind of {@link #discovery} for one analog channel per signal, compared against its mid-level. */
    public static final String LEVELS = "LEVELS";
    /** Samples each {@link #LEVELS} receiver learns its two levels from (4 MiB of float samples per signal at most). */
    static final int LEVELS_WARMUP_SAMPLES = 1 << 20;

    /** Instance id of the discovery stage in a {@link #discovery} chain (its files are named after it). */
    public static final String DISCOVERY = "discovery";

    /**
     * Format discovery of an unknown clocked link ({@code link-discovery}, plugins/discovery) fed
     * with the edges of the clock and the data lanes, from any capture sift reads: analog legs
     * through the leg deskew (estimated in the same run) and one differential receiver per pair,
     * as {@link #pixelOneRun} does; a logic capture's samples through {@code logic-edges}; a VCD's
     * 1-bit signals as they are; one analog channel per signal (the 0/1 columns of a logic
     * analyser's CSV export, or a single-ended signal) through one {@code differential} receiver
     * in mode {@code single}, against the mid-level of its two levels. Analog legs also go to discovery as they are (option
     * {@code legs}), where the low-power/high-speed state pattern is sought in their levels.
     *
     * @param description the chain's description
     * @param cap         the capture; for a logic capture every pair's N channel is empty
     * @param logicKind   {@code LOGIC} (logic samples), {@code EDGES} (edge lists), {@link #LEVELS} (one analog channel per
     *                    signal) or null (analog legs)
     * @param options     the {@code link-discovery} options
     * @return the chain model
     */
    public static Map<String, Object> discovery(String description, Capture cap, String logicKind, Map<String, Object> options) {
        LinkChains c = new LinkChains(description, cap);
        List<Pair> pairs = cap.pairs();
        String[] from = new String[pairs.size()];
        if (logicKind == null) {
            c.legEstimates().receivers(null, false);
            for (int k = 0; k < pairs.size(); k++) {
                from[k] = "rx-" + pairs.get(k).name() + ".edges";
            }
        } else if (logicKind.equals(LEVELS)) {
            for (int k = 0; k < pairs.size(); k++) {
                String id = "rx-" + pairs.get(k).name();
                // logic or single-ended levels, not LVDS: no level checks; a long warm-up, so that a capture that
                // idles at one level for a while before the first edge still shows the receiver both levels
                c.node(id, "differential", "mode", "single", "name", pairs.get(k).name(), "levelProfile", "none",
                        "warmupSamples", LEVELS_WARMUP_SAMPLES);
                c.wire("cap." + pairs.get(k).p(), id + ".in");
                from[k] = id + ".edges";
            }
        } else if (logicKind.equals("LOGIC")) {
            c.node("edges", "logic-edges", "channels", pairs.size());
            for (int k = 0; k < pairs.size(); k++) {
                c.wire("cap." + pairs.get(k).p(), "edges.in" + k);
                from[k] = "edges.out" + k;
            }
        } else {
            for (int k = 0; k < pairs.size(); k++) {
                from[k] = "cap." + pairs.get(k).p();
            }
        }
        Map<String, Object> o = new LinkedHashMap<>(options);
        if (logicKind == null) {
            o.put("legs", true);
        }
        Map<String, Object> n = new LinkedHashMap<>();
        n.put("id", DISCOVERY);
        n.put("plugin", "link-discovery");
        n.put("options", o);
        c.nodes.add(n);
        c.wire(from[0], DISCOVERY + ".clock");
        for (int k = 1; k < pairs.size(); k++) {
            c.wire(from[k], DISCOVERY + ".lane" + (k - 1));
        }
        for (int k = 1; logicKind == null && k < pairs.size(); k++) {
            // the single-ended levels as captured: the state pattern lives in each leg's own level
            c.wire("cap." + pairs.get(k).p(), DISCOVERY + ".lane" + (k - 1) + "p").wire("cap." + pairs.get(k).n(), DISCOVERY + ".lane" + (k - 1) + "n");
        }
        return c.model();
    }

    /**
     * The chain {@code link-discovery} generated for decoding with its best hypothesis (it reads
     * the lanes from a VCD source {@code cap}, wired into {@code sampler.clock} and
     * {@code sampler.lane0..}), moved onto the capture a {@link #discovery} model reads: the
     * model's front end (every instance but the discovery stage) replaces the VCD source, and what
     * fed {@code discovery.clock} and {@code discovery.laneK} feeds {@code sampler.clock} and
     * {@code sampler.laneK}.
     *
     * @param model     a {@link #discovery} model whose capture path is as the generated chain should name it
     * @param generated the generated chain file, parsed
     * @return the chain model
     */
    public static Map<String, Object> onFront(Map<String, Object> model, org.lanesift.json.JsonValue generated) {
        Map<String, String> feeds = new LinkedHashMap<>();
        List<Object> nodes = new ArrayList<>();
        List<Object> wires = new ArrayList<>();
        for (Object n : (List<?>) model.get("nodes")) {
            if (!DISCOVERY.equals(((Map<?, ?>) n).get("id"))) {
                nodes.add(n);
            }
        }
        for (Object o : (List<?>) model.get("wires")) {
            Map<?, ?> w = (Map<?, ?>) o;
            String to = (String) w.get("to");
            if (to.startsWith(DISCOVERY + ".")) {
                feeds.put(to.substring(DISCOVERY.length() + 1), (String) w.get("from"));
            } else {
                wires.add(w);
            }
        }
        for (org.lanesift.json.JsonValue n : generated.get("nodes").elements()) {
            if (!"cap".equals(n.get("id").asString())) {
                nodes.add(n);
            }
        }
        for (org.lanesift.json.JsonValue w : generated.get("wires").elements()) {
            String from = w.get("from").asString();
            String to = w.get("to").asString();
            String feed = to.startsWith("sampler.") ? feeds.get(to.substring("sampler.".length())) : null;
            if (from.startsWith("cap.") && feed == null) {
                throw new IllegalStateException("generated chain: no front-end signal for wire " + from + " -> " + to);
            }
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("from", from.startsWith("cap.") ? feed : from);
            m.put("to", to);
            wires.add(m);
        }
        Map<String, Object> out = new LinkedHashMap<>();
        for (Map.Entry<String, org.lanesift.json.JsonValue> e : generated.members().entrySet()) {
            out.put(e.getKey(), e.getKey().equals("nodes") ? nodes : e.getKey().equals("wires") ? wires : e.getValue());
        }
        return out;
    }

    private static List<String> diffPairs(Capture cap) {
        return List.of(cap.pairs().get(1).name(), cap.pairs().get(Math.min(2, cap.pairs().size() - 1)).name());
    }

    /**
     * Pass 2 of a 7:1 pixel link: legs corrected, every lane (the clock included) aligned on the slot grid.
     *
     * @param description  the chain's description
     * @param cap          the capture
     * @param legTable     the merged leg skew table
     * @param unitInterval the slot time as an option value, such as "7142.857ps"
     * @return the chain model
     */
    public static Map<String, Object> pixelLanes(String description, Capture cap, String legTable, String unitInterval) {
        return new LinkChains(description, cap).receivers(legTable, false).pixelLaneEstimate("lanes", unitInterval).model();
    }

    private LinkChains pixelLaneEstimate(String id, String unitInterval) {
        int n = cap.pairs().size();
        // on a 7:1 link every lane, the clock included, changes only on bit-slot boundaries: align them on the slot grid
        node(id, "skew-estimate", "mode", "lanes", "lanes", n, "unitInterval", unitInterval);
        for (int k = 0; k < n; k++) {
            wire("rx-" + cap.pairs().get(k).name() + ".edges", id + ".lane" + k);
        }
        return this;
    }

    /**
     * Pass 3 of a 7:1 pixel link: both skews corrected; 7:1 sampling, frames, timing, eye, ringing, jitter.
     *
     * @param description the chain's description
     * @param cap         the capture
     * @param legTable    the merged leg skew table
     * @param laneTable   the merged lane skew table
     * @param mapping     the pixel-link slot mapping (bits-18, vesa-24 or jeida-24)
     * @return the chain model
     */
    public static Map<String, Object> pixelDecode(String description, Capture cap, String legTable, String laneTable,
                                                  String mapping) {
        return new LinkChains(description, cap).receivers(legTable, false, diffPairs(cap)).laneDeskew(laneTable)
                .pixelDecoders(mapping).model();
    }

    /** 7:1 sampling of the corrected lanes ({@code lanes.out0} the clock), frames and timing. */
    private LinkChains sevenToOne(String mapping) {
        int lanes = cap.dataLanes();
        node("sampler", "dual-edge", "mode", "multiplied", "slots", 7, "lanes", lanes);
        wire("lanes.out0", "sampler.clock");
        for (int k = 0; k < lanes; k++) {
            wire("lanes.out" + (k + 1), "sampler.lane" + k);
        }
        node("panel", "pixel-link", "mapping", mapping, "pictures", "all");
        for (int k = 0; k < lanes; k++) {
            wire("sampler.bits" + k, "panel.lane" + k);
        }
        return this;
    }

    /** 7:1 sampling, frames and timing, and the clock lane's jitter: what needs no analog signal. */
    private LinkChains pixelSampling(String mapping) {
        LinkChains c = sevenToOne(mapping);
        String jitter = c.freeId(idOf(cap.pairs().get(0).name()));
        c.node(jitter, "jitter", "edge", "rising");
        c.wire("lanes.out0", jitter + ".clock");
        return c;
    }

    private LinkChains pixelDecoders(String mapping) {
        LinkChains c = sevenToOne(mapping);
        // signal integrity, each instance named after the signal it measures, so its files read
        // "<signal>-<what>": the eye and the edge metrics look at the differential signal P-N of a
        // data pair (what the LVDS limits are defined on), the ringing at one leg of the clock,
        // because ringing comes from the ground lead of that leg's probe, and the jitter at the
        // clock lane's edges
        Pair clock = cap.pairs().get(0);
        Pair eyePair = cap.pairs().get(1);
        Pair edgePair = cap.pairs().get(Math.min(2, cap.pairs().size() - 1));
        String eye = c.freeId(idOf(eyePair.name()));
        c.node(eye, "eye-diagram", "clockEdge", "rising", "uiPerClockInterval", 7, "uiCount", 2);
        c.wire("rx-" + eyePair.name() + ".diff", eye + ".signal").wire("lanes.out0", eye + ".clock");
        String ring = c.freeId(idOf(clock.name()) + "-p");
        c.node(ring, "ringing");
        c.wire("cap." + clock.p(), ring + ".signal");
        String edges = c.freeId(idOf(edgePair.name()));
        c.node(edges, "edge-metrics");
        c.wire("rx-" + edgePair.name() + ".diff", edges + ".signal");
        String jitter = c.freeId(idOf(clock.name()));
        c.node(jitter, "jitter", "edge", "rising");
        c.wire("lanes.out0", jitter + ".clock");
        return c;
    }

    /**
     * Pass 2 of a packet link: legs corrected; data lanes against the DDR clock, edges centred in the bits.
     *
     * @param description the chain's description
     * @param cap         the capture
     * @param legTable    the merged leg skew table
     * @return the chain model
     */
    public static Map<String, Object> packetLanes(String description, Capture cap, String legTable) {
        return new LinkChains(description, cap).receivers(legTable, true).packetLaneEstimate("lanes").model();
    }

    private LinkChains packetLaneEstimate(String id) {
        int lanes = cap.dataLanes();
        // the clock's edges sit in the middle of the data bits, and data change on both clock edges
        node(id, "skew-estimate", "mode", "clock", "lanes", lanes, "alignment", "centre", "ddr", true);
        wire("rx-" + cap.pairs().get(0).name() + ".edges", id + ".clock");
        for (int k = 0; k < lanes; k++) {
            wire("rx-" + cap.pairs().get(k + 1).name() + ".edges", id + ".lane" + k);
        }
        return this;
    }

    /**
     * Pass 3 of a packet link: skews corrected; DDR sampling, packets, commands, init sequence, frames.
     *
     * @param description the chain's description
     * @param cap         the capture
     * @param legTable    the merged leg skew table
     * @param laneTable   the merged lane skew table
     * @return the chain model
     */
    public static Map<String, Object> packetDecode(String description, Capture cap, String legTable, String laneTable) {
        return new LinkChains(description, cap).receivers(legTable, true).laneDeskew(laneTable).packetDecoders().model();
    }

    private LinkChains packetDecoders() {
        LinkChains c = this;
        int lanes = cap.dataLanes();
        c.node("sampler", "dual-edge", "mode", "ddr", "lanes", lanes, "alignment", "center", "marginFindings", "decoder");
        c.wire("lanes.out0", "sampler.clock");
        for (int k = 0; k < lanes; k++) {
            c.wire("lanes.out" + (k + 1), "sampler.lane" + k);
        }
        c.node("dsi", "packet-link", "lanes", lanes);
        for (int k = 0; k < lanes; k++) {
            Pair p = cap.pairs().get(k + 1);
            c.wire("cap." + p.p(), "dsi.lane" + k + "p").wire("cap." + p.n(), "dsi.lane" + k + "n");
        }
        for (int k = 0; k < lanes; k++) {
            c.wire("sampler.bits" + k, "dsi.bits" + k);
        }
        return c;
    }
}
