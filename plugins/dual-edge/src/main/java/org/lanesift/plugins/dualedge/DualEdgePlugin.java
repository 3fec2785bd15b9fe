package org.lanesift.plugins.dualedge;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.time.TimeValue;

/**
 * The clocked sampler (plugin id {@code dual-edge}): recovers a clock from a clock lane's edges,
 * samples up to 16 data lanes against it and gives every bit its sample time, clock edge and setup
 * and hold margins.
 *
 * <p><b>Ports.</b> Inputs {@code clock} and {@code lane0 .. lane{N-1}} (edge lists, N = option
 * {@code lanes}); outputs {@code bits0 .. bits{N-1}} ({@link org.lanesift.data.BitStream}) and
 * {@code report} (an artifact {@code <instance>-margins.json}). Every call emits one bit-stream block
 * per lane for the same run of clock edges, so lanes can be merged bit by bit. The arrays
 * {@code timesFs}, {@code clockEdge}, {@code falling} and {@code slot} of one call are shared by the
 * blocks of all lanes (blocks are immutable). A lane's blocks carry their per-bit margins
 * ({@code setupFs}, {@code holdFs}) only when something that receives them reads them (host-api
 * {@code StageContext.wantsBitMargins}, asked at the first block); otherwise they go without
 * ({@code BitStream.hasMargins()} false). The margins are measured either way: the flags, the
 * {@code margin-low} findings and the report do not depend on it.
 *
 * <p><b>Clock recovery.</b> The period is first estimated as the median of 32 same-direction edge
 * intervals, then tracked edge by edge (exponential average over 16 periods). A pulse shorter than
 * {@code glitchFraction} of the period is a glitch: both of its edges are ignored and annotated
 * ({@code clock-glitch}). A same-direction interval, or an edge-to-edge gap, longer than
 * {@code dropoutPeriods} periods ends the clock ({@code clock-dropout}); no bit is made inside the
 * gap, and the clock is acquired afresh after it ({@code clock-restart}). Clock edges are numbered
 * from 0 in the order they were accepted (glitches are not counted, missing edges are not invented).
 * A transition inside an unknown span of the clock or exactly at its end (the level-restoring one a
 * producer places there, or the one placed at a block start after a gap with a level jump) is no
 * clock edge: it gives no bit and takes no part in the period, glitch or dropout checks, so the
 * clock starts at its first true edge after a capture's unknown start; across an unknown span the
 * true edges either side are compared as usual.
 *
 * <p><b>Modes.</b> {@code ddr}: one bit per clock edge, unit interval (UI) = period / 2;
 * {@code rising} or {@code falling}: one bit per rising or falling edge, UI = period. The nominal sample
 * point is the clock edge for centre-aligned data ({@code alignment = center}) or half a UI after it
 * for edge-aligned data ({@code alignment = edge}); option {@code phase} (ps, ns, samples or UI) moves
 * it, and {@code autoPhase} replaces the phase by the centre of the widest transition-free window
 * found over the first {@code searchBits} bits of all lanes (within half a UI of the nominal point).
 *
 * <p><b>Multiplied mode</b> ({@code mode = multiplied}): {@code slots} bit slots (UI = period / slots)
 * per clock period, for 7:1 pixel links. The clock lane's level in each slot is
 * {@code clockPattern}, slot 0 first; for 7 slots it defaults to {@code 1100011}: high in slots 0-1
 * and 5-6, low in 2-4. The rising clock edge therefore starts slot 5 of the previous pixel, and slot 0
 * starts 2/7 of a period after it:
 * <pre>
 *   slot     5   6 | 0   1   2   3   4   5   6 | 0   1
 *   clock  __/-------------\___________/-------------\___
 *            ^ rising edge r(k)         ^ rising edge r(k+1)
 *            |&lt;- 2/7 -&gt;|&lt;---- pixel with clockEdge = k ---&gt;|
 *   data     |   |   | 0 | 1 | 2 | 3 | 4 | 5 | 6 |   |
 *                      ^ slot j sampled at its centre:
 *                        r(k) + (2 + j + 0.5) / 7 * (r(k+1) - r(k)) + phase
 *                        (slots past r(k+1) are placed from r(k+1) with the same period)
 * </pre>
 * All seven slots of one pixel carry the same {@code clockEdge}: the number of the rising (reference)
 * edge before slot 0, counted from the start of the capture and identical on every lane. Before
 * using a clock the sampler measures its duty cycle (median over 16 periods): within 0.3 slot of
 * 4/7 high confirms the pattern ({@code clock-pattern}); within 0.3 slot of 3/7 means the clock lane is inverted, which is annotated
 * ({@code clock-inverted}) and handled by taking the falling edges as reference edges (the bits are
 * then marked {@code falling}); anything else is annotated {@code clock-duty-unexpected}. A pixel is
 * made only when the clock ran without a dropout from its reference edge to past its last slot.
 *
 * <p><b>Margins.</b> The setup margin of a bit is the time from the last data transition before its
 * sample point, the hold margin the time to the next transition after it, both in femtoseconds and
 * counted only within one UI ({@link org.lanesift.data.BitStream#UNKNOWN_MARGIN} otherwise). The
 * edges of an unknown span count as transitions. A bit is flagged when a margin is below
 * {@code marginThreshold} UI (default 0.15), when it was sampled in an unknown span or outside the
 * lane's capture, or when its clock edge lies next to an unknown span of the clock. Runs of flagged
 * bits are annotated ({@code margin-low}), naming the lane; with {@code marginFindings = decoder} they are
 * only flagged in the bit stream, and the decoder reports those inside the spans where the lane carries
 * data (a packet link's data lanes sit in low-power states between bursts, where a transition lands at
 * any phase of a clock that keeps running: no margin applies there). The report holds per lane the minimum, percentiles and a
 * histogram of both margins.
 *
 * <p><b>Guards</b> (docs/sampling-rate.md). Edges that lie on a sample grid coarser than half a UI
 * (a logic capture below 2 samples per unit interval) stop the run as bad input naming the minimum
 * rate. A lane whose transitions sit more than 0.35 UI from the mid-points between sample points may
 * be skewed by more than half a UI: it is named once ({@code lane-skew-ambiguous}, an error) and
 * all its bits are flagged, instead of {@code margin-low} runs.
 *
 * <p><b>Findings named downstream.</b> The bit streams name the findings behind what a decoder will
 * see in them ({@link org.lanesift.data.BitStream#causes()}): a lane's {@code lane-skew-ambiguous}
 * for its flagged bits from that block on, and each {@code clock-dropout} or {@code clock-glitch}
 * (on the first blocks made after it, every lane) for the clock break around it. Only findings
 * that were made are named, so a decoder reports as its own finding what none of them covers.
 */
public final class DualEdgePlugin implements PluginProvider {
    /** The plugin id used in chain files. */
    public static final String ID = "dual-edge";
    /** Default margin threshold, UI. */
    static final double DEFAULT_MARGIN_THRESHOLD_UI = 0.15;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Clocked sampler (DDR, single edge, multiplied clock)")
            .version("0.1.0")
            .description("Recovers the clock from a clock lane's edges and samples data lanes on both clock edges, one edge,"
                    + " or N slots per clock period (7:1 pixel links); every bit gets its sample time, clock edge index and"
                    + " setup/hold margins; low margins are flagged and summarised per lane in a JSON report.")
            .option(OptionSpec.integer("lanes", 1L, 1, 16, "number of data lanes sampled against the clock"))
            .option(OptionSpec.choice("mode", "ddr", "ddr: both clock edges; rising or falling: one edge; multiplied:"
                    + " 'slots' bits per clock period", "ddr", "rising", "falling", "multiplied"))
            .option(OptionSpec.integer("slots", 7L, 2, 16, "multiplied mode: bit slots per clock period"))
            .option(OptionSpec.text("clockPattern", "", "multiplied mode: clock level per slot, slot 0 first"
                    + " (default 1100011 for 7 slots)"))
            .option(OptionSpec.choice("alignment", "center", "center: data transitions between clock edges (sample at the"
                    + " edge); edge: transitions at the clock edges (sample half a UI later)", "center", "edge"))
            .option(OptionSpec.time("phase", TimeValue.Unit.UI, "0UI", "offset of the sample point from the nominal point"
                    + " (ps, ns, samples or UI, within one UI)"))
            .option(OptionSpec.bool("autoPhase", false, "sample at the centre of the widest transition-free window found"
                    + " over the first 'searchBits' bits (replaces 'phase')"))
            .option(OptionSpec.integer("searchBits", 8192L, 16, 10_000_000, "bits per lane at the start of the capture"
                    + " used by autoPhase, and (at most 8192 of them) to judge each lane's skew"))
            .option(OptionSpec.number("marginThreshold", "UI", DEFAULT_MARGIN_THRESHOLD_UI, 0.0, 0.5, "setup or hold margins below this fraction"
                    + " of a UI are flagged"))
            .option(OptionSpec.number("glitchFraction", "", 0.2, 0.0, 0.45, "clock pulses shorter than this fraction of the"
                    + " period are glitches and ignored (0 disables)"))
            .option(OptionSpec.number("dropoutPeriods", "", 1.5, 1.1, 1.0e6, "a clock gap longer than this many periods"
                    + " ends the clock (no bits are made across it)"))
            .option(OptionSpec.choice("marginFindings", "sampler", "sampler: runs of flagged bits are annotated here"
                    + " (margin-low); decoder: the bits are flagged, and the decoder that knows where a lane carries data"
                    + " (packet-link: inside high-speed bursts) reports them", "sampler", "decoder"))
            .option(OptionSpec.time("samplePeriod", TimeValue.Unit.PS, "0ps", "capture sample period, needed only when"
                    + " 'phase' is given in samples"))
            .inputs(o -> {
                List<PortSpec> in = new ArrayList<>();
                in.add(PortSpec.of("clock", DataKind.EDGES, "edges of the clock lane"));
                for (int i = 0; i < o.getInt("lanes"); i++) {
                    in.add(PortSpec.of("lane" + i, DataKind.EDGES, "edges of data lane " + i));
                }
                return in;
            })
            .outputs(o -> {
                List<PortSpec> out = new ArrayList<>();
                for (int i = 0; i < o.getInt("lanes"); i++) {
                    out.add(PortSpec.of("bits" + i, DataKind.BITS, "bits of lane " + i + " with times, flags and margins"
                            + " (margins only when a receiver reads them)"));
                }
                out.add(PortSpec.of("report", DataKind.ARTIFACT, "<instance>-margins.json: margins, clock and phase summary"));
                return out;
            })
            .build();

    /** Creates the provider (stateless). */
    public DualEdgePlugin() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) {
        return new DualEdgeStage(context, SamplerConfig.from(context.options()));
    }
}
