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
 * Source plugin {@code packed-logic}: a logic analyser's bit-packed export, one sample word after
 * another (8 channels per byte, or 16 per 16-bit word in either byte order), described by a JSON
 * sidecar naming the channels to take and their bits. One LOGIC output per named channel, for
 * {@code logic-edges}. Rules in docs/capture-raw.md, "Packed logic captures".
 */
public final class PackedLogicSource implements PluginProvider {
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("packed-logic")
            .name("Packed logic capture")
            .description("Reads bit-packed logic samples (logic8, logic16le, logic16be) with a JSON sidecar giving rateHz,"
                    + " format and channels [{name, bit}].")
            .option(OptionSpec.text("file", null, "path of the binary file"))
            .option(OptionSpec.text("sidecar", "", "path of the JSON sidecar; empty = the file's path + \".json\""))
            .option(OptionSpec.integer("blockSamples", 1L << 20, 64, 1 << 24, "samples per block (per channel)"))
            .option(RawSource.READ_AHEAD)
            .outputs(PackedLogicSource::ports)
            .build();

    /** For the ServiceLoader. */
    public PackedLogicSource() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) throws IOException {
        return new ReaderStage(reader(context.options(), false), context);
    }

    static PackedLogicReader reader(OptionValues o, boolean headerOnly) throws IOException {
        return new PackedLogicReader(Path.of(o.getString("file")), PackedLogicSidecar.read(RawSource.sidecarOf(o)), o.getInt("blockSamples"),
                headerOnly, o.getBoolean("readAhead") && ReadAhead.allowed());
    }

    private static List<PortSpec> ports(OptionValues o) {
        return ReaderStage.portsOf(Path.of(o.getString("file")), () -> reader(o, true));
    }
}
