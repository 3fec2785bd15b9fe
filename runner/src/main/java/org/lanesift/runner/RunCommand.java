package org.lanesift.runner;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.lanesift.annotation.Severity;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.ChainException;
import org.lanesift.chain.ChainSpec;
import org.lanesift.chain.StageFailure;
import org.lanesift.plugin.OptionSpec;
import org.lanesift.plugin.OutputException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;
import org.lanesift.plugin.PluginProvider;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.PortSpec;
import org.lanesift.chain.ChainFile;
import org.lanesift.chain.ChainFileException;
import org.lanesift.chain.ChainFileReader;
import org.lanesift.runner.output.OutputFolder;
import org.lanesift.runner.output.OutputSelection;
import org.lanesift.runner.output.ReportWriter;
import org.lanesift.runner.output.RunOutputs;
import org.lanesift.runner.output.RunSummary;
import org.lanesift.runner.segments.SegmentException;
import org.lanesift.runner.segments.SegmentPlan;
import org.lanesift.runner.segments.SegmentedRun;
import org.lanesift.unit.Quantity;
import picocli.CommandLine;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.PositionalParamSpec;

/**
 * {@code lanesift run CHAIN.json}: builds the chain, runs it over its sources, writes every output.
 * The command line is declared in code ({@link #commandLine}), not by annotations: reading
 * annotations costs picocli a reflective pass that took longer than a small run's decode
 * (DEVELOPERS.md, "Cold start").
 */
final class RunCommand implements Callable<Integer> {
    private static final String DESCRIPTION = "Runs a chain file over its capture files and writes its unwired outputs (by-products "
            + "only when asked for; see --outputs) and every annotation into the output directory: signals.vcd, "
            + "<instance>-<output>.csv, artifacts (reports, PNG pictures), annotations.jsonl and report.md "
            + "(see docs/chain-file.md and docs/outputs.md).";

    Path chain;
    List<String> inputs = new ArrayList<>();
    Path outDir;
    List<String> sets = new ArrayList<>();
    String outputsList;
    int jobs;
    long segmentFrames;
    private CommandSpec spec;

    private final Main.Host host;
    private final Interrupts interrupts;

    RunCommand(Main.Host host) {
        this(host, Interrupts.JVM);
    }

    RunCommand(Main.Host host, Interrupts interrupts) {
        this.host = host;
        this.interrupts = interrupts;
    }

    /**
     * The command's picocli model: the chain file, then its options in the order the help lists them,
     * the standard {@code --help} and {@code --version}.
     *
     * @param cmd the command the parsed values go to
     * @return the command line, ready to run or to add as the {@code run} subcommand
     */
    static CommandLine commandLine(RunCommand cmd) {
        CommandSpec cs = CommandSpec.wrapWithoutInspection(cmd).name("run").versionProvider(new Version());
        cs.usageMessage().sortOptions(false).description(DESCRIPTION);
        cs.addPositional(PositionalParamSpec.builder().index("0").arity("1").required(true).paramLabel("CHAIN.json").type(Path.class)
                .description("The chain file.").build());
        cs.addOption(CommandLine.Model.OptionSpec.builder("--input").paramLabel("NAME=FILE").type(List.class).auxiliaryTypes(String.class)
                .description("Sets option 'file' of instance NAME (relative to the current directory). Repeatable.").build());
        cs.addOption(CommandLine.Model.OptionSpec.builder("--out").paramLabel("DIR").type(Path.class).defaultValue("lanesift-out")
                .description("Output directory (default: ${DEFAULT-VALUE}).").build());
        cs.addOption(CommandLine.Model.OptionSpec.builder("--set").paramLabel("NODE.OPTION=VALUE").type(List.class).auxiliaryTypes(String.class)
                .description("Overrides one option of one instance. Repeatable.").build());
        cs.addOption(CommandLine.Model.OptionSpec.builder("--outputs").paramLabel("LIST").type(String.class)
                .description("Which results to write, in which forms, comma-separated; overrides the chain file's 'outputs': "
                        + "none (report.md only), standard (vcd, csv, artifacts, annotations: the default), vcd, csv, binary "
                        + "(packed .bits/.words files), artifacts, annotations, by-products, or INSTANCE.OUTPUT names "
                        + "(docs/chain-file.md, \"Which outputs a run writes\").").build());
        cs.addOption(CommandLine.Model.OptionSpec.builder("--jobs").paramLabel("N").type(int.class).defaultValue("1")
                .description("Decodes the capture in time segments on N threads and stitches them exactly (default: ${DEFAULT-VALUE},"
                        + " one pass); needs a raw capture and instances that declare segment support (docs/segments.md).").build());
        cs.addOption(CommandLine.Model.OptionSpec.builder("--segment-frames").paramLabel("FRAMES").type(long.class).defaultValue("0")
                .description("With --jobs: frames per segment, rounded up to whole blocks (default: chosen from the warm-up).")
                .build());
        cs.addOption(ToolCommand.helpOption());
        cs.addOption(ToolCommand.versionOption());
        cmd.spec = cs;
        return new CommandLine(cs);
    }

    /** Takes the parsed values (defaults for options not given) from the model. */
    private void bind() {
        chain = spec.positionalParameters().get(0).getValue();
        inputs = listValue("--input");
        outDir = spec.findOption("--out").getValue();
        sets = listValue("--set");
        outputsList = spec.findOption("--outputs").getValue();
        jobs = spec.findOption("--jobs").<Integer>getValue();
        segmentFrames = spec.findOption("--segment-frames").<Long>getValue();
    }

    private List<String> listValue(String option) {
        List<String> v = spec.findOption(option).getValue();
        return v == null ? new ArrayList<>() : v;
    }

    /** Where the Ctrl-C handler goes: the JVM's shutdown hooks, or a test's stand-in. */
    interface Interrupts {
        /** The JVM's shutdown hooks, which SIGINT (Ctrl-C) runs. */
        Interrupts JVM = new Interrupts() {
            @Override
            public void add(Thread hook) {
                Runtime.getRuntime().addShutdownHook(hook);
            }

            @Override
            public void remove(Thread hook) {
                try {
                    Runtime.getRuntime().removeShutdownHook(hook);
                } catch (IllegalStateException ignored) {
                    // already shutting down
                }
            }
        };

        void add(Thread hook);

        void remove(Thread hook);
    }

    /** Where a command-line override went, for messages. */
    private record CliOverride(String pointer, String typed) {
    }

    @Override
    public Integer call() throws Exception {
        if (spec != null) {
            bind(); // from a command line; ChainRun sets the fields itself
        }
        String shown = chain.toString();
        ChainFile cf = new ChainFileReader().read(chain, shown);
        List<ChainSpec.Node> nodes = new ArrayList<>(cf.spec().nodes());
        Map<String, Integer> index = new HashMap<>();
        for (int i = 0; i < nodes.size(); i++) {
            index.put(nodes.get(i).id(), i);
        }
        List<CliOverride> overrides = new ArrayList<>();
        Map<String, String> inputFiles = new LinkedHashMap<>();
        for (String in : inputs) {
            int eq = in.indexOf('=');
            if (eq <= 0 || eq == in.length() - 1) {
                throw new CliError("--input " + in + ": expected NAME=FILE, such as --input cap=capture.csv");
            }
            String name = in.substring(0, eq);
            String bad = ChainFileReader.badPath(in.substring(eq + 1));
            if (bad != null) {
                throw new CliError("--input " + org.lanesift.plugin.Echo.of(in) + ": " + bad);
            }
            Path file = Path.of(in.substring(eq + 1));
            Integer i = index.get(name);
            if (i == null) {
                throw new CliError("--input " + in + ": " + shown + " has no instance '" + name + "'; instances: "
                        + String.join(", ", index.keySet().stream().sorted().toList()));
            }
            if (!Files.isRegularFile(file)) {
                throw new CliError("--input " + in + ": " + (Files.exists(file) ? "not a regular file" : "no such file") + ": " + file);
            }
            String abs = file.toAbsolutePath().normalize().toString();
            nodes.set(i, with(nodes.get(i), "file", abs));
            inputFiles.put(name, file.toString());
            overrides.add(new CliOverride("/nodes/" + i + "/options/file", "--input " + in));
        }
        for (String s : sets) {
            int eq = s.indexOf('=');
            int dot = s.indexOf('.');
            if (eq < 0 || dot <= 0 || dot > eq || dot == eq - 1) {
                throw new CliError("--set " + s + ": expected NODE.OPTION=VALUE, such as --set rx.thresholdVolts=0.05");
            }
            String name = s.substring(0, dot);
            String option = s.substring(dot + 1, eq);
            String value = s.substring(eq + 1);
            Integer i = index.get(name);
            if (i == null) {
                throw new CliError("--set " + s + ": " + shown + " has no instance '" + name + "'; instances: "
                        + String.join(", ", index.keySet().stream().sorted().toList()));
            }
            if (ChainFileReader.isPathOption(option) && !value.isEmpty()) {
                String bad = ChainFileReader.badPath(value);
                if (bad != null) {
                    throw new CliError("--set " + org.lanesift.plugin.Echo.of(s) + ": " + bad);
                }
                value = Path.of(value).toAbsolutePath().normalize().toString();
            }
            nodes.set(i, with(nodes.get(i), option, value));
            overrides.add(new CliOverride("/nodes/" + i + "/options/" + option.replace("~", "~0").replace("/", "~1"), "--set " + s));
        }
        ChainSpec spec = new ChainSpec(nodes, cf.spec().wires());
        PluginRegistry registry = host.registry();

        Holder holder = new Holder(inputsOf(chain, spec));
        ProgressBar bar = new ProgressBar(host.err, !host.quiet && System.console() != null);
        if (jobs < 1) {
            throw new CliError("--jobs " + jobs + ": expected at least 1");
        }
        if (segmentFrames < 0) {
            throw new CliError("--segment-frames " + segmentFrames + ": expected a number of frames, at least 1");
        }
        Execution built;
        try {
            if (jobs > 1 || segmentFrames > 0) {
                SegmentPlan plan;
                try {
                    plan = SegmentPlan.of(spec, registry);
                } catch (SegmentException e) {
                    throw new CliError("--jobs " + jobs + ": " + shown + ": " + e.getMessage(), e);
                }
                holder.dir = outDir;
                SegmentedRun sr;
                try {
                    sr = new SegmentedRun(plan, registry, jobs, segmentFrames, holder,
                            (src, a) -> holder.outputs().accept(src, a), bar);
                } catch (SegmentException e) {
                    throw new CliError(e.getMessage(), e);
                }
                built = Execution.of(sr);
            } else {
                built = Execution.of(build(spec, registry, holder, bar));
            }
        } catch (StageFailure e) {

            // a stage that cannot open its file: point at the option that named it
            Integer i = index.get(e.instanceId());
            if (i != null && Failures.root(e) instanceof java.nio.file.FileSystemException
                    && nodes.get(i).options().containsKey("file")) {
                throw new CliError(locate(shown, new ChainException("instance '" + e.instanceId() + "' ("
                        + nodes.get(i).plugin() + "): " + Failures.describe(Failures.root(e)), "/nodes/" + i + "/options/file"),
                        overrides), e);
            }
            throw e;
        } catch (ChainFileException e) {
            throw e;
        } catch (ChainException e) {
            throw new CliError(locate(shown, e, overrides), e);
        }
        List<RunSummary.Instance> instances = new ArrayList<>();
        try (Execution c = built) {
            // the Ctrl-C handler is installed before the first file is written (the work folder), and
            // removed only after the report is in place: an interrupt either finds nothing written or
            // ends in a report that says the run was cancelled
            CountDownLatch done = new CountDownLatch(1);
            Thread hook = new Thread(() -> {
                c.cancel();
                try {
                    done.await(10, TimeUnit.SECONDS);
                } catch (InterruptedException ignored) {
                    Thread.currentThread().interrupt();
                }
            }, "lanesift-cancel");
            interrupts.add(hook);
            RunOutputs outs;
            OutputFolder folder;
            try {
                Results results = declareOutputs(spec, registry, instances);
                holder.selection = select(cf, results);
                outs = holder.outputs();
                folder = holder.folder;
                for (Map.Entry<String, org.lanesift.data.DataKind> r : results.kinds.entrySet()) {
                    int dot = r.getKey().indexOf('.');
                    outs.declare(r.getKey().substring(0, dot), r.getKey().substring(dot + 1), r.getValue());
                }
                try {
                    folder.refuseInputs(outs.plannedFiles());
                } catch (OutputException e) {
                    removeQuietly(folder);
                    throw e;
                }
            } catch (RuntimeException | Error e) {
                done.countDown();
                interrupts.remove(hook);
                throw e;
            }
            Instant started = Instant.now();
            long t0 = System.nanoTime();
            String status = "completed";
            Throwable failure = null;
            try {
                c.run();
                if (c.isCancelled()) {
                    status = "cancelled (interrupted); outputs hold what was processed until then";
                }
            } catch (SegmentException t) {
                failure = new CliError("--jobs " + jobs + ": " + t.getMessage(), t);
                status = "failed: " + Failures.oneLine(t.getMessage());
            } catch (Throwable t) {
                String why = Failures.oneLine(String.valueOf(t instanceof StageFailure sf
                        ? Failures.describe(Failures.root(sf)) : t.getMessage()));
                if (c.isCancelled()) {
                    // Ctrl-C: what stopped the stages is the cancellation; the outputs keep what was complete
                    status = "cancelled (interrupted); outputs hold what was processed until then (while stopping: "
                            + org.lanesift.plugin.Echo.of(why, 200) + ")";
                } else {
                    failure = t;
                    status = "failed: " + why;
                }
            } finally {
                bar.done();
                try {
                    outs.close();
                    List<String> names = new ArrayList<>(outs.files().keySet());
                    names.add(RunOutputs.REPORT);
                    try {
                        folder.refuseInputs(names);
                    } catch (OutputException e) {
                        // an output would replace an input: nothing is published
                        removeQuietly(folder);
                        throw e;
                    }
                    ReportWriter.write(new RunSummary(shown, cf.description(), Version.get(), started,
                            (System.nanoTime() - t0) / 1_000_000, status, inputFiles, sets, instances,
                            folder.stale(names)), outs);
                    folder.publish(outs.files().keySet());
                } catch (IOException e) {
                    if (failure == null) {
                        failure = new OutputException("cannot finish the outputs in " + outDir + ": " + e.getMessage(), e);
                    }
                } catch (OutputException e) {
                    failure = e;
                } finally {
                    done.countDown();
                    interrupts.remove(hook);
                }
            }
            if (failure != null) {
                if (failure instanceof ChainException ce && !(ce instanceof StageFailure)) {
                    throw new CliError(locate(shown, ce, overrides), ce);
                }
                if (failure instanceof Exception e) {
                    throw e;
                }
                throw (Error) failure;
            }
            if (!host.quiet) {
                summary(shown, instances.size(), outs);
            }
        }
        return 0;
    }

    /** The selection of the chain file's {@code outputs} field, or of {@code --outputs} when given. */
    private OutputSelection select(ChainFile cf, Results results) {
        if (outputsList != null) {
            List<String> names = new ArrayList<>();
            for (String n : outputsList.split(",", -1)) {
                names.add(n.trim());
            }
            try {
                return OutputSelection.of(names, results.kinds.keySet(), results.byProducts);
            } catch (OutputSelection.SelectionException e) {
                throw new CliError("--outputs " + org.lanesift.plugin.Echo.of(outputsList) + ": " + e.getMessage(), e);
            }
        }
        try {
            return OutputSelection.of(cf.outputs(), results.kinds.keySet(), results.byProducts);
        } catch (OutputSelection.SelectionException e) {
            throw new ChainFileException(cf.shownName(), e.index() < 0 ? "/outputs" : "/outputs/" + e.index(), 0, 0, e.getMessage());
        }
    }

    private Chain build(ChainSpec spec, PluginRegistry registry, Holder holder, ProgressBar bar) {
        ChainBuilder b = ChainBuilder.fromSpec(spec, registry)
                .outputs(holder)
                .annotations((src, a) -> holder.outputs().accept(src, a))
                .progress(bar);
        holder.dir = outDir;
        return b.build();
    }

    /** One pass of a chain, or a segmented run: what the command runs and can cancel. */
    private interface Execution extends AutoCloseable {
        void run();

        void cancel();

        boolean isCancelled();

        @Override
        void close();

        static Execution of(Chain c) {
            return new Execution() {
                public void run() {
                    c.run();
                }

                public void cancel() {
                    c.cancel();
                }

                public boolean isCancelled() {
                    return c.isCancelled();
                }

                public void close() {
                    c.close();
                }
            };
        }

        static Execution of(SegmentedRun r) {
            return new Execution() {
                public void run() {
                    r.run();
                }

                public void cancel() {
                    r.cancel();
                }

                public boolean isCancelled() {
                    return r.isCancelled();
                }

                public void close() {
                }
            };
        }
    }

    /**
     * Creates the outputs, in a fresh work folder inside {@code --out}, when the first block or the
     * run needs them; and is the chain's host sink (one pass or segmented): blocks, which outputs
     * are wanted and whether their bit margins are read all go to the one {@link RunOutputs}.
     */
    private static final class Holder implements org.lanesift.chain.BlockSink {
        final List<Path> inputs;
        Path dir;
        OutputFolder folder;
        RunOutputs outputs;
        OutputSelection selection;

        Holder(List<Path> inputs) {
            this.inputs = inputs;
        }

        RunOutputs outputs() {
            if (outputs == null) {
                folder = OutputFolder.open(dir, inputs);
                try {
                    outputs = new RunOutputs(folder.work(), Version.get(), selection == null
                            ? OutputSelection.of(null, List.of(), List.of()) : selection);
                } catch (OutputException e) {
                    removeQuietly(folder);
                    throw new OutputException("--out " + dir + ": cannot create the directory: " + Failures.describe(Failures.root(e)), e);
                }
            }
            return outputs;
        }

        @Override
        public void accept(String id, String port, org.lanesift.data.Block block) {
            outputs().accept(id, port, block);
        }

        @Override
        public boolean wants(String id, String port) {
            return outputs().wants(id, port);
        }

        @Override
        public boolean readsBitMargins(String id, String port) {
            return outputs().readsBitMargins(id, port);
        }
    }

    private static void removeQuietly(OutputFolder folder) {
        try {
            folder.removeWork();
        } catch (IOException ignored) {
            // the work folder is listed as stale by the next run
        }
    }

    /**
     * Every file the run reads: the chain file, each option that names a file (with a raw capture's
     * default sidecar) and the files directly inside a folder option.
     */
    static List<Path> inputsOf(Path chain, ChainSpec spec) {
        List<Path> in = new ArrayList<>();
        in.add(chain);
        for (ChainSpec.Node n : spec.nodes()) {
            for (Map.Entry<String, Object> o : n.options().entrySet()) {
                if (!ChainFileReader.isPathOption(o.getKey()) || !(o.getValue() instanceof String s) || s.isEmpty()
                        || s.indexOf('\0') >= 0) {
                    continue;
                }
                Path p;
                try {
                    p = Path.of(s);
                } catch (java.nio.file.InvalidPathException e) {
                    continue;
                }
                in.add(p);
                if (o.getKey().equals("file")) {
                    in.add(Path.of(s + ".json"));
                }
                if (Files.isDirectory(p)) {
                    try (java.util.stream.Stream<Path> l = Files.list(p)) {
                        l.limit(100_000).forEach(in::add);
                    } catch (IOException | java.io.UncheckedIOException ignored) {
                        // an unreadable folder is reported by the stage that reads it
                    }
                }
            }
        }
        return in;
    }

    private static ChainSpec.Node with(ChainSpec.Node n, String key, Object value) {
        Map<String, Object> o = new LinkedHashMap<>(n.options());
        o.put(key, value);
        return new ChainSpec.Node(n.id(), n.plugin(), o);
    }

    /** "chain.json /nodes/1/options/x: message", or the command-line override that set the value. */
    private static String locate(String file, ChainException e, List<CliOverride> overrides) {
        String p = e.pointer();
        if (p != null) {
            for (int i = overrides.size() - 1; i >= 0; i--) {
                if (overrides.get(i).pointer().equals(p)) {
                    return overrides.get(i).typed() + " (" + file + " " + p + "): " + e.getMessage();
                }
            }
            return file + " " + p + ": " + e.getMessage();
        }
        return file + ": " + e.getMessage();
    }

    /**
     * An option's value for the report: as the user wrote it when given (with the option's unit
     * after a bare number), otherwise the default in engineering units; an absent number (NaN) is
     * "unset" (learned from the capture or derived, as the plugin documents), and a time with its
     * unit is written with a space ({@code 1000000 samples}, {@code 0 UI}).
     */
    static String optionText(OptionSpec o, Object given, Object value) {
        if (given != null) {
            String text = given instanceof Double d && d == Math.rint(d) && Math.abs(d) < 1e15 ? String.valueOf(d.longValue())
                    : String.valueOf(given);
            return given instanceof Number && !o.unit().isEmpty() && o.type() != OptionSpec.Type.TIME ? text + " " + o.unit() : text;
        }
        if (value instanceof Double d) {
            if (d.isNaN()) {
                return "unset";
            }
            if (!o.unit().isEmpty() && d != 0 && !o.unit().equals("%")) {
                return Quantity.format(d, o.unit());
            }
            String text = d == Math.rint(d) && Math.abs(d) < 1e15 ? String.valueOf(d.longValue()) : String.valueOf(d);
            return o.unit().isEmpty() ? text : text + " " + o.unit();
        }
        String text = String.valueOf(value);
        if (o.type() == OptionSpec.Type.TIME) {
            return text.replaceFirst("^([-+]?[0-9.eE+-]*[0-9])([A-Za-z\u00b5\u03bc]+)$", "$1 $2");
        }
        return text;
    }

    /**
     * The chain's results (outputs no wire consumes) with their kinds, in node and port order, and
     * which of them are by-products: stream outputs (not artifacts) of an instance that feeds another
     * through some other output.
     */
    private record Results(Map<String, org.lanesift.data.DataKind> kinds, Set<String> byProducts) {
    }

    private static Results declareOutputs(ChainSpec spec, PluginRegistry registry, List<RunSummary.Instance> instances) {
        Set<String> wired = new HashSet<>();
        Map<String, List<PortSpec>> outsByNode = new HashMap<>();
        for (ChainSpec.Node n : spec.nodes()) {
            PluginProvider p = registry.find(n.plugin());
            PluginDescriptor d = p.descriptor();
            OptionValues ov = OptionValues.validate(d, n.options());
            outsByNode.put(n.id(), d.outputs(ov));
            Map<String, String> opts = new LinkedHashMap<>();
            for (OptionSpec o : d.options()) {
                opts.put(o.name(), optionText(o, n.options().get(o.name()), ov.asMap().get(o.name())));
            }
            instances.add(new RunSummary.Instance(n.id(), d.id(), d.displayName() == null ? d.id() : d.displayName(), d.version(), opts,
                    Set.copyOf(n.options().keySet())));
        }
        for (ChainSpec.Wire w : spec.wires()) {
            String from = w.from();
            int dot = from.indexOf('.');
            if (dot < 0) {
                List<PortSpec> ports = outsByNode.get(from);
                if (ports != null && ports.size() == 1) {
                    wired.add(from + "." + ports.get(0).name());
                }
            } else {
                wired.add(from);
            }
        }
        Map<String, org.lanesift.data.DataKind> kinds = new LinkedHashMap<>();
        Set<String> byProducts = new HashSet<>();
        for (ChainSpec.Node n : spec.nodes()) {
            boolean feeds = false;
            for (PortSpec ps : outsByNode.get(n.id())) {
                feeds |= wired.contains(n.id() + "." + ps.name());
            }
            for (PortSpec ps : outsByNode.get(n.id())) {
                String name = n.id() + "." + ps.name();
                if (!wired.contains(name)) {
                    kinds.put(name, ps.kind());
                    if (feeds && ps.kind() != org.lanesift.data.DataKind.ARTIFACT) {
                        byProducts.add(name);
                    }
                }
            }
        }
        return new Results(kinds, byProducts);
    }

    private void summary(String shown, int instances, RunOutputs outs) {
        Map<Severity, Long> c = outs.severityCounts();
        List<String> f = new ArrayList<>();
        for (Severity s : new Severity[] {Severity.ERROR, Severity.WARNING, Severity.INFO}) {
            long n = c.getOrDefault(s, 0L);
            String name = s.name().toLowerCase(Locale.ROOT);
            f.add(n + " " + (s == Severity.INFO ? "info" : name + (n == 1 ? "" : "s")));
        }
        host.out.println("ran " + shown + ": " + instances + (instances == 1 ? " instance" : " instances") + "; findings: " + String.join(", ", f));
        host.out.println("wrote " + outDir + "/: " + String.join(", ", outs.files().keySet()));
    }
}
