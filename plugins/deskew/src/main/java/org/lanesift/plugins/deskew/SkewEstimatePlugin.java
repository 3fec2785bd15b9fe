package org.lanesift.plugins.deskew;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Plugin {@code skew-estimate}: measures skew and writes the corrections as a skew table.
 *
 * <p>It only <b>observes</b>: it has no data outputs, so wire the same source both to it and to
 * whatever decodes the data (an output may feed several inputs). At the end of the capture it
 * emits the artifact {@code <id>-skew.json} ({@link SkewTable}, format in
 * {@code docs/skew-table.md}) holding, per channel name, the offset to <b>apply</b> in ps (positive
 * delays the channel), a confidence from 0 to 1 and the method; feed the file to the
 * {@code deskew} plugin's {@code offsetsFile}. One {@code skew-estimate} annotation per channel
 * carries the same numbers, and warnings flag weak estimates.
 *
 * <ul>
 * <li>{@code mode=legs}: inputs {@code p}, {@code n} (analog legs of one pair). Cross-correlation of
 * P against -N over +/-{@code maxSkew}, FFT-accumulated, parabolic peak fit. P is the reference
 * (offset 0); N gets the correction. Confidence: the normalised correlation at the peak.</li>
 * <li>{@code mode=clock}: inputs {@code clock}, {@code lane0..}. Phase histogram of each lane's
 * transitions within the clock interval (between rising edges, or between any two edges when
 * {@code ddr=true}); the correction moves the cluster centre to the clock edge
 * ({@code alignment=edge}) or midway between edges ({@code alignment=centre}). The clock is the
 * reference. Confidence: the cluster concentration (mean resultant length).</li>
 * <li>{@code mode=lanes}: inputs {@code lane0..}. Each lane's transitions against the nearest
 * lane-0 transition, folded into one unit interval ({@code unitInterval}, or estimated from lane
 * 0); lane 0 is the reference. When lane 0 is a clock, an estimated unit interval is its period divided
 * by {@code bitsPerClock} or by the bits its high:low shape shows ({@link UnitIntervalSource}); an even
 * clock with no {@code bitsPerClock} is refused naming the option.</li>
 * </ul>
 * The edge modes resolve skew modulo one clock interval or UI: a lane more than half an interval
 * off is folded back. Annotations: {@code skew-low-confidence}, {@code skew-few-edges},
 * {@code skew-multimodal} (more than one cluster: wrong clock, wrong {@code ddr} or
 * {@code alignment}), {@code skew-out-of-range} (legs peak at the edge of the search),
 * {@code skew-ambiguous} (a second correlation peak nearly as high: a periodic signal),
 * {@code skew-clock-gaps}, {@code skew-bad-samples} (legs: NaN or infinite samples), {@code skew-no-estimate},
 * {@code skew-unit-interval} (info: how an estimated unit interval was found). A row whose
 * estimate is ambiguous, weak or near half an interval carries a {@code suspect} reason in the
 * table ({@link SkewTable.Entry#suspect()}), which {@code deskew} reports when it applies it.
 */
public final class SkewEstimatePlugin implements PluginProvider {
    /** Largest lane count. */
    static final int MAX_LANES = 32;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("skew-estimate")
            .name("Skew estimation")
            .description("Estimates per-channel skew (pair legs by cross-correlation, lanes against their clock or against"
                    + " lane 0 by transition-phase histograms) and writes the corrections to apply as <id>-skew.json.")
            .option(OptionSpec.choice("mode", "clock", "legs: P against -N of one pair; clock: data lanes against their clock;"
                    + " lanes: data lanes against lane0", "legs", "clock", "lanes"))
            .option(OptionSpec.integer("lanes", 1L, 1, MAX_LANES, "clock and lanes modes: number of data lanes lane0..lane<N-1>"))
            .option(OptionSpec.choice("alignment", "edge", "clock mode: data transitions belong on the clock edges (edge)"
                    + " or midway between them (centre)", "edge", "centre"))
            .option(OptionSpec.bool("ddr", true, "clock mode: data changes on both clock edges (fold on half the period)"))
            .option(OptionSpec.time("unitInterval", org.lanesift.time.TimeValue.Unit.PS, "0ps",
                    "lanes mode: the unit interval; 0 derives it from lane0 (a clock on lane0: its period / bitsPerClock)"))
            .option(OptionSpec.integer("bitsPerClock", 0L, 0, 64, "lanes mode with unitInterval 0 and a clock on lane0: bits"
                    + " per clock period (7 on a 7:1 pixel link); 0 derives them from the clock's high:low shape"))
            .option(OptionSpec.time("maxSkew", org.lanesift.time.TimeValue.Unit.PS, "2ns",
                    "legs mode: largest skew searched, either way (ps, ns or samples)"))
            .option(OptionSpec.number("minConfidence", "", 0.5, 0.0, 1.0, "estimates below this confidence get a warning"))
            .option(OptionSpec.integer("minEdges", 200L, 1, Integer.MAX_VALUE,
                    "edge modes: fewer transitions per lane than this get a warning"))
            .inputs(SkewEstimatePlugin::inputs)
            .output(PortSpec.of("table", DataKind.ARTIFACT, "the skew table <id>-skew.json, at the end"))
            .build();

    /** Creates the provider (stateless). */
    public SkewEstimatePlugin() {
    }

    private static List<PortSpec> inputs(OptionValues o) {
        List<PortSpec> l = new ArrayList<>();
        switch (o.getString("mode")) {
            case "legs" -> {
                l.add(PortSpec.of("p", DataKind.ANALOG, "positive leg"));
                l.add(PortSpec.of("n", DataKind.ANALOG, "negative leg"));
            }
            case "clock" -> {
                l.add(PortSpec.of("clock", DataKind.EDGES, "the link's clock"));
                for (int i = 0; i < o.getInt("lanes"); i++) {
                    l.add(PortSpec.of("lane" + i, DataKind.EDGES, "data lane " + i));
                }
            }
            default -> {
                for (int i = 0; i < o.getInt("lanes"); i++) {
                    l.add(PortSpec.of("lane" + i, DataKind.EDGES, i == 0 ? "data lane 0, the reference" : "data lane " + i));
                }
            }
        }
        return l;
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) {
        return new SkewEstimateStage(context);
    }
}
