package org.lanesift.plugins.deskew;

import java.nio.file.Path;
import java.util.ArrayList;
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
import org.lanesift.time.Femtos;

/**
 * Plugin {@code deskew}: applies a fixed time offset to each of N channels of one kind.
 *
 * <p><b>Sign convention: a positive offset DELAYS the channel.</b> Output time = input time +
 * offset. A channel that arrives 80 ps early is corrected with +80 ps; one that arrives 80 ps late
 * with -80 ps. Offsets come from {@code offsets} (one number per channel, in {@code offsetUnit}:
 * ps, ns or samples) or from a skew table file ({@code offsetsFile}, see {@link SkewTable}), where
 * each input is looked up by its blocks' channel name, then by its port name {@code in<k>}, or
 * from skew tables computed in the same run: with {@code tables=T} the calibration inputs
 * {@code table0..} take {@code skew-estimate} outputs, which the engine fills in a calibration pass
 * over the capture before the first data block (several per-pair tables merge; a channel with two
 * different offsets in them is an error). Rows below {@code minConfidence} are not applied (0 ps, a warning).
 *
 * <ul>
 * <li><b>analog</b>: fractional-delay interpolation onto the <em>input's</em> sample grid (same
 * period, same sample times), so downstream stages with several inputs still share one rate.
 * {@code interpolator=sinc} (default) is a 16-tap Kaiser-windowed sinc (beta 5): at most 0.5 % of
 * amplitude passband error up to 0.4 of the sample rate. {@code interpolator=cubic} is 4-tap
 * cubic convolution: 0.44 % error up to 0.1, 11.6 % up to 0.25 and 55 % up to 0.4 of the sample rate (see
 * {@code docs/skew-table.md}; both measured by tests). Samples near the capture ends whose kernel
 * reaches past the data, or that touch invalid input, are marked invalid. <b>One block of lag:</b>
 * what a leg's block yields is handed on when that leg's next block arrives (and at the end, every
 * leg's last block first, then every leg's held-back tail, in input order), so that the filter of
 * one block can run on a second thread while the stages after this one take the block before
 * ({@code stageThread}, on by default). The schedule is the same with the thread on or off, so are
 * the outputs, their order and everything later stages make of them.</li>
 * <li><b>edges</b>: every transition time, the span start and end and unknown spans move by the
 * offset, exactly (rounded to the femtosecond).</li>
 * <li><b>logic</b>: the block's {@code startFs} moves by the offset; the bits are untouched (no
 * resampling). Channels with different offsets then sit on sample grids shifted against each
 * other; convert to edges downstream to compare them.</li>
 * </ul>
 * Output blocks keep the input channel names. Output {@code table} carries the applied offsets as
 * a skew table artifact {@code <id>-applied-skew.json} at the end.
 */
public final class DeskewPlugin implements PluginProvider {
    /**
     * The option that lets the analog filter run on a second thread ({@link DeskewStage}, signal-kit {@code SideThread}):
     * host-api's {@link SegmentSupport#STAGE_THREAD_OPTION}, which segmented runs turn off.
     */
    static final String STAGE_THREAD = SegmentSupport.STAGE_THREAD_OPTION;
    /** Largest channel count. */
    static final int MAX_CHANNELS = 64;

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("deskew")
            .name("Skew correction")
            .description("Shifts each channel by a fixed time offset (positive delays: output time = input time + offset);"
                    + " analog by fractional-delay interpolation on the input sample grid, edges and logic exactly.")
            .option(OptionSpec.choice("kind", "analog", "data kind of every input and output", "analog", "edges", "logic"))
            .option(OptionSpec.integer("channels", 1L, 1, MAX_CHANNELS, "number of channels N: inputs in0..in<N-1>, outputs out0..out<N-1>"))
            .option(OptionSpec.numbers("offsets", "", "one offset per channel, in offsetUnit; positive DELAYS the channel"
                    + " (output time = input time + offset)"))
            .option(OptionSpec.choice("offsetUnit", "ps", "unit of the numbers in offsets", "ps", "ns", "samples"))
            .option(OptionSpec.text("offsetsFile", "", "skew table JSON file (docs/skew-table.md) to take the offsets from,"
                    + " instead of offsets"))
            .option(OptionSpec.integer("tables", 0L, 0, MAX_CHANNELS, "number of skew tables taken from the chain itself:"
                    + " calibration inputs table0..table<T-1>, wired from skew-estimate outputs and filled by a calibration pass"
                    + " before any data (instead of offsets or offsetsFile)"))
            .option(OptionSpec.number("minConfidence", "", 0.0, 0.0, 1.0, "table rows below this confidence are not applied"
                    + " (0 ps is used, with a skew-not-applied warning); 0 applies every row"))
            .option(OptionSpec.choice("interpolator", "sinc", "analog fractional delay: sinc (16-tap Kaiser windowed sinc)"
                    + " or cubic (4-tap, only for heavily oversampled signals)", "sinc", "cubic"))
            .option(OptionSpec.bool(STAGE_THREAD, true, "analog: filter each leg's block on a second thread while the"
                    + " stages after this one take the leg's block before (false: one thread; the outputs and their order"
                    + " are the same either way; off with one processor, in the segments of --jobs, and everywhere with"
                    + " the system property " + DeskewStage.PROPERTY + "=false)"))
            .inputs(DeskewPlugin::inputs)
            .outputs(DeskewPlugin::outputs)
            .segments(DeskewPlugin::segments)
            .build();

    /** Creates the provider (stateless). */
    public DeskewPlugin() {
    }

    static DataKind kindOf(OptionValues o) {
        return switch (o.getString("kind")) {
            case "edges" -> DataKind.EDGES;
            case "logic" -> DataKind.LOGIC;
            default -> DataKind.ANALOG;
        };
    }

    private static List<PortSpec> inputs(OptionValues o) {
        List<PortSpec> l = new ArrayList<>();
        DataKind k = kindOf(o);
        for (int i = 0; i < o.getInt("channels"); i++) {
            l.add(PortSpec.of("in" + i, k, "channel " + i + " to correct"));
        }
        for (int i = 0; i < o.getInt("tables"); i++) {
            l.add(PortSpec.calibration("table" + i, DataKind.ARTIFACT, "skew table " + i + " (a skew-estimate output), filled by"
                    + " a calibration pass before any data"));
        }
        return l;
    }

    private static List<PortSpec> outputs(OptionValues o) {
        List<PortSpec> l = new ArrayList<>();
        DataKind k = kindOf(o);
        for (int i = 0; i < o.getInt("channels"); i++) {
            l.add(PortSpec.of("out" + i, k, "channel " + i + " shifted by its offset, same channel name"));
        }
        l.add(PortSpec.of("table", DataKind.ARTIFACT, "the applied offsets as a skew table, <id>-applied-skew.json"));
        return l;
    }

    /**
     * Fixed offsets keep no state beyond the largest shift (and, for analog, the kernel), so the
     * stage decodes in segments after a warm-up of the largest offset plus the kernel length.
     */
    static SegmentSupport segments(OptionValues o) {
        if (o.getInt("tables") > 0) {
            return SegmentSupport.no("option 'tables': the offsets come from a calibration pass over the whole capture");
        }
        String file = o.getString("offsetsFile").trim();
        double maxFs = 0;
        long samples = kindOf(o) == DataKind.ANALOG ? 2L * DelayKernel.of(o.getString("interpolator")).half : 0;
        if (!file.isEmpty()) {
            try {
                for (SkewTable.Entry e : SkewTable.read(Path.of(file)).entries()) {
                    maxFs = Math.max(maxFs, Math.abs(e.offsetPs()) * Femtos.PER_PS);
                }
            } catch (IllegalArgumentException e) {
                return SegmentSupport.no("option 'offsetsFile': " + e.getMessage());
            }
        } else {
            String unit = o.getString("offsetUnit");
            for (double v : o.getNumbers("offsets")) {
                if (unit.equals("samples")) {
                    samples += (long) Math.ceil(Math.abs(v));
                } else {
                    maxFs = Math.max(maxFs, Math.abs(v) * (unit.equals("ns") ? Femtos.PER_NS : Femtos.PER_PS));
                }
            }
        }
        return SegmentSupport.after(samples, (long) Math.ceil(maxFs));
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) {
        return new DeskewStage(context);
    }
}
