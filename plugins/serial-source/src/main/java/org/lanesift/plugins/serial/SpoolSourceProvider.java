package org.lanesift.plugins.serial;

import java.util.ArrayList;
import java.util.List;
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
 * The {@code spool} source: replays a spool directory (docs/spool.md) written by a live capture
 * as LOGIC blocks, one output per channel ({@code ch0}..), with {@code stream-gap},
 * {@code stream-corrupt} and {@code stream-duplicate} annotations. With {@code follow=true} it
 * tails a spool that is still being written, which is how {@code lanesift live --chain} decodes
 * while capturing.
 */
public final class SpoolSourceProvider implements PluginProvider {
    static final PluginDescriptor DESCRIPTOR = PluginDescriptor.builder("spool")
            .name("Spool replay")
            .description("Replays a capture spool (docs/spool.md) as 8-channel logic blocks; gaps, CRC failures and repeats "
                    + "become annotations and no block spans a gap. follow=true tails a spool a live capture is writing.")
            .option(OptionSpec.text("dir", "", "spool directory (give dir or file)"))
            .option(OptionSpec.text("file", "", "the spool's spool.properties file, or its directory (give dir or file)"))
            .option(OptionSpec.bool("follow", false, "wait for more data until the capture closes the spool"))
            .option(OptionSpec.number("followIdleSeconds", "s", 60.0, 0.1, 86400.0, "following: give up when the spool has not"
                    + " grown for this long and the capture never closed it (a capture that died)"))
            .option(OptionSpec.integer("channels", 8L, 1, 8, "logic channels to emit, ch0..ch(N-1)"))
            .option(OptionSpec.time("start", org.lanesift.time.TimeValue.Unit.S, "0s", "replay from this time of the capture,"
                    + " such as 90s or 4000000samples; what lies before it is passed over through the segment indexes, unread"))
            .option(OptionSpec.integer("blockSamples", 8192L, 64, 1L << 22, "samples per emitted block at most"))
            .outputs(SpoolSourceProvider::ports)
            .build();

    /** Creates the provider (ServiceLoader). */
    public SpoolSourceProvider() {
    }

    private static List<PortSpec> ports(OptionValues o) {
        List<PortSpec> out = new ArrayList<>();
        int n = o.getInt("channels");
        for (int c = 0; c < n; c++) {
            out.add(PortSpec.of("ch" + c, DataKind.LOGIC, "channel " + c + " (bit " + c + " of each sample byte)"));
        }
        return out;
    }

    @Override
    public PluginDescriptor descriptor() {
        return DESCRIPTOR;
    }

    @Override
    public Stage open(StageContext ctx) {
        OptionValues o = ctx.options();
        String dir = o.getString("dir");
        String file = o.getString("file");
        if (dir.isEmpty() == file.isEmpty()) {
            throw new OptionException(dir.isEmpty() ? "dir" : "file",
                    "plugin 'spool': give exactly one of 'dir' (the spool directory) or 'file' (its spool.properties)");
        }
        java.nio.file.Path p = java.nio.file.Path.of(dir.isEmpty() ? file : dir);
        if (!dir.isEmpty() || java.nio.file.Files.isDirectory(p)) {
            return new SpoolSourceStage(ctx, p);
        }
        if (!p.getFileName().toString().equals(SpoolFiles.HEADER)) {
            throw new OptionException("file", "plugin 'spool': option 'file' must name a spool directory or its "
                    + SpoolFiles.HEADER + ", got '" + file + "'");
        }
        return new SpoolSourceStage(ctx, p.toAbsolutePath().getParent());
    }
}
