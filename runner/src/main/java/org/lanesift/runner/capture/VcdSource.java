package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * Source plugin {@code vcd}: an IEEE 1364-2005 clause 18 value change dump. Scalar variables
 * become EDGES outputs (x and z as unknown spans), vectors of up to 64 bits WORDS (one word per
 * value, x/z flagged), real variables ANALOG sampled and held every 1/{@code realRateHz} s.
 * Rules in docs/capture-vcd.md.
 */
public final class VcdSource implements PluginProvider {
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("vcd")
            .name("VCD capture")
            .description("Reads an IEEE 1364 value change dump: scalar wires as edges (x/z as unknown spans), vectors as"
                    + " words (x/z flagged), real variables as analog samples held on a grid of realRateHz.")
            .option(OptionSpec.text("file", null, "path of the VCD file"))
            .option(OptionSpec.integer("blockSamples", 65536L, 1, 1 << 24,
                    "value changes per block (all variables together); for real variables also grid samples per block"))
            .option(OptionSpec.number("realRateHz", "Hz", 1e9, 1.0, 1e15,
                    "grid on which real variables are sampled and held"))
            .outputs(VcdSource::ports)
            .build();

    /** For the ServiceLoader. */
    public VcdSource() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) throws IOException {
        return new ReaderStage(reader(context.options(), false), context);
    }

    static VcdReader reader(OptionValues o, boolean headerOnly) throws IOException {
        return new VcdReader(Path.of(o.getString("file")), o.getDouble("realRateHz"), o.getInt("blockSamples"), headerOnly);
    }

    private static List<PortSpec> ports(OptionValues o) {
        try (VcdReader r = reader(o, true)) {
            return r.ports();
        } catch (IOException e) {
            throw new CaptureFormatException(Path.of(o.getString("file")), 0, "cannot read: " + e.getMessage(), e);
        }
    }

}
