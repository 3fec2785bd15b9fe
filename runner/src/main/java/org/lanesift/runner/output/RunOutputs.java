package org.lanesift.runner.output;

import org.lanesift.plugin.OutputException;
import java.io.Closeable;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.annotation.Severity;
import org.lanesift.chain.BlockSink;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.Frame;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.WordStream;

/**
 * The files a run writes into its output directory, fed as the chain's host sink for unwired
 * outputs and for annotations (see {@code docs/outputs.md}):
 * <ul>
 * <li>edges and logic, and word streams as vectors: one VCD, {@value #VCD};</li>
 * <li>analog: {@code <instance>-<output>.csv}; bit streams: {@code <instance>-<output>-bits.csv};</li>
 * <li>bit and word streams in the packed binary forms (docs/bits-binary.md), when selected:
 * {@code <instance>-<output>.bits}, {@code <instance>-<output>.words};</li>
 * <li>frames: counted only; a stage writes its frame pictures as artifacts ({@code <id>-frame-NNNN.png});</li>
 * <li>artifacts: a file of the artifact's name (a later artifact of the same name replaces it);</li>
 * <li>annotations: {@value #ANNOTATIONS}, JSON Lines.</li>
 * </ul>
 * Every writer streams, so memory does not grow with the capture; counts per output and the
 * findings by severity are kept for {@code report.md}. An {@link OutputSelection} says which
 * outputs are written and in which forms: an output it leaves out is not counted and its blocks are
 * dropped (and not even asked for: {@link #wants}); one it keeps is counted even when no selected
 * form writes its kind (so {@code none} still reports every count), and findings are counted
 * whether or not {@value #ANNOTATIONS} is written.
 */
public final class RunOutputs implements BlockSink, AnnotationSink, Closeable {
    /** File name of the VCD. */
    public static final String VCD = "signals.vcd";
    /** File name of the annotations. */
    public static final String ANNOTATIONS = "annotations.jsonl";
    /** File name of the report. */
    public static final String REPORT = "report.md";
    /** How many findings of each severity the report lists one by one. */
    public static final int EXAMPLES_PER_SEVERITY = 20;

    private static final Set<String> RESERVED = Set.of(VCD, ANNOTATIONS, REPORT);

    private final Path dir;
    private final VcdWriter vcd;
    private final Map<String, OutputStats> stats = new LinkedHashMap<>();
    private final Map<String, AnalogCsvWriter> analog = new LinkedHashMap<>();
    private final Map<String, BitsCsvWriter> bits = new LinkedHashMap<>();
    private final Map<String, BitsBinaryWriter> bitsBinary = new LinkedHashMap<>();
    private final Map<String, WordsBinaryWriter> wordsBinary = new LinkedHashMap<>();
    private final OutputSelection selection;
    private final java.util.Set<String> leftOut = new java.util.LinkedHashSet<>();
    private final Map<String, Path> files = new LinkedHashMap<>();
    private final Map<Severity, Long> severityCounts = new EnumMap<>(Severity.class);
    /** The references findings cite for their limits (their field {@code source}), with how many cite each. */
    private final Map<String, Long> citedSources = new java.util.TreeMap<>();
    private final Map<String, Long> kindCounts = new TreeMap<>();
    /** Kind of the finding a skew correction or estimate that is not to be trusted carries (deskew, skew-estimate). */
    public static final String SUSPECT_SKEW_KIND = "skew-suspect";
    private final List<String> suspectSkews = new ArrayList<>();
    private final Map<Severity, java.util.TreeSet<Example>> earliest = new EnumMap<>(Severity.class);
    private long arrivals;
    private AnnotationJsonlWriter annotations;
    private boolean closed;

    /** Counts for one output. */
    public static final class OutputStats {
        final String instance;
        final String output;
        DataKind kind;
        long blocks;
        long items;
        long firstFs = Long.MAX_VALUE;
        long lastFs = Long.MIN_VALUE;
        final List<String> files = new ArrayList<>();

        OutputStats(String instance, String output, DataKind kind) {
            this.instance = instance;
            this.output = output;
            this.kind = kind;
        }

        /**
         * The output's name.
         *
         * @return {@code instance.output}
         */
        public String name() {
            return instance + "." + output;
        }

        /**
         * The output's kind.
         *
         * @return the kind, or null if nothing arrived and it was not declared
         */
        public DataKind kind() {
            return kind;
        }

        /**
         * Blocks received.
         *
         * @return the count
         */
        public long blocks() {
            return blocks;
        }

        /**
         * Items received: samples, transitions, bits, words, frames or bytes, by kind.
         *
         * @return the count
         */
        public long items() {
            return items;
        }

        /**
         * Start of the first block.
         *
         * @return femtoseconds; Long.MAX_VALUE if none
         */
        public long firstFs() {
            return firstFs;
        }

        /**
         * End of the last block.
         *
         * @return femtoseconds; Long.MIN_VALUE if none
         */
        public long lastFs() {
            return lastFs;
        }

        /**
         * Files this output went to.
         *
         * @return names relative to the output directory
         */
        public List<String> files() {
            return files;
        }
    }

    /**
     * Opens the outputs in a directory (created if needed).
     *
     * @param dir     output directory
     * @param version program version for the VCD header
     * @throws OutputException if the directory cannot be created
     */
    public RunOutputs(Path dir, String version) {
        this(dir, version, OutputSelection.of(null, List.of(), List.of()));
    }

    /**
     * Opens the outputs in a directory (created if needed), writing what a selection keeps.
     *
     * @param dir       output directory
     * @param version   program version for the VCD header
     * @param selection which outputs, in which forms
     * @throws OutputException if the directory cannot be created
     */
    public RunOutputs(Path dir, String version, OutputSelection selection) {
        this.dir = dir;
        this.selection = selection;
        try {
            Files.createDirectories(dir);
        } catch (IOException e) {
            throw new OutputException("cannot create output directory " + dir + ": " + e, e);
        }
        this.vcd = new VcdWriter(dir.resolve(VCD), dir.resolve(".lanesift-spool"), "lanesift " + version);
    }

    /**
     * Declares an output before the run so the report lists it even if it emits nothing.
     *
     * @param instance instance id
     * @param output   output port name
     * @param kind     its kind
     */
    public void declare(String instance, String output, DataKind kind) {
        if (!selection.wants(instance + "." + output)) {
            leftOut.add(instance + "." + output);
            return;
        }
        stats.computeIfAbsent(instance + "." + output, k -> new OutputStats(instance, output, kind));
        if ((kind == DataKind.EDGES || kind == DataKind.LOGIC || kind == DataKind.WORDS) && selection.writes(OutputSelection.Form.VCD)) {
            vcd.declare(instance, output);
        }
    }

    /**
     * The files the declared outputs will be written to, with the annotations and the report: what a
     * run can check against its inputs before it starts (artifacts are named only when they arrive).
     *
     * @return names relative to the output folder
     */
    public List<String> plannedFiles() {
        List<String> names = new ArrayList<>(List.of(REPORT));
        if (selection.writes(OutputSelection.Form.ANNOTATIONS)) {
            names.add(ANNOTATIONS);
        }
        for (OutputStats s : stats.values()) {
            String base = Texts.safe(s.instance) + "-" + Texts.safe(s.output);
            if (s.kind == DataKind.ANALOG && selection.writes(OutputSelection.Form.CSV)) {
                names.add(base + ".csv");
            } else if (s.kind == DataKind.BITS) {
                if (selection.writes(OutputSelection.Form.CSV)) {
                    names.add(base + "-bits.csv");
                }
                if (selection.writes(OutputSelection.Form.BINARY)) {
                    names.add(base + ".bits");
                }
            } else if (s.kind == DataKind.WORDS && selection.writes(OutputSelection.Form.BINARY)) {
                names.add(base + ".words");
            } else if ((s.kind == DataKind.EDGES || s.kind == DataKind.LOGIC) && selection.writes(OutputSelection.Form.VCD)
                    && !names.contains(VCD)) {
                names.add(VCD);
            }
        }
        if (!stats.isEmpty() && selection.writes(OutputSelection.Form.VCD) && !names.contains(VCD)) {
            names.add(VCD);
        }
        return names;
    }

    /**
     * Whether an unwired output is written (or at least counted); the chain asks this before the
     * output's first block, and a stage may then skip making an output nobody wants.
     *
     * @param instance instance id
     * @param output   output port name
     * @return true when the selection keeps it
     */
    public boolean wants(String instance, String output) {
        boolean w = selection.wants(instance + "." + output);
        if (!w) {
            leftOut.add(instance + "." + output);
        }
        return w;
    }

    /**
     * Whether a bit-stream output is written by a writer that reads its per-bit margins: only the
     * bits CSV does (its setup and hold columns); the packed binary form has no place for them
     * (docs/bits-binary.md). When no selected form reads them, the producer may send the bits
     * without margins (host-api {@code StageContext.wantsBitMargins}), and the files are the same.
     *
     * @param instance instance id
     * @param output   output port name
     * @return true when a selected writer reads the margins of this output
     */
    @Override
    public boolean readsBitMargins(String instance, String output) {
        return selection.wants(instance + "." + output) && selection.writes(OutputSelection.Form.CSV);
    }

    /**
     * Outputs the selection left out (by-products, or outputs not named), in the order met.
     *
     * @return {@code instance.output} names
     */
    public List<String> leftOut() {
        return List.copyOf(leftOut);
    }

    /**
     * The selection, in words, for the report.
     *
     * @return its description
     */
    public String selectionText() {
        return selection.describe();
    }

    @Override
    public void accept(String instance, String output, Block block) {
        String key = instance + "." + output;
        if (!stats.containsKey(key) && !wants(instance, output)) {
            return;
        }
        OutputStats s = stats.computeIfAbsent(key, k -> new OutputStats(instance, output, block.kind()));
        if (s.kind == null || s.kind == DataKind.ANY) {
            s.kind = block.kind();
        }
        s.blocks++;
        s.firstFs = Math.min(s.firstFs, block.startFs());
        s.lastFs = Math.max(s.lastFs, block.endFs());
        try {
            write(s, key, block);
        } catch (IOException e) {
            throw new OutputException("cannot write output of " + key + " in " + dir + ": " + e.getMessage(), e);
        }
    }

    private void write(OutputStats s, String key, Block block) throws IOException {
        String base = Texts.safe(s.instance) + "-" + Texts.safe(s.output);
        boolean toVcd = selection.writes(OutputSelection.Form.VCD);
        boolean toCsv = selection.writes(OutputSelection.Form.CSV);
        boolean toBinary = selection.writes(OutputSelection.Form.BINARY);
        if (block instanceof Edges e) {
            if (toVcd) {
                vcd.edges(s.instance, s.output, e);
                noteFile(s, VCD);
            }
            s.items += e.count();
        } else if (block instanceof LogicBlock l) {
            if (toVcd) {
                vcd.logic(s.instance, s.output, l);
                noteFile(s, VCD);
            }
            s.items += l.length();
        } else if (block instanceof WordStream w) {
            if (toVcd) {
                vcd.words(s.instance, s.output, w);
                noteFile(s, VCD);
            }
            if (toBinary) {
                WordsBinaryWriter wr = wordsBinary.get(key);
                if (wr == null) {
                    String name = base + ".words";
                    wr = new WordsBinaryWriter(file(name));
                    wordsBinary.put(key, wr);
                    noteFile(s, name);
                }
                wr.write(w);
            }
            s.items += w.count();
        } else if (block instanceof AnalogBlock a) {
            if (!toCsv) {
                s.items += a.length();
                return;
            }
            AnalogCsvWriter wr = analog.get(key);
            if (wr == null) {
                String name = base + ".csv";
                wr = new AnalogCsvWriter(file(name), s.output);
                analog.put(key, wr);
                noteFile(s, name);
            }
            wr.write(a);
            s.items += a.length();
        } else if (block instanceof BitStream b) {
            if (toCsv) {
                BitsCsvWriter wr = bits.get(key);
                if (wr == null) {
                    String name = base + "-bits.csv";
                    wr = new BitsCsvWriter(file(name));
                    bits.put(key, wr);
                    noteFile(s, name);
                }
                wr.write(b);
            }
            if (toBinary) {
                BitsBinaryWriter wr = bitsBinary.get(key);
                if (wr == null) {
                    String name = base + ".bits";
                    wr = new BitsBinaryWriter(file(name));
                    bitsBinary.put(key, wr);
                    noteFile(s, name);
                }
                wr.write(b);
            }
            s.items += b.count();
        } else if (block instanceof Frame) {
            // frames are counted, not drawn: pictures are the stage's artifacts, chosen by its own picture
            // options and encoded by the one picture writer (signal-kit FramePictures), so each is written once
            s.items++;
        } else if (block instanceof Artifact a) {
            s.items += a.content().length;
            if (!selection.writes(OutputSelection.Form.ARTIFACTS)) {
                return;
            }
            String name = a.fileName();
            if (RESERVED.contains(name) || name.startsWith(".lanesift")) {
                name = Texts.safe(s.instance) + "-" + name;
            }
            Files.write(file(name), a.content());
            noteFile(s, name);
        } else {
            throw new IllegalArgumentException("output " + key + " emitted a block of unknown type " + block.getClass().getName());
        }
    }

    private Path file(String name) {
        return dir.resolve(name);
    }

    private void noteFile(OutputStats s, String name) {
        if (!s.files.contains(name)) {
            s.files.add(name);
        }
        files.putIfAbsent(name, dir.resolve(name));
    }

    @Override
    public void accept(String source, Annotation a) {
        try {
            if (!selection.writes(OutputSelection.Form.ANNOTATIONS)) {
                // counted below for the report, not written
            } else if (annotations == null) {
                annotations = new AnnotationJsonlWriter(file(ANNOTATIONS));
                files.putIfAbsent(ANNOTATIONS, file(ANNOTATIONS));
            }
            if (annotations != null) {
                annotations.write(source, a);
            }
        } catch (IOException e) {
            throw new OutputException("cannot write " + dir.resolve(ANNOTATIONS) + ": " + e.getMessage(), e);
        }
        severityCounts.merge(a.severity(), 1L, Long::sum);
        String cited = FindingSource.cited(a);
        if (cited != null && FindingSource.isStandard(cited)) {
            citedSources.merge(cited, 1L, Long::sum);
        }
        if (a.kind().equals(SUSPECT_SKEW_KIND) && suspectSkews.size() < EXAMPLES_PER_SEVERITY) {
            org.lanesift.annotation.Field why = a.fields().get("reason");
            suspectSkews.add(a.track() + " (" + (why == null ? a.label() : why.value()) + ")");
        }
        kindCounts.merge(a.severity().name().toLowerCase(java.util.Locale.ROOT) + " " + a.kind(), 1L, Long::sum);
        // the earliest findings, whatever order the stages reported them in
        java.util.TreeSet<Example> ex = earliest.computeIfAbsent(a.severity(), k -> new java.util.TreeSet<>());
        if (ex.size() < EXAMPLES_PER_SEVERITY || a.startFs() <= ex.last().startFs()) {
            String from = FindingSource.of(a);
            ex.add(new Example(a.startFs(), Texts.seconds(a.startFs()) + " s, " + source + ", " + a.kind() + ": " + a.label()
                    + (from.isEmpty() ? "" : " [" + from + "]"), arrivals++));
            if (ex.size() > EXAMPLES_PER_SEVERITY) {
                ex.pollLast();
            }
        }
    }

    /** One example line, ordered by time, then text, then arrival. */
    private record Example(long startFs, String line, long arrival) implements Comparable<Example> {
        @Override
        public int compareTo(Example o) {
            int c = Long.compare(startFs, o.startFs);
            if (c == 0) {
                c = line.compareTo(o.line);
            }
            return c != 0 ? c : Long.compare(arrival, o.arrival);
        }
    }

    /**
     * Finishes every file (merging the VCD). Safe to call twice.
     *
     * @throws IOException the first failure; every writer is still closed
     */
    @Override
    public void close() throws IOException {
        if (closed) {
            return;
        }
        closed = true;
        IOException first = null;
        List<Closeable> all = new ArrayList<>();
        all.addAll(analog.values());
        all.addAll(bits.values());
        all.addAll(bitsBinary.values());
        all.addAll(wordsBinary.values());
        if (annotations != null) {
            all.add(annotations);
        }
        all.add(vcd);
        for (Closeable c : all) {
            try {
                c.close();
            } catch (IOException e) {
                first = first == null ? e : first;
            }
        }
        if (first != null) {
            throw first;
        }
    }

    /**
     * Counts per output, in declaration then arrival order.
     *
     * @return the stats
     */
    public List<OutputStats> outputs() {
        return new ArrayList<>(stats.values());
    }

    /**
     * Annotation counts per severity.
     *
     * @return counts
     */
    public Map<Severity, Long> severityCounts() {
        return severityCounts;
    }

    /**
     * The references the findings cite for the limits they were checked against (the text field
     * {@code source} of an annotation, such as a level check's standard and its
     * docs/reference-facts.md anchor), each with the number of findings citing it.
     *
     * @return counts, sorted by reference
     */
    public Map<String, Long> citedSources() {
        return java.util.Collections.unmodifiableMap(citedSources);
    }

    /**
     * Annotation counts per "severity kind".
     *
     * @return counts, sorted
     */
    public Map<String, Long> kindCounts() {
        return kindCounts;
    }

    /**
     * Channels whose skew estimate or correction was reported suspect ({@link #SUSPECT_SKEW_KIND}),
     * each as "channel (reason)", in arrival order, at most as many as the examples per severity.
     *
     * @return the lines, empty when none
     */
    public List<String> suspectSkews() {
        return suspectSkews;
    }

    /**
     * The earliest findings of each severity (by start time), as one line each.
     *
     * @return lines by severity
     */
    public Map<Severity, List<String>> examples() {
        Map<Severity, List<String>> m = new java.util.EnumMap<>(Severity.class);
        earliest.forEach((k, v) -> m.put(k, v.stream().map(Example::line).toList()));
        return m;
    }

    /**
     * Files written so far, by name relative to the output directory.
     *
     * @return names and paths
     */
    public Map<String, Path> files() {
        return files;
    }

    /**
     * The output directory.
     *
     * @return the directory
     */
    public Path dir() {
        return dir;
    }
}
