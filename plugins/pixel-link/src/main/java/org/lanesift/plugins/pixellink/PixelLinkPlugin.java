package org.lanesift.plugins.pixellink;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PortSpec;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The {@code pixel-link} plugin: decodes 7:1 LVDS pixel links (one bit stream per data lane, seven
 * bit slots per pixel clock, as sampled by the multiplied-clock mode of the sampler) into frames,
 * a video timing report in pixels, lines and Hz, PNG pictures and annotations.
 *
 * <p>Inputs: {@code lane0..laneN-1} (BITS) for a single link, or {@code odd0..}/{@code even0..}
 * for a dual link (odd = the 1st, 3rd, ... pixel of each line); N is 3 for 18-bit and 4 for
 * 24-bit tables. Outputs: {@code frames} (FRAME) and {@code files} (ARTIFACT: PNGs and
 * {@code <id>-timing.json} / {@code <id>-timing.txt}; when the timing was measured also
 * {@code <id>-timing.dts} (devicetree display-timings node), {@code <id>-timing.h} (C header) and
 * {@code <id>-tx.v} (a Verilog transmitter). Options and file formats are described in
 * {@code docs/pixel-mapping.md}, {@code docs/timing-report.md} and {@code docs/transmitter.md}.
 */
public final class PixelLinkPlugin implements PluginProvider {
    /** The plugin id used in chain files. */
    public static final String ID = "pixel-link";

    private static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder(ID)
            .name("7:1 pixel link decoder")
            .version("0.1.0")
            .description("Decodes 7:1 LVDS pixel links into frames, video timing (porches, sync widths, polarities, "
                    + "pixel clock, refresh), PNG pictures and annotations.")
            .option(OptionSpec.choice("mapping", "vesa-24", "slot-to-colour table: vesa-24, jeida-24 (4 lanes) or bits-18 (3 lanes)",
                    SlotMapping.BUILT_IN.toArray(new String[0])))
            .option(OptionSpec.text("mappingFile", "", "path of a user-defined slot table in JSON (docs/pixel-mapping.md); overrides 'mapping'"))
            .option(OptionSpec.bool("reverseSlots", false, "the wire sends each lane's slots in reverse order of the table"))
            .option(OptionSpec.bool("dual", false, "dual link: inputs odd0.. carry the 1st, 3rd, ... pixel of a line, even0.. the 2nd, 4th, ..."))
            .option(OptionSpec.choice("pictures", "changed", "which frames become PNG files: all, changed (differ from the previous complete frame) or none",
                    "all", "changed", "none"))
            .option(OptionSpec.text("pictureRange", "", "frame indices to write as PNG: N, N-M, N- or empty for all"))
            .option(OptionSpec.choice("hsPolarity", "auto", "HS active level: auto (learned from DE), positive or negative",
                    "auto", "positive", "negative"))
            .option(OptionSpec.choice("vsPolarity", "auto", "VS active level: auto (learned from DE), positive or negative",
                    "auto", "positive", "negative"))
            .option(OptionSpec.integer("maxWidth", 4096L, 1, 16384, "longest accepted line, pixels (bounds memory)"))
            .option(OptionSpec.integer("maxHeight", 4096L, 1, 16384, "most accepted lines per frame (bounds memory)"))
            .option(OptionSpec.choice("detail", "lines", "annotations: lines (every line and sync pulse), frames (frames, VS, anomalies) or anomalies",
                    "lines", "frames", "anomalies"))
            .option(OptionSpec.number("clockTolerance", "%", 0.5, 0.001, 50.0,
                    "pixel clock deviation between lines that counts as drift / varying"))
            .inputs(PixelLinkPlugin::inputs)
            .outputs(ov -> List.of(
                    PortSpec.of("frames", DataKind.FRAME, "decoded pictures; partial=true for frames the capture cut or lock was lost in"),
                    PortSpec.of("files", DataKind.ARTIFACT, "PNG pictures and the timing report (JSON and text)")))
            .build();

    /** Creates the provider (stateless). */
    public PixelLinkPlugin() {
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    static int lanesFor(OptionValues ov) {
        try {
            return mapping(ov).laneCount();
        } catch (RuntimeException e) {
            return 4; // open() reports the problem with the option named
        }
    }

    static SlotMapping mapping(OptionValues ov) {
        String file = ov.getString("mappingFile").trim();
        if (!file.isEmpty()) {
            return SlotMapping.load(Path.of(file));
        }
        return SlotMapping.builtIn(ov.getString("mapping"));
    }

    static List<String> laneNames(OptionValues ov, int perLink) {
        List<String> names = new ArrayList<>();
        if (ov.getBoolean("dual")) {
            for (int i = 0; i < perLink; i++) {
                names.add("odd" + i);
            }
            for (int i = 0; i < perLink; i++) {
                names.add("even" + i);
            }
        } else {
            for (int i = 0; i < perLink; i++) {
                names.add("lane" + i);
            }
        }
        return names;
    }

    private static List<PortSpec> inputs(OptionValues ov) {
        int n = lanesFor(ov);
        List<PortSpec> ports = new ArrayList<>();
        for (String name : laneNames(ov, n)) {
            // the deframer takes values, slots, clock edges, flags and their causes, never the per-bit margins
            ports.add(PortSpec.of(name, DataKind.BITS, "bits of data " + name + ", 7 slots per pixel clock, slot 0 first")
                    .readingBitMargins(false));
        }
        return ports;
    }

    private static int polarity(OptionValues ov, String name) {
        return switch (ov.getString(name)) {
            case "positive" -> 1;
            case "negative" -> 0;
            default -> -1;
        };
    }

    @Override
    public Stage open(StageContext ctx) {
        OptionValues ov = ctx.options();
        SlotMapping m = mapping(ov);
        List<String> names = laneNames(ov, m.laneCount());
        if (names.size() != ctx.inputs().size()) {
            throw new OptionException("mappingFile", "option 'mappingFile' of plugin 'pixel-link': the table has "
                    + m.laneCount() + " lanes but the instance was wired with " + ctx.inputs().size() + " inputs");
        }
        long[] range = Pictures.parseRange(ov.getString("pictureRange"));
        Pictures.Mode pm = Pictures.Mode.valueOf(ov.getString("pictures").toUpperCase(Locale.ROOT));
        FrameAssembler.Detail detail = FrameAssembler.Detail.valueOf(ov.getString("detail").toUpperCase(Locale.ROOT));
        return new PixelLinkStage(ctx, m, ov.getBoolean("reverseSlots"), ov.getBoolean("dual"), names, detail, pm, range,
                ov.getInt("maxWidth"), ov.getInt("maxHeight"), polarity(ov, "hsPolarity"), polarity(ov, "vsPolarity"),
                ov.getDouble("clockTolerance"));
    }
}
