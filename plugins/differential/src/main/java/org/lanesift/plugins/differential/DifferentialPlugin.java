package org.lanesift.plugins.differential;

import java.util.List;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.time.TimeValue;

/**
 * Plugin {@code differential}: turns a differential pair into one clean logic signal with
 * interpolated edge times, and checks its electrical levels.
 *
 * <p><b>Modes</b> (option {@code mode}): {@code pair} takes the two legs {@code p} and {@code n}
 * (ANALOG, volts) and compares {@code p - n}; {@code differential} takes one channel {@code in}
 * from a differential probe (volts); {@code single} takes one leg {@code in} and compares it
 * against a reference (the mid-level of its two levels, its median, or {@code referenceVolts});
 * {@code logic-pair} takes {@code p} and {@code n} as LOGIC channels, follows {@code p} and marks
 * samples where both legs agree as invalid.
 *
 * <p><b>Comparator.</b> Threshold {@code thresholdVolts} and total hysteresis width
 * {@code hysteresisVolts} (the output goes high above threshold + hysteresis/2 and low below
 * threshold - hysteresis/2). Absent, the threshold is the midpoint of the two dominant levels of the
 * histogram of the first {@code warmupSamples} samples, and the hysteresis is
 * {@code hysteresisFraction} of the swing between them; output is held back until the warm-up is
 * complete, so results do not depend on how the capture is cut into blocks. Learned levels then
 * follow slow drift: at the end of every window of {@code windowSamples} samples they move toward
 * the window's settled levels by {@code 1 - exp(-window / adaptTimeConstant)} (a first-order
 * filter with that time constant; 0 switches it off).
 *
 * <p><b>Outputs.</b> {@code edges} (EDGES): each confirmed transition is timed where the signal
 * crossed the threshold itself, interpolated between samples ({@code interpolation} linear, or
 * cubic through four samples); runs of invalid input samples become unknown spans and produce no
 * edges. {@code logic} (LOGIC): the comparator state at each input sample time. {@code report}
 * (ARTIFACT): {@code <instance>-levels.json} with levels, common mode, spread, overshoot and
 * undershoot for the whole capture and per window, checked against {@code levelProfile}
 * ({@code lvds}: ANSI/TIA/EIA-644-A; {@code dphy-hs}, {@code dphy-lp}: MIPI D-PHY); findings are
 * annotations with severities. Mode {@code pair} can add {@code diff} (ANALOG, option
 * {@code diffOutput}): the difference P-N at each aligned sample time, the signal the LVDS and
 * D-PHY differential limits (VOD, eye, edges) are defined on, and {@code common} (ANALOG, option
 * {@code commonOutput}): the common mode (P+N)/2 (docs/reference-facts.md#lvds-electrical-levels,
 * #d-phy-levels-and-states). Both are as wired (options {@code invert} and {@code detectSwap} turn
 * the logic, not these), start with the comparator's first output sample, and mark a sample
 * invalid where either leg is.
 *
 * <p><b>Lent blocks.</b> The stages read a received block only during {@code accept} and copy what
 * they keep (a leg waiting for the other, the warm-up, the comparator's history), so the plugin
 * declares {@link PluginDescriptor.Builder#readsLentBlocks()}: a raw or packed-logic source may
 * reuse its arrays for the blocks it sends here.
 *
 * <p><b>Caution.</b> Probing a live link: keep within the voltage and power limits of the scope
 * input (a 50-ohm input in particular), do not tie the scope ground to a mains-referenced circuit,
 * and handle display flex cables with ESD protection; local codes and licensed practice come first.
 */
public final class DifferentialPlugin implements PluginProvider {
    /** The plugin id used in chain files. */
    public static final String ID = "differential";

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Differential to logic, with level checks")
            .version("0.1.0")
            .description("Turns a differential pair (two analog legs, one differential-probe channel, one leg against a"
                    + " reference, or two logic channels) into one logic signal and an edge list with interpolated"
                    + " crossing times; reports levels and checks them against LVDS or MIPI D-PHY limits.")
            .option(OptionSpec.choice("mode", "pair", "what is probed: pair (analog p and n), differential (one"
                    + " differential-probe channel), single (one leg against a reference), logic-pair (p and n as logic)",
                    "pair", "differential", "single", "logic-pair"))
            .option(OptionSpec.text("name", "", "name of the output channel; empty means the instance id"))
            .option(OptionSpec.number("thresholdVolts", "V", Double.NaN, -100.0, 100.0,
                    "comparator threshold on the difference; absent means learned from the levels"))
            .option(OptionSpec.number("hysteresisVolts", "V", Double.NaN, 0.0, 100.0,
                    "total width of the hysteresis band; absent means hysteresisFraction of the swing"))
            .option(OptionSpec.number("hysteresisFraction", "", 0.1, 0.0, 0.9,
                    "hysteresis as a fraction of the swing between the two levels, when hysteresisVolts is absent"))
            .option(OptionSpec.choice("reference", "mid-level", "mode single: compare the leg against the mid-level of"
                    + " its two levels, its median, or referenceVolts (fixed)", "mid-level", "median", "fixed"))
            .option(OptionSpec.number("referenceVolts", "V", Double.NaN, -100.0, 100.0,
                    "mode single with reference=fixed: the reference level"))
            .option(OptionSpec.bool("invert", false, "invert the output polarity"))
            .option(OptionSpec.bool("detectSwap", false, "detect swapped legs from swapPattern over the warm-up and"
                    + " correct the polarity (annotated)"))
            .option(OptionSpec.choice("swapPattern", "clock-1100011", "what the signal is known to do: a 7:1 pixel-link"
                    + " clock lane (high 4 of 7 slots), or a line that idles high or low", "clock-1100011", "idle-high", "idle-low"))
            .option(OptionSpec.choice("interpolation", "linear", "edge time between samples: linear, or cubic through"
                    + " four samples", "linear", "cubic"))
            .option(OptionSpec.choice("levelProfile", "lvds", "limits the levels are checked against", "lvds", "dphy-hs",
                    "dphy-lp", "none"))
            .option(OptionSpec.integer("windowSamples", 65536L, 256, 1L << 26,
                    "samples per window of the level statistics and of drift adaptation"))
            .option(OptionSpec.time("adaptTimeConstant", TimeValue.Unit.SAMPLES, "1000000samples",
                    "time constant of the drift adaptation of learned levels; 0 switches it off"))
            .option(OptionSpec.integer("warmupSamples", 8192L, 64, 1L << 22,
                    "samples learned from before any output, when threshold or hysteresis are learned"))
            .option(OptionSpec.integer("statsStride", 16L, 1, 1024,
                    "level statistics use one sample in each run of n, at a position in the run chosen by a hash of"
                    + " its index, so that no signal period aliases with the choice (1 takes every sample, for exact overshoot peaks)"))
            .option(OptionSpec.bool("levelReport", true, "capture-wide level report: per-window level checks, the level"
                    + " summary and <instance>-levels.json; false leaves them out (needed to decode in segments)"))
            .option(OptionSpec.bool("diffOutput", false, "mode pair: add output 'diff', the difference P-N of the aligned"
                    + " legs in volts (what the eye, edge metrics and differential level limits look at); off by default"
                    + " because run writes every unwired analog output to a CSV file"))
            .option(OptionSpec.bool("commonOutput", false, "mode pair: add output 'common', the common mode (P+N)/2 of"
                    + " the aligned legs in volts"))
            .inputs(DifferentialPlugin::inputs)
            .segments(DifferentialPlugin::segments)
            .outputs(DifferentialPlugin::outputs)
            .readsLentBlocks()
            .build();

    /** Name of the optional output carrying P-N. */
    static final String OUT_DIFF = "diff";
    /** Name of the optional output carrying (P+N)/2. */
    static final String OUT_COMMON = "common";

    /** Creates the provider (stateless). */
    public DifferentialPlugin() {
    }

    private static List<PortSpec> outputs(OptionValues o) {
        List<PortSpec> out = new java.util.ArrayList<>(List.of(
                PortSpec.of("edges", DataKind.EDGES, "transitions with interpolated times; unknown spans where input was invalid"),
                PortSpec.of("logic", DataKind.LOGIC, "comparator output at the input sample times"),
                PortSpec.of("report", DataKind.ARTIFACT, "<instance>-levels.json: levels per capture and per window")));
        boolean pair = o.getString("mode").equals("pair");
        if (pair && o.getBoolean("diffOutput")) {
            out.add(PortSpec.of(OUT_DIFF, DataKind.ANALOG, "P-N of the aligned legs, volts, channel '<name> (P-N)'"));
        }
        if (pair && o.getBoolean("commonOutput")) {
            out.add(PortSpec.of(OUT_COMMON, DataKind.ANALOG, "(P+N)/2 of the aligned legs, volts, channel '<name> (P+N)/2'"));
        }
        return out;
    }

    private static List<PortSpec> inputs(OptionValues o) {
        return switch (o.getString("mode")) {
            case "differential" -> List.of(PortSpec.of("in", DataKind.ANALOG, "differential-probe channel, volts"));
            case "single" -> List.of(PortSpec.of("in", DataKind.ANALOG, "one leg, volts"));
            case "logic-pair" -> List.of(PortSpec.of("p", DataKind.LOGIC, "positive leg as logic"),
                    PortSpec.of("n", DataKind.LOGIC, "negative leg as logic"));
            default -> List.of(PortSpec.of("p", DataKind.ANALOG, "positive leg, volts"),
                    PortSpec.of("n", DataKind.ANALOG, "negative leg, volts"));
        };
    }

    /**
     * With a fixed threshold and hysteresis the comparator's only state is its output level,
     * which a host's seam comparison checks; everything learned or reported over the whole
     * capture prevents segments.
     */
    static SegmentSupport segments(OptionValues o) {
        String mode = o.getString("mode");
        if (mode.equals("logic-pair")) {
            return SegmentSupport.no("mode 'logic-pair' ends with a summary of the whole capture");
        }
        if (mode.equals("single") && !o.getString("reference").equals("fixed")) {
            return SegmentSupport.no("reference '" + o.getString("reference") + "' is learned from the capture;"
                    + " use reference=fixed with referenceVolts and hysteresisVolts to decode in segments");
        }
        if (!mode.equals("single") && Double.isNaN(o.getDouble("thresholdVolts"))) {
            return SegmentSupport.no("thresholdVolts is learned from the capture; give thresholdVolts and hysteresisVolts"
                    + " to decode in segments");
        }
        if (Double.isNaN(o.getDouble("hysteresisVolts"))) {
            return SegmentSupport.no("hysteresisVolts is learned from the capture; give it to decode in segments");
        }
        if (o.getBoolean("detectSwap")) {
            return SegmentSupport.no("detectSwap looks at the start of the capture; set invert instead to decode in segments");
        }
        if (o.getBoolean("levelReport")) {
            return SegmentSupport.no("the level report covers the whole capture; set levelReport=false to decode in segments");
        }
        // the comparator looks back at most MAX_BACK samples for the crossing, and ahead one cubic sample
        return SegmentSupport.after(Comparator.MAX_BACK + 4, 0);
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) {
        Settings s = new Settings(context.options(), context.instanceId());
        return s.mode == Settings.Mode.LOGIC_PAIR ? new LogicPairStage(context, s) : new AnalogStage(context, s);
    }
}
