package org.lanesift.runner.link;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.capture.Captures;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.StageFailure;
import org.lanesift.data.Artifact;
import org.lanesift.json.JsonReader;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.runner.capture.Inspector;

/**
 * Command-line tool {@code find-format}: runs {@code link-discovery} (plugins/discovery) over the
 * clock and the data lanes of any capture the runner reads and writes its report, picture sheet
 * and chain file into a new folder. The lanes come as {@code sift} takes them
 * ({@link SiftTool#pairs}: {@code --map}, {@code --map-file}, or found by {@code inspect}), or, for
 * one channel per signal (1-bit signals of a logic capture, or analog channels such as the 0/1
 * columns of a logic analyser's CSV export, each compared against its mid-level), as
 * {@code --clock} and {@code --lanes}; the chain that
 * turns them into edges is {@link LinkChains#discovery}, the one sift's front end is built from.
 *
 * <pre>
 * lanesift find-format --capture link.vcd --clock CLK --lanes D0,D1 [--out found]
 * lanesift find-format --capture legs.csv --map "CLK=CH1,CH2 D0=CH3,CH4" [--out found]
 * </pre>
 */
public final class FindFormatTool implements Tool {
    static final ToolSpec SPEC = ToolSpec.builder("find-format")
            .summary("find the format of an undocumented clocked link from a capture")
            .description("Finds clocking, bursts, sync, word length, bit order, lane distribution, checksum, length field,",
                    "command and data bursts and candidate pictures of an unknown link, and writes a chain file that",
                    "decodes the capture with the best hypothesis. Reads every capture 'lanesift sift' reads: CSV",
                    "(analog legs or logic), VCD, raw binary with a JSON sidecar, packed logic, capture sets. Give the",
                    "lanes with --map (or --map-file), the clock first; for one channel per signal (1-bit signals, or",
                    "analog channels such as a logic CSV's 0/1 columns, each against its mid-level) --clock and --lanes;",
                    "with neither, the pairs and the clock are found as sift finds them.")
            .required(OptionSpec.text("capture", null, "the capture: CSV, VCD, raw binary with a JSON sidecar, packed logic or a"
                    + " capture set"), "FILE")
            .option(OptionSpec.text("clock", "", "channel of the clock: a 1-bit signal, or an analog channel taken against its mid-level"), "NAME")
            .option(OptionSpec.text("lanes", "", "channels of the data lanes (one each, as --clock), comma-separated, 1 to 4"), "NAMES")
            .option(OptionSpec.text("map", "", "channel map: NAME=P,N entries (NAME=CH for a logic capture) separated by spaces"
                    + " or ';', the clock first, then 1 to 4 data lanes in order, such as \"CLK=CH1,CH2 D0=CH3,CH4\""), "MAP")
            .option(OptionSpec.text("map-file", "", "channel map file: one NAME=P,N per line, '#' comments; added after --map"),
                    "FILE")
            .option(OptionSpec.text("out", "lanesift-discovery", "folder to create for the results (must not exist)"), "DIR")
            .option(OptionSpec.integer("max-bits", null, 4096, 1L << 28,
                    "bits per lane examined at most (default: the link-discovery stage's maxBits, see 'lanesift plugins')"),
                    "BITS")
            .footer("Exit codes: 0 found; 2 bad input (capture, map, options); 1 internal error. See docs/discovery.md.",
                    "",
                    "Safety: display flex cables are sensitive to electrostatic discharge; a scope's ground lead is",
                    "earthed: never clip it to a mains-referenced circuit. Follow local codes and licensed practice",
                    "(README, Safety).")
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
        Path capture = Path.of(args.text("capture"));
        Path out = Path.of(args.text("out"));
        if (Files.exists(out)) {
            throw new OutputException("output folder '" + out + "' exists; choose another --out or remove it", null);
        }
        boolean named = !args.text("clock").isEmpty() || !args.text("lanes").isEmpty();
        if (named && (!args.text("map").isEmpty() || !args.text("map-file").isEmpty())) {
            throw new OptionException("clock", "--clock/--lanes and --map/--map-file both given; give the lanes one way");
        }
        String logicKind;
        String plugin;
        List<LinkChains.Pair> pairs;
        if (named) {
            pairs = named(args);
            plugin = Captures.pluginFor(capture);
            // a VCD's 1-bit signals go to discovery as they are, without reading the capture twice
            logicKind = plugin.equals("vcd") ? "EDGES" : SiftTool.logicKind(inspect(capture));
            if (logicKind == null) {
                // analog channels named one per signal: a logic analyser's CSV export (0/1 columns) or single-ended signals
                logicKind = LinkChains.LEVELS;
            }
        } else {
            InspectReport inspect = inspect(capture);
            plugin = inspect.format();
            logicKind = SiftTool.logicKind(inspect);
            pairs = SiftTool.pairs(args, inspect, logicKind != null);
        }
        if (pairs.size() > 5) {
            throw new OptionException("map", "the channel map gives " + (pairs.size() - 1) + " data lanes; expected the clock,"
                    + " then 1 to 4 data lanes");
        }
        Map<String, Object> opts = new LinkedHashMap<>();
        opts.put("lanes", pairs.size() - 1);
        if (args.has("max-bits")) {
            // absent, the stage takes its own default (plugins/discovery DiscoveryEngine.DEFAULT_MAX_BITS), the one constant
            opts.put("maxBits", args.integer("max-bits", 0));
        }
        // the chain file resolves a relative path against its own folder (docs/chain-file.md, Files)
        opts.put("capture", out.toAbsolutePath().normalize().relativize(capture.toAbsolutePath().normalize()).toString()
                .replace('\\', '/'));
        Map<String, Object> model = LinkChains.discovery("find-format", new LinkChains.Capture(plugin, args.text("capture"), pairs),
                logicKind, opts);
        List<Artifact> files = run(model);
        if (!"EDGES".equals(logicKind) || !plugin.equals("vcd")) {
            // the generated chain reads a VCD; give it this capture's front end, the path as the chain file names it
            Map<String, Object> front = LinkChains.discovery("find-format", new LinkChains.Capture(plugin,
                    (String) opts.get("capture"), pairs), logicKind, opts);
            files.replaceAll(a -> a.fileName().equals(LinkChains.DISCOVERY + "-chain.json") ? new Artifact(a.channel(), a.startFs(),
                    a.endFs(), a.fileName(), a.mediaType(), ChainModels.text(LinkChains.onFront(front,
                    JsonReader.parse(a.fileName(), new String(a.content(), StandardCharsets.UTF_8)))).getBytes(StandardCharsets.UTF_8))
                    : a);
        }
        write(out, files);
        if (!console.quiet()) {
            for (Artifact a : files) {
                console.out().println(out.resolve(a.fileName()));
            }
        }
        return 0;
    }

    private static InspectReport inspect(Path capture) {
        if (!Files.isRegularFile(capture)) {
            throw new OptionException("capture", "--capture " + capture + ": no such file (expected a capture: .csv, .vcd, raw"
                    + " binary with a .json sidecar, packed logic or a capture set)");
        }
        return Inspector.inspect(capture, Map.of());
    }

    /** {@code --clock} and {@code --lanes}: one channel per signal (pairs with no N channel). */
    private static List<LinkChains.Pair> named(ToolArgs args) {
        String[] lanes = args.text("lanes").split(",");
        if (lanes.length > 4 || args.text("lanes").isBlank()) {
            throw new OptionException("lanes", "option '--lanes': 1 to 4 comma-separated port names expected, got '" + args.text("lanes") + "'");
        }
        if (args.text("clock").isBlank()) {
            throw new OptionException("clock", "option '--clock': the port name of the clock expected with --lanes");
        }
        List<LinkChains.Pair> pairs = new ArrayList<>();
        pairs.add(new LinkChains.Pair(args.text("clock").trim(), args.text("clock").trim(), ""));
        for (String l : lanes) {
            pairs.add(new LinkChains.Pair(l.trim(), l.trim(), ""));
        }
        return pairs;
    }

    /** Runs the chain model in memory and keeps the artifacts discovery emits. */
    @SuppressWarnings("unchecked")
    private static List<Artifact> run(Map<String, Object> model) {
        List<Artifact> files = new ArrayList<>();
        ChainBuilder b = Chain.builder(PluginRegistry.discover(FindFormatTool.class.getClassLoader()));
        for (Map<String, Object> n : (List<Map<String, Object>>) model.get("nodes")) {
            b.add((String) n.get("id"), (String) n.get("plugin"), (Map<String, Object>) n.get("options"));
        }
        for (Map<String, Object> w : (List<Map<String, Object>>) model.get("wires")) {
            b.wire((String) w.get("from"), (String) w.get("to"));
        }
        b.outputs((id, port, block) -> {
            if (id.equals(LinkChains.DISCOVERY) && block instanceof Artifact a) {
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
        return files;
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
