package org.lanesift.plugins.packetlink;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.DataKind;
import org.lanesift.kit.LineStateClassifier;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.time.TimeValue;

/**
 * Plugin {@code packet-link}: decodes packet links with low-power states between high-speed
 * bursts (the MIPI D-PHY / DSI family, profile {@code dsi}) into packets, display commands, an
 * init sequence and frames; profile {@code framed} cuts any similar proprietary link into words.
 *
 * <p><b>Inputs</b>, per lane {@code k} (0 to {@code lanes - 1}): {@code lane{k}p} and
 * {@code lane{k}n} (ANALOG, volts) are the two single-ended legs, used for the line states;
 * {@code bits{k}} (BITS) are the lane's high-speed bits sampled on both clock edges. Only bits
 * whose sample time falls inside a high-speed interval of their lane are used, and only those are
 * checked for timing margins: each run of bits the sampler flagged there is one {@code margin-low}
 * warning naming the lane (the sampler leaves that check to this plugin with its option
 * {@code marginFindings = decoder}; between bursts the lanes sit in low-power states). With
 * {@code profile=framed, lpStates=false} the analog inputs are absent and every bit is used.
 *
 * <p><b>Outputs</b>: {@code packets} (WORDS: one 8-bit word per burst byte, lanes merged, with
 * lane and flags; in the framed profile one word of {@code wordBits}), {@code frames} (FRAME) and
 * {@code files} (ARTIFACT: {@code <id>-commands.json}, {@code <id>-commands.csv},
 * {@code <id>-packets.jsonl}, {@code <id>-packets.csv} (every packet, docs/packet-export.md),
 * {@code <id>-init.h}, {@code <id>-timing.json}, {@code <id>-frame-NNNN.png}; framed profile:
 * {@code <id>-words.csv} and {@code <id>-bursts.jsonl}).
 *
 * <p><b>Chain</b> (two data lanes, legs probed single-ended; the clock and data pairs go through
 * the {@code differential} plugin and the {@code dual-edge} sampler):
 *
 * <pre>{@code
 * {"nodes": [
 *   {"id": "cap", "plugin": "csv", "options": {"file": "captures/packet-link.csv"}},
 *   {"id": "rx-HSCLK", "plugin": "differential", "options": {"mode": "pair", "name": "HSCLK", "levelProfile": "dphy-hs"}},
 *   {"id": "rx-L0", "plugin": "differential", "options": {"mode": "pair", "name": "L0", "thresholdVolts": 0.0, "levelProfile": "none"}},
 *   {"id": "rx-L1", "plugin": "differential", "options": {"mode": "pair", "name": "L1", "thresholdVolts": 0.0, "levelProfile": "none"}},
 *   {"id": "sampler", "plugin": "dual-edge", "options": {"mode": "ddr", "lanes": 2, "marginFindings": "decoder"}},
 *   {"id": "dsi", "plugin": "packet-link", "options": {"lanes": 2}}],
 *  "wires": [
 *   {"from": "cap.HSCLK_P", "to": "rx-HSCLK.p"}, {"from": "cap.HSCLK_N", "to": "rx-HSCLK.n"},
 *   {"from": "cap.L0_P", "to": "rx-L0.p"}, {"from": "cap.L0_N", "to": "rx-L0.n"},
 *   {"from": "cap.L1_P", "to": "rx-L1.p"}, {"from": "cap.L1_N", "to": "rx-L1.n"},
 *   {"from": "rx-HSCLK.edges", "to": "sampler.clock"},
 *   {"from": "rx-L0.edges", "to": "sampler.lane0"}, {"from": "rx-L1.edges", "to": "sampler.lane1"},
 *   {"from": "cap.L0_P", "to": "dsi.lane0p"}, {"from": "cap.L0_N", "to": "dsi.lane0n"},
 *   {"from": "cap.L1_P", "to": "dsi.lane1p"}, {"from": "cap.L1_N", "to": "dsi.lane1n"},
 *   {"from": "sampler.bits0", "to": "dsi.bits0"}, {"from": "sampler.bits1", "to": "dsi.bits1"}]}
 * }</pre>
 *
 * (The chain of the demo's packet link without its skew-correction passes; see the module README.)
 */
public final class PacketLinkPlugin implements PluginProvider {
    /** The plugin id. */
    public static final String ID = "packet-link";

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Packet link decoder")
            .version("0.1.0")
            .description("Line states, high-speed bursts, packets, display commands, init sequence and frames of "
                    + "D-PHY/DSI-like packet links; a generic framed-link profile for unknown links.")
            .option(OptionSpec.integer("lanes", 1L, 1, 4, "number of data lanes"))
            .option(OptionSpec.choice("profile", "dsi", "dsi: MIPI DSI packets; framed: generic sync + words", "dsi", "framed"))
            .option(OptionSpec.number("lpHighVolts", "V", LineStateClassifier.DEFAULT_HIGH_VOLTS, 0.0, 5.0, "low-power receiver high threshold (D-PHY, from memory)"))
            .option(OptionSpec.number("lpLowVolts", "V", LineStateClassifier.DEFAULT_LOW_VOLTS, 0.0, 5.0, "low-power receiver low threshold (D-PHY, from memory)"))
            .option(OptionSpec.number("hsCommonMinVolts", "V", LineStateClassifier.DEFAULT_HS_COMMON_MIN_VOLTS, 0.0, 5.0, "lowest common mode counted as high speed"))
            .option(OptionSpec.number("hsCommonMaxVolts", "V", LineStateClassifier.DEFAULT_HS_COMMON_MAX_VOLTS, 0.0, 5.0, "highest common mode counted as high speed"))
            .option(OptionSpec.time("minStateTime", TimeValue.Unit.NS, "30ns", "a line state must last this long to count"))
            .option(OptionSpec.bool("lpStates", true, "framed profile: lanes have low-power states (analog legs wired)"))
            .option(OptionSpec.text("syncPattern", "B8", "framed profile: sync pattern in hex (empty: none)"))
            .option(OptionSpec.integer("syncBits", 8L, 0, 64, "framed profile: length of the sync pattern in bits"))
            .option(OptionSpec.integer("wordBits", 8L, 1, 64, "framed profile: bits per word"))
            .option(OptionSpec.choice("bitOrder", "lsb", "framed profile: first bit on the wire is the word's lsb or msb", "lsb", "msb"))
            .option(OptionSpec.choice("laneDistribution", "word", "framed profile: word k on lane k mod N (word), or each lane its own stream (independent)",
                    "word", "independent"))
            .option(OptionSpec.integer("groupWords", 0L, 0, 1 << 20, "framed profile: words per group; the sync is sought again after each (0: no groups)"))
            .option(OptionSpec.time("burstGap", TimeValue.Unit.NS, "0ns",
                    "framed profile without line states: a pause longer than this between two sampled bits (the clock stopped) ends a burst; 0: off"))
            .option(OptionSpec.integer("idleBits", 0L, 0, 1 << 20,
                    "framed profile without line states: a run of at least this many equal bits (the idle level) ends a burst; 0: off"))
            .option(OptionSpec.bool("syncRestart", false,
                    "framed profile without line states: every occurrence of the sync pattern on a word boundary starts a new burst"
                    + " (word alignment restarts there; streaming links whose bursts follow each other with no pause)"))
            .option(OptionSpec.integer("syncErrors", 0L, 0, 8,
                    "framed profile: bits of the sync pattern that may differ from it where it is sought (fewer than a quarter of syncBits)"))
            .option(OptionSpec.bool("dropTrail", true, "framed profile: drop the final run of equal bits of each burst (the trail)"))
            .option(OptionSpec.integer("pngFrames", 8L, 0, 100000, "frames written as PNG (the first N)"))
            .option(OptionSpec.integer("maxBurstBytes", 8L << 20, 64, 1L << 28, "largest burst kept per lane, bytes"))
            .option(OptionSpec.integer("maxLogEntries", 200000L, 1, 100000000, "commands (or framed words) kept for the exports"))
            .option(OptionSpec.integer("maxFramePixels", 1L << 24, 1, 1L << 28, "largest frame assembled, pixels"))
            .inputs(PacketLinkPlugin::inputs)
            .output(PortSpec.of("packets", DataKind.WORDS, "burst bytes (dsi) or words (framed) with lane and flags"))
            .output(PortSpec.of("frames", DataKind.FRAME, "frames from video-mode streams and command-mode memory writes"))
            .output(PortSpec.of("files", DataKind.ARTIFACT, "command log, packet export, init sequence, timing report, frame PNGs, word CSV"))
            .build();

    /** Creates the provider (stateless). */
    public PacketLinkPlugin() {
    }

    static List<PortSpec> inputs(OptionValues o) {
        int lanes = o.getInt("lanes");
        boolean lp = o.getString("profile").equals("dsi") || o.getBoolean("lpStates");
        List<PortSpec> in = new ArrayList<>();
        for (int k = 0; k < lanes; k++) {
            if (lp) {
                in.add(PortSpec.of("lane" + k + "p", DataKind.ANALOG, "lane " + k + " positive leg, single-ended, volts"));
                in.add(PortSpec.of("lane" + k + "n", DataKind.ANALOG, "lane " + k + " negative leg, single-ended, volts"));
            }
            // with line states, the margins of flagged bits inside bursts go into the margin-low findings
            // (MarginRuns); without, only values, times and flags are read
            in.add(PortSpec.of("bits" + k, DataKind.BITS, "lane " + k + " high-speed bits, sampled on both clock edges")
                    .readingBitMargins(lp));
        }
        return in;
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) {
        return new PacketLinkStage(context, LinkConfig.of(DESCRIPTOR, context.options()));
    }
}
