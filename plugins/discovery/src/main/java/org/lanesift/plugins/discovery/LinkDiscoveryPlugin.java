package org.lanesift.plugins.discovery;

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
 * Plugin {@code link-discovery}: finds the format of an undocumented clocked link from the edges
 * of its clock and of one to four data lanes (from a VCD, a logic capture through
 * {@code logic-edges}, analog legs through {@code differential}, or a spool): clocking, bursts,
 * sync, word length, bit order, lane distribution, length field, checksum, command and data
 * bursts, pixel format and line length.
 *
 * <p><b>Inputs</b>: {@code clock} (EDGES) and {@code lane0} .. {@code lane{N-1}} (EDGES); with
 * {@code legs}, also each data lane's single-ended legs {@code lane{k}p} and {@code lane{k}n}
 * (ANALOG, volts), in which the low-power/high-speed state pattern is sought
 * ({@link LineStatePattern}).
 * <b>Output</b> {@code files} (ARTIFACT): {@code <id>-hypotheses.json} and
 * {@code <id>-hypotheses.md} (each parameter with its ranked candidates, evidence and
 * confidence), {@code <id>-pictures.png} (the candidate pictures, best first, on one sheet) and
 * {@code <id>-chain.json} (a chain that decodes the capture with the best hypothesis through the
 * {@code packet-link} framed profile). Memory: at most {@code maxBits} bits per lane are examined.
 */
public final class LinkDiscoveryPlugin implements PluginProvider {
    /** The plugin id. */
    public static final String ID = "link-discovery";

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("Link format discovery")
            .version("0.1.0")
            .description("Finds clocking, framing and content of an undocumented clocked link from its edges.")
            .option(OptionSpec.integer("lanes", 1L, 1, 4, "number of data lanes"))
            .option(OptionSpec.integer("maxBits", (long) DiscoveryEngine.DEFAULT_MAX_BITS, 4096, 1L << 28,
                    "bits per lane examined at most (the rest of the capture is not read into memory)"))
            .option(OptionSpec.integer("sheetPictures", 6L, 1, 12, "candidate pictures on the contact sheet"))
            .option(OptionSpec.text("capture", "", "capture file named in the generated chain (empty: a placeholder)"))
            .option(OptionSpec.bool("legs", false, "the data lanes' single-ended legs are wired (lane{k}p, lane{k}n): look for the"
                    + " low-power/high-speed state pattern in their levels"))
            .inputs(LinkDiscoveryPlugin::inputs)
            .output(PortSpec.of("files", DataKind.ARTIFACT, "hypotheses JSON and Markdown, picture sheet PNG, chain file"))
            .build();

    /** Creates the provider (stateless). */
    public LinkDiscoveryPlugin() {
    }

    static List<PortSpec> inputs(OptionValues o) {
        List<PortSpec> in = new ArrayList<>();
        in.add(PortSpec.of("clock", DataKind.EDGES, "edges of the link clock"));
        for (int k = 0; k < o.getInt("lanes"); k++) {
            in.add(PortSpec.of("lane" + k, DataKind.EDGES, "edges of data lane " + k));
        }
        for (int k = 0; o.getBoolean("legs") && k < o.getInt("lanes"); k++) {
            in.add(PortSpec.of("lane" + k + "p", DataKind.ANALOG, "data lane " + k + " positive leg, single-ended, volts"));
            in.add(PortSpec.of("lane" + k + "n", DataKind.ANALOG, "data lane " + k + " negative leg, single-ended, volts"));
        }
        return in;
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext context) {
        OptionValues o = context.options();
        return new DiscoveryStage(context, o.getInt("lanes"), o.getInt("maxBits"), o.getInt("sheetPictures"), o.getString("capture"),
                o.getBoolean("legs"));
    }
}
