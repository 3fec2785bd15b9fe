package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.unit.Quantity;

/**
 * Source plugin {@code capture-set}: several acquisitions of one link that share a reference
 * channel, aligned on it and read as one capture (docs/capture-set.md). One output per channel of
 * the set; one {@code set-alignment} annotation per acquisition after the first, with the offset
 * and its confidence.
 */
public final class CaptureSetSource implements PluginProvider {
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("capture-set")
            .name("Capture set")
            .description("Reads acquisitions listed in a capture set file, aligns them on their shared channel by the"
                    + " cross-correlation of its transitions, and hands on every channel on the first acquisition's time axis.")
            .option(OptionSpec.text("file", null, "path of the capture set file (JSON)"))
            .outputs(CaptureSetSource::ports)
            .build();

    /** For the ServiceLoader. */
    public CaptureSetSource() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) throws IOException {
        CaptureSetReader r = new CaptureSetReader(CaptureSetFile.read(Path.of(context.options().getString("file"))), false);
        for (CaptureSetReader.Placement p : r.placements()) {
            EdgeAlignment.Result a = p.alignment();
            if (a == null) {
                continue;
            }
            context.annotate(Annotation.on("alignment", "set-alignment").severity(Severity.INFO)
                    .label(p.name() + ": " + Quantity.format(a.offsetFs() / 1e15, "s") + " +/- "
                            + Quantity.format(a.standardErrorFs() / 1e15, "s") + ", " + Math.round(100 * a.matched()) + " % matched")
                    .text("acquisition", p.name())
                    .number("offsetFs", a.offsetFs(), "fs").number("standardErrorFs", a.standardErrorFs(), "fs")
                    .number("residualRmsFs", a.residualRmsFs(), "fs").number("matched", a.matched(), "")
                    .number("runnerUp", a.runnerUp(), "").number("pairs", a.pairs(), "").build());
        }
        return new ReaderStage(r, context);
    }

    private static List<PortSpec> ports(OptionValues o) {
        Path file = Path.of(o.getString("file"));
        return ReaderStage.portsOf(file, () -> new CaptureSetReader(CaptureSetFile.read(file), true));
    }
}
