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
 * Source plugin {@code raw}: interleaved binary samples (uint8, int8, int16le, int16be or
 * float32le) described by a JSON sidecar (rate, format, channel names, gain and offset to volts).
 * One ANALOG output per channel. Rules in docs/capture-raw.md.
 */
public final class RawSource implements PluginProvider {
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("raw")
            .name("Raw binary capture")
            .description("Reads interleaved binary samples with a JSON sidecar giving rateHz, format and channels"
                    + " [{name, gain, offset}]; volts = code * gain + offset.")
            .option(OptionSpec.text("file", null, "path of the binary file"))
            .option(OptionSpec.text("sidecar", "", "path of the JSON sidecar; empty = the file's path + \".json\""))
            .option(OptionSpec.integer("blockSamples", 65536L, 1, 1 << 24, "frames per block (per channel)"))
            .outputs(RawSource::ports)
            .build();

    /** For the ServiceLoader. */
    public RawSource() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) throws IOException {
        return new ReaderStage(reader(context.options(), false), context);
    }

    static Path sidecarOf(OptionValues o) {
        String s = o.getString("sidecar");
        return s.isEmpty() ? Path.of(o.getString("file") + ".json") : Path.of(s);
    }

    static RawReader reader(OptionValues o, boolean headerOnly) throws IOException {
        return new RawReader(Path.of(o.getString("file")), RawSidecar.read(sidecarOf(o)), o.getInt("blockSamples"), headerOnly);
    }

    private static List<PortSpec> ports(OptionValues o) {
        try (RawReader r = reader(o, true)) {
            return r.ports();
        } catch (IOException e) {
            throw new CaptureFormatException(Path.of(o.getString("file")), 0, "cannot read: " + e.getMessage(), e);
        }
    }
}
