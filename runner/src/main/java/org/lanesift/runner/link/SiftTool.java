package org.lanesift.runner.link;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.plugin.Tool;
import org.lanesift.plugin.ToolArgs;
import org.lanesift.plugin.ToolConsole;
import org.lanesift.plugin.ToolSpec;
import org.lanesift.runner.ChainRun;
import org.lanesift.runner.output.OutputSelection;
import org.lanesift.runner.capture.InspectReport;
import org.lanesift.runner.capture.Inspector;

/**
 * {@code lanesift sift}: the whole job on one capture in one command. It finds the pairs and the
 * clock (or takes a channel map), decides the link kind, derives the unit interval from the
 * measured clock, writes one chain file with paths relative to itself whose skew estimators feed
 * the corrections through calibration wires (the engine runs them in calibration passes before the
 * decode), runs it once and writes one report ({@link SiftReport}) that leads with the result.
 */
public final class SiftTool implements Tool {
    /** Exit status of a run whose findings reach the {@code --fail-on} severity. */
    public static final int EXIT_FINDINGS = 3;

    static final ToolSpec SPEC = ToolSpec.builder("sift")
            .summary("decodes a capture of a pixel or packet link in one run: pairs, skews, unit interval, decode, report")
            .description("Finds the differential pairs and the clock pair (or takes --map / --map-file), estimates the skew",
                    "between the legs of every pair and between every data pair and the clock, derives the unit interval",
                    "from the measured clock (pixel link: clock period / 7; packet link: half the DDR clock period), chooses",
                    "the slot mapping from the lane count and decodes, all in one chain run. Writes OUT/report.md,",
                    "OUT/report.json, the chain file it ran (OUT/chains/sift.json, rerunnable with 'lanesift run'), the",
                    "skew tables applied (OUT/skew) and every decoder output (OUT/decode).")
            .required(OptionSpec.text("capture", null, "the capture: CSV, VCD (analog legs, or 1-bit logic lanes of a pixel link),"
                    + " or raw binary with a JSON sidecar"),
                    "FILE")
            .option(OptionSpec.choice("link", "auto", "link kind: pixel (7:1 LVDS), packet (D-PHY/DSI-like) or auto",
                    "auto", "pixel", "packet"), "KIND")
            .option(OptionSpec.text("map", "", "channel map: NAME=P,N entries separated by spaces or ';', the clock pair first,"
                    + " then the data lanes in order, such as \"CLK=CH1,CH2 D0=CH3,CH4\"; NAME=CH for a logic capture"), "MAP")
            .option(OptionSpec.text("map-file", "", "channel map file: one NAME=P,N per line, '#' comments; added after --map"),
                    "FILE")
            .option(OptionSpec.text("out", "lanesift-sift", "output folder"), "DIR")
            .option(OptionSpec.text("outputs", OutputSelection.STANDARD_NAME, "which decoder outputs go to OUT/decode, comma-separated"
                    + " (the chain file's 'outputs' field, docs/chain-file.md): standard, vcd, csv, binary, annotations, by-products,"
                    + " or none; the artifacts (skew tables, reports, pictures) and annotations are always written, the report reads them"), "LIST")
            .flag("json", "print the report as JSON on standard output (also written to OUT/report.json)")
            .option(OptionSpec.choice("fail-on", "none", "exit with status 3 when findings of this severity or worse exist:"
                    + " none, warning or error", "none", "warning", "error"), "SEVERITY")
            .footer("Exit codes: 0 decoded; 3 decoded, with findings at the --fail-on severity;",
                    "2 bad input (capture, map, options); 1 internal error. See docs/sift.md.",
                    "",
                    "Safety: display flex cables and connectors are sensitive to electrostatic",
                    "discharge (wrist strap, power down before plugging); a scope's ground lead is",
                    "earthed: never clip it to a mains-referenced circuit. Follow local codes and",
                    "licensed practice (README, Safety).")
            .build();

    /** Creates the tool (ServiceLoader). */
    public SiftTool() {
    }

    @Override
    public ToolSpec spec() {
        return SPEC;
    }

    @Override
    public int run(ToolArgs args, ToolConsole console) {
        Path capture = Path.of(args.text("capture"));
        if (!Files.isRegularFile(capture)) {
            throw new OptionException("capture", "--capture " + capture + ": no such file (expected a capture: .csv, .vcd or raw"
                    + " binary with a .json sidecar)");
        }
        Path out = Path.of(args.text("out"));
        InspectReport inspect = Inspector.inspect(capture, Map.of());
        String logicKind = logicKind(inspect);
        List<LinkChains.Pair> pairs = pairs(args, inspect, logicKind != null);
        if (logicKind != null && args.text("link").equals("packet")) {
            throw new OptionException("link", "--link packet: " + capture + " is a logic capture (no analog levels), and a packet"
                    + " link's low-power states are seen only on the analog legs; sift decodes logic captures of 7:1 pixel links");
        }
        List<String> outputs = outputs(args.text("outputs"));
        LinkFacts facts = LinkFacts.of(inspect, pairs, args.text("link"));
        try {
            SiftResult result = runPasses(capture, out, inspect.format(), pairs, facts, logicKind, outputs, console);
            if (result.failedExit != 0) {
                return result.failedExit;
            }
            SiftReport report = SiftReport.read(out, capture, inspect, pairs, facts, result.notes, args);
            Files.writeString(out.resolve("report.md"), report.markdown(), StandardCharsets.UTF_8);
            String json = report.json();
            Files.writeString(out.resolve("report.json"), json, StandardCharsets.UTF_8);
            if (args.flag("json")) {
                console.out().print(json);
            } else if (!console.quiet()) {
                console.out().print(report.headline());
                console.out().println("report: " + out.resolve("report.md"));
            }
            String failOn = args.text("fail-on");
            return report.reaches(failOn) ? EXIT_FINDINGS : 0;
        } catch (IOException e) {
            throw new OutputException("sift: " + out + ": " + e.getMessage(), e);
        }
    }

    /**
     * The kind of a logic capture's channels ("LOGIC" for sampled bits, "EDGES" for a VCD's
     * 1-bit signals), or null when the capture has analog channels (legs).
     */
    static String logicKind(InspectReport inspect) {
        boolean logic = !inspect.channels().isEmpty();
        boolean samples = false;
        for (InspectReport.Channel c : inspect.channels()) {
            logic &= c.kind().equals("LOGIC") || c.kind().equals("EDGES");
            samples |= c.kind().equals("LOGIC");
        }
        return !logic ? null : samples ? "LOGIC" : "EDGES";
    }

    static List<LinkChains.Pair> pairs(ToolArgs args, InspectReport inspect, boolean logic) {
        Set<String> known = new LinkedHashSet<>();
        inspect.channels().forEach(c -> known.add(c.name()));
        List<LinkChains.Pair> pairs = new ArrayList<>(LinkPairs.parseOption(args.text("map"), known));
        if (!args.text("map-file").isEmpty()) {
            LinkPairs.parseFile(Path.of(args.text("map-file")), known, pairs);
        }
        if (pairs.isEmpty()) {
            return logic ? LinkPairs.findLogic(inspect) : LinkPairs.find(inspect);
        }
        for (LinkChains.Pair p : pairs) {
            if (logic != p.n().isEmpty()) {
                throw new OptionException("map", "map entry " + p.name() + ": " + (logic
                        ? "this is a logic capture (one channel per lane): expected " + p.name() + "=CH"
                        : "this capture has analog legs: expected " + p.name() + "=P,N"));
            }
        }
        if (pairs.size() < 2) {
            throw new OptionException("map", "the channel map gives " + pairs.size() + " pair; expected the clock pair first and"
                    + " at least one data pair");
        }
        return pairs;
    }

    /**
     * The {@code outputs} field of the chain sift writes: the forms and keywords given (no single
     * outputs: the instance names are sift's own), with {@code artifacts} and {@code annotations}
     * added, since the report, the skew tables and the findings are read from them; {@code none}
     * leaves only those two.
     */
    static List<String> outputs(String list) {
        List<String> allowed = new ArrayList<>(List.of(OutputSelection.NONE, OutputSelection.STANDARD_NAME, OutputSelection.BY_PRODUCTS));
        for (OutputSelection.Form f : OutputSelection.Form.values()) {
            allowed.add(f.label());
        }
        List<String> names = new ArrayList<>();
        for (String n : list.split(",", -1)) {
            String t = n.trim();
            if (!allowed.contains(t)) {
                throw new OptionException("outputs", "--outputs " + org.lanesift.plugin.Echo.of(list) + ": unknown output name '"
                        + org.lanesift.plugin.Echo.of(t) + "'; expected one or more of: " + String.join(", ", allowed));
            }
            if (!names.contains(t)) {
                names.add(t);
            }
        }
        if (names.contains(OutputSelection.NONE)) {
            if (names.size() > 1) {
                throw new OptionException("outputs", "--outputs " + list + ": 'none' cannot be combined with other names");
            }
            names.clear();
        }
        boolean standard = names.contains(OutputSelection.STANDARD_NAME)
                || (!names.isEmpty() && names.stream().allMatch(x -> x.equals(OutputSelection.BY_PRODUCTS)));
        if (!standard) {
            for (OutputSelection.Form f : List.of(OutputSelection.Form.ARTIFACTS, OutputSelection.Form.ANNOTATIONS)) {
                if (!names.contains(f.label())) {
                    names.add(f.label());
                }
            }
        }
        return names;
    }

    /** The chain file sift writes and runs, under OUT/chains. */
    static final String CHAIN = "sift.json";

    /** What the run left behind. */
    private record SiftResult(int failedExit, List<String> notes) {
    }

    private static SiftResult runPasses(Path capture, Path out, String plugin, List<LinkChains.Pair> pairs, LinkFacts facts,
                                        String logicKind, List<String> outputs, ToolConsole console) throws IOException {
        Path chains = out.resolve("chains");
        for (String d : new String[] {"chains", "skew", "decode"}) {
            Files.createDirectories(out.resolve(d));
        }
        LinkChains.Capture cap = new LinkChains.Capture(plugin, rel(chains, capture), pairs);
        List<String> notes = new ArrayList<>();
        // one chain, one run: the engine runs the skew estimators in calibration passes over the capture and
        // feeds their tables to the corrections before the decode reads the capture from its start
        Path chain = chains.resolve(CHAIN);
        String ui = String.format(Locale.ROOT, "%.3fps", facts.unitIntervalFs() / 1e3);
        Map<String, Object> model = new java.util.LinkedHashMap<>(logicKind != null
                ? LinkChains.pixelLogicOneRun("7:1 pixel link from a logic capture: lane skew estimated and corrected in this"
                        + " run; 7:1 sampling, frames, timing, jitter", cap, ui, facts.mapping(), logicKind.equals("LOGIC"))
                : facts.packet()
                ? LinkChains.packetOneRun("packet link: leg and lane skews estimated and corrected in this run;"
                        + " DDR sampling, packets, commands, frames", cap)
                : LinkChains.pixelOneRun("7:1 pixel link: leg and lane skews estimated and corrected in this run;"
                        + " 7:1 sampling, frames, timing, eye, jitter", cap,
                        ui, facts.mapping()));
        model.put("outputs", outputs);
        ChainModels.write(chain, model);
        int code = run(chain, out.resolve("decode"), console);
        if (code == 0) {
            // the tables as applied, kept per probe set (docs/skew-table.md)
            if (logicKind == null) { // a logic capture has no legs
                Files.copy(out.resolve("decode/legs-applied-skew.json"), out.resolve("skew/legs.json"),
                        java.nio.file.StandardCopyOption.REPLACE_EXISTING);
            }
            Files.copy(out.resolve("decode/lanes-applied-skew.json"), out.resolve("skew/lanes.json"),
                    java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        }
        return new SiftResult(code, notes);
    }

    private static String rel(Path from, Path to) {
        return from.toAbsolutePath().normalize().relativize(to.toAbsolutePath().normalize()).toString().replace('\\', '/');
    }

    private static int run(Path chain, Path outDir, ToolConsole console) {
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = ChainRun.of(chain).out(outDir).quiet(true).debug(console.debug())
                .run(new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8),
                        new PrintStream(err, true, StandardCharsets.UTF_8));
        if (code != 0) {
            console.err().println("sift: chain " + chain + " (" + outDir + "): " + err.toString(StandardCharsets.UTF_8).trim());
        }
        return code;
    }
}
