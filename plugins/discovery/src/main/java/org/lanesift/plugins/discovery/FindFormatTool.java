package org.lanesift.plugins.discovery;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.StageFailure;
import org.lanesift.data.Artifact;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;

/**
 * Command-line tool {@code find-format}: runs {@code link-discovery} over the clock and data
 * signals of a VCD capture and writes its report, picture sheet and chain file into a new folder.
 *
 * <pre>
 * lanesift find-format --capture link.vcd --clock CLK --lanes D0,D1 [--out found]
 * </pre>
 */
public final class FindFormatTool implements Tool {
    static final ToolSpec SPEC = ToolSpec.builder("find-format")
            .summary("find the format of an undocumented clocked link from a VCD capture")
            .description("Finds clocking, bursts, sync, word length, bit order, lane distribution, checksum, length field,",
                    "command and data bursts and candidate pictures of an unknown link, and writes a chain file that",
                    "decodes the capture with the best hypothesis. Signals are named as the vcd source names its ports.")
            .required(OptionSpec.text("capture", null, "VCD file with the clock and data lanes as 1-bit signals"), "FILE")
            .required(OptionSpec.text("clock", null, "port name of the clock signal"), "NAME")
            .required(OptionSpec.text("lanes", null, "port names of the data lanes, comma-separated, 1 to 4"), "NAMES")
            .option(OptionSpec.text("out", "lanesift-discovery", "folder to create for the results (must not exist)"), "DIR")
            .option(OptionSpec.integer("max-bits", (long) DiscoveryEngine.DEFAULT_MAX_BITS, 4096, 1L << 28,
                    "bits per lane examined at most"), "BITS")
            .build();

    /** Creates the tool (stateless). */
    public FindFormatTool() {
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        String capture = args.text("capture");
        String[] lanes = args.text("lanes").split(",");
        if (lanes.length > 4 || args.text("lanes").isBlank()) {
            throw new OptionException("lanes", "option '--lanes': 1 to 4 comma-separated port names expected, got '" + args.text("lanes") + "'");
        }
        Path out = Path.of(args.text("out"));
        if (Files.exists(out)) {
            throw new OutputException("output folder '" + out + "' exists; choose another --out or remove it", null);
        }
        Map<String, Object> opts = new LinkedHashMap<>();
        opts.put("lanes", lanes.length);
        opts.put("maxBits", args.integer("max-bits", DiscoveryEngine.DEFAULT_MAX_BITS));
        // the chain file resolves a relative path against its own folder (docs/chain-file.md, Files)
        opts.put("capture", out.toAbsolutePath().normalize().relativize(Path.of(capture).toAbsolutePath().normalize()).toString()
                .replace('\\', '/'));
        List<Artifact> files = new ArrayList<>();
        ChainBuilder b = Chain.builder(PluginRegistry.discover(FindFormatTool.class.getClassLoader()))
                .add("cap", "vcd", Map.of("file", capture))
                .add("discovery", LinkDiscoveryPlugin.ID, opts)
                .wire("cap." + args.text("clock").trim(), "discovery.clock");
        for (int k = 0; k < lanes.length; k++) {
            b.wire("cap." + lanes[k].trim(), "discovery.lane" + k);
        }
        b.outputs((id, port, block) -> {
            if (block instanceof Artifact a) {
                files.add(a);
            }
        });
        try (Chain chain = b.build()) {
            chain.run();
        } catch (StageFailure e) {
            if (e.getCause() instanceof InputException ie) {
                throw ie;
            }
            throw e;
        }
        write(out, files);
        if (!console.quiet()) {
            for (Artifact a : files) {
                console.out().println(out.resolve(a.fileName()));
            }
        }
        return 0;
    }

    /** Writes into a fresh sibling folder, then moves it into place, so a half-written result never looks complete. */
    private static void write(Path out, List<Artifact> files) {
        Path parent = out.toAbsolutePath().getParent();
        try {
            Path tmp = Files.createTempDirectory(parent, ".find-format-");
            for (Artifact a : files) {
                Files.write(tmp.resolve(a.fileName()), a.content());
            }
            Files.move(tmp, out, StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException e) {
            throw new OutputException("cannot write the results into '" + out + "': " + e.getMessage(), e);
        }
    }
}
