package org.lanesift.plugins.deskew;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.FutureTask;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.json.NumberStyle;
import org.lanesift.kit.SideThread;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;
import org.lanesift.report.Source;
import org.lanesift.time.Femtos;

/**
 * The running {@code deskew} instance: one offset and, for analog, one delay line per channel.
 *
 * <p>Analog legs lag by one block, the same with the worker thread on or off: {@link #accept}
 * of a leg's block hands on what the leg's previous block yielded and keeps what this block
 * yields until the leg's next block or {@link #finish}. With the worker (signal-kit's
 * {@link SideThread}, named {@value #THREAD_PREFIX} and the instance id), the block is filtered
 * there while the engine thread goes on: it hands on the previous outputs and runs the later
 * stages on the other legs' blocks; the leg's next {@code accept} (or {@link #finish}) waits for
 * the filter before it hands its outputs on. The input block is read after {@code accept} has
 * returned, which the ownership rule allows a stage that does not declare
 * {@code readsLentBlocks} (host-api {@code Block}). Without the worker, the previous outputs are
 * handed on first and the block is filtered after, so the emission schedule is the same either
 * way. A filter that fails (it has no input it can fail on; an error such as running out of
 * memory) is reported at the leg's next block or at {@code finish} when it ran on the worker.
 */
final class DeskewStage implements Stage {
    /** Largest analog delay, in samples: bounds the history a delay line keeps. */
    static final double MAX_DELAY_SAMPLES = 1 << 20;
    /** Largest offset, femtoseconds (1 ms). */
    static final double MAX_OFFSET_FS = 1e12;
    /** A table row below this confidence is reported as a suspect correction (the estimator's default minConfidence). */
    static final double SUSPECT_CONFIDENCE = 0.5;

    private final StageContext ctx;
    private final DataKind kind;
    private final int n;
    private final String unit;
    private final DelayKernel kernel;
    private SkewTable table;
    private String tableName;
    private final int tableInputs;
    private final double minConfidence;
    private final java.util.Map<String, SkewTable.Entry> calibrated = new java.util.LinkedHashMap<>();
    private final java.util.Map<String, String> calibratedFrom = new java.util.HashMap<>();
    private int tablesReceived;
    private final List<Double> given;
    private final Channel[] ch;
    private long firstFs = Long.MAX_VALUE;
    private long lastFs = Long.MIN_VALUE;
    private boolean marginNoted;
    /** Name prefix of the filter worker threads. */
    static final String THREAD_PREFIX = "lanesift-deskew ";
    /** The system property that turns stage worker threads off everywhere ({@code -Dlanesift.stageThreads=false}). */
    static final String PROPERTY = "lanesift.stageThreads";

    /** The second thread of analog filtering, or null when it is off. */
    private final SideThread worker;

    private final class Channel {
        final int index;
        boolean resolved;
        String name;
        double offsetFs;
        double confidence = 1;
        String method = "manual";
        String suspect = "";
        AnalogDelayLine line;
        /** What the delay line yielded for the leg's latest block, held until the next block or finish. */
        List<AnalogBlock> made = new ArrayList<>();
        /** An empty list to collect the next block's outputs in (the two lists take turns). */
        List<AnalogBlock> spare = new ArrayList<>();
        /** The worker's job for the leg's latest block (it fills {@link #made}), or null. */
        FutureTask<Void> pending;

        Channel(int index) {
            this.index = index;
        }
    }

    DeskewStage(StageContext ctx) {
        this.ctx = ctx;
        OptionValues o = ctx.options();
        this.kind = DeskewPlugin.kindOf(o);
        this.n = o.getInt("channels");
        this.unit = o.getString("offsetUnit");
        this.kernel = DelayKernel.of(o.getString("interpolator"));
        this.given = o.getNumbers("offsets");
        String file = o.getString("offsetsFile").trim();
        this.tableInputs = o.getInt("tables");
        this.minConfidence = o.getDouble("minConfidence");
        String who = "plugin 'deskew' instance '" + ctx.instanceId() + "'";
        if (!file.isEmpty() && !given.isEmpty()) {
            throw new OptionException("offsetsFile", who + ": give either offsets or offsetsFile, not both");
        }
        if (tableInputs > 0) {
            if (!file.isEmpty() || !given.isEmpty()) {
                throw new OptionException("tables", who + ": with tables=" + tableInputs + " the offsets come from the wired skew"
                        + " tables; give no offsets and no offsetsFile");
            }
            table = null;
            tableName = "the calibration pass";
        } else if (file.isEmpty()) {
            if (given.size() != n) {
                throw new OptionException("offsets", who + ": option 'offsets' needs " + n + " number" + (n == 1 ? "" : "s")
                        + " (one per channel, channels=" + n + ") in " + unit + ", got " + given.size()
                        + (given.isEmpty() ? "; or give offsetsFile" : ""));
            }
            if (kind == DataKind.EDGES && unit.equals("samples")) {
                throw new OptionException("offsetUnit", who + ": edge lists carry no sample period, so offsetUnit=samples"
                        + " cannot be resolved; give the offsets in ps or ns");
            }
            for (int i = 0; i < n; i++) {
                double v = given.get(i);
                double lim = unit.equals("samples") ? MAX_DELAY_SAMPLES : unit.equals("ns") ? MAX_OFFSET_FS / 1e6 : MAX_OFFSET_FS / 1e3;
                if (!Double.isFinite(v) || Math.abs(v) > lim) {
                    throw new OptionException("offsets", who + ": offsets[" + i + "] = " + v + " " + unit + " is outside +/-"
                            + NumberStyle.shortest().format(lim) + " " + unit);
                }
            }
            table = null;
            tableName = null;
        } else {
            try {
                table = SkewTable.read(Path.of(file));
            } catch (IllegalArgumentException e) {
                throw new OptionException("offsetsFile", who + ": option 'offsetsFile': " + e.getMessage());
            }
            tableName = file;
        }
        ch = new Channel[n];
        for (int i = 0; i < n; i++) {
            ch[i] = new Channel(i);
        }
        boolean threaded = kind == DataKind.ANALOG && o.getBoolean(DeskewPlugin.STAGE_THREAD) && SideThread.allowed(PROPERTY);
        this.worker = threaded ? new SideThread(THREAD_PREFIX + ctx.instanceId()) : null;
    }

    @Override
    public void accept(int input, Block block) {
        if (input >= n) {
            acceptTable(input - n, (Artifact) block);
            return;
        }
        if (tableInputs > 0 && table == null) {
            if (tablesReceived < tableInputs) {
                throw new IllegalStateException("data reached deskew before its " + tableInputs + " calibration tables ("
                        + tablesReceived + " arrived)");
            }
            table = new SkewTable("calibration", new ArrayList<>(calibrated.values()));
        }
        Channel c = ch[input];
        if (!c.resolved) {
            resolve(c, block);
        }
        firstFs = Math.min(firstFs, block.startFs());
        lastFs = Math.max(lastFs, block.endFs());
        switch (kind) {
            case ANALOG -> filter(c, (AnalogBlock) block);
            case EDGES -> ctx.emit(input, shift((Edges) block, Math.round(c.offsetFs)));
            case LOGIC -> {
                LogicBlock l = (LogicBlock) block;
                ctx.emit(input, new LogicBlock(l.channel(), l.firstIndex(), l.startFs() + Math.round(c.offsetFs), l.periodFs(),
                        l.bits(), l.length(), l.invalid()));
            }
            default -> throw new IllegalStateException("unexpected kind " + kind);
        }
    }

    /**
     * One leg block: hands on what the leg's previous block yielded and filters this one, keeping
     * its outputs for the leg's next block. With the worker, when the line filters (a whole-sample
     * delay is a copy, cheaper done here than handed over), the block is filtered there and this
     * call does not wait for it: the leg's next call (or {@link #finish}) does, before it hands the
     * outputs on, so the worker filters while this thread runs the later stages on every leg's
     * previous block. This stage does not declare {@code readsLentBlocks}, so the block is its own
     * to read after this call returns (host-api {@code Block}, "Ownership"). Each delay line is
     * used by one job at a time: a leg's job is awaited before the leg's next job is given.
     */
    private void filter(Channel c, AnalogBlock b) {
        if (worker == null || !c.line.filters()) {
            List<AnalogBlock> held = c.made;
            c.made = c.spare;
            handOn(c.index, held);
            c.line.accept(b);
            c.spare = held;
            return;
        }
        awaitJob(c);
        List<AnalogBlock> held = c.made;
        c.made = c.spare;
        c.pending = worker.submit(() -> {
            c.line.accept(b);
            return null;
        });
        handOn(c.index, held);
        c.spare = held;
    }

    /** Waits for the leg's job, if any (running it here when the worker has not begun it), and throws what it threw. */
    private void awaitJob(Channel c) {
        FutureTask<Void> job = c.pending;
        if (job == null) {
            return;
        }
        c.pending = null;
        Throwable t = worker.awaitUninterruptibly(job);
        if (t != null) {
            throw SideThread.rethrow(t, RuntimeException.class);
        }
    }

    /** Emits blocks on an output in order and empties the list. */
    private void handOn(int output, List<AnalogBlock> blocks) {
        for (int i = 0, k = blocks.size(); i < k; i++) {
            ctx.emit(output, blocks.get(i));
        }
        blocks.clear();
    }

    /** A skew table from a calibration input: its rows join the others; a channel in two tables is refused. */
    private void acceptTable(int k, Artifact a) {
        String name = a.fileName();
        SkewTable t;
        try {
            t = SkewTable.parse(name, new String(a.content(), StandardCharsets.UTF_8));
        } catch (IllegalArgumentException e) {
            throw new org.lanesift.plugin.InputFormatException("plugin 'deskew' instance '" + ctx.instanceId() + "': input table"
                    + k + " expects a skew table (a skew-estimate output): " + e.getMessage());
        }
        for (SkewTable.Entry e : t.entries()) {
            String before = calibratedFrom.putIfAbsent(e.name(), name);
            if (before != null) {
                SkewTable.Entry first = calibrated.get(e.name());
                if (Math.abs(first.offsetPs() - e.offsetPs()) < 1e-3) {
                    continue; // the same row twice, such as the reference channel of two per-lane tables
                }
                throw new OptionException("tables", String.format(Locale.ROOT, "plugin 'deskew' instance '%s': channel '%s' has"
                        + " %+.3f ps in skew table %s but %+.3f ps in %s; wire one estimate per channel", ctx.instanceId(),
                        e.name(), first.offsetPs(), before, e.offsetPs(), name));
            }
            calibrated.put(e.name(), e);
        }
        tablesReceived++;
    }

    /** Shifts every time of an edge list by {@code d} femtoseconds. */
    static Edges shift(Edges e, long d) {
        final int cnt = e.count();
        final long[] src = e.timesFs();
        final long[] t = new long[cnt];
        for (int i = 0; i < cnt; i++) {
            t[i] = src[i] + d;
        }
        long[] spans = null;
        int sc = e.invalidCount();
        if (sc > 0) {
            spans = new long[2 * sc];
            long[] s = e.invalidSpans();
            for (int i = 0; i < 2 * sc; i++) {
                spans[i] = s[i] + d;
            }
        }
        return new Edges(e.channel(), e.startFs() + d, e.endFs() + d, e.initialLevel(), t, cnt, spans, sc);
    }

    private void resolve(Channel c, Block b) {
        c.name = b.channel();
        double period = b instanceof AnalogBlock a ? a.periodFs() : b instanceof LogicBlock l ? l.periodFs() : Double.NaN;
        String who = "plugin 'deskew' instance '" + ctx.instanceId() + "'";
        if (table != null) {
            SkewTable.Entry e = table.get(c.name);
            if (e == null) {
                e = table.get("in" + c.index);
            }
            if (e == null) {
                throw new OptionException("offsetsFile", who + ": skew table " + tableName + " has no channel '" + c.name
                        + "' (input in" + c.index + "); its channels: "
                        + String.join(", ", table.entries().stream().map(SkewTable.Entry::name).toList()));
            }
            c.offsetFs = applied(e) * Femtos.PER_PS;
            c.confidence = e.confidence();
            c.method = applied(e) == e.offsetPs() ? e.method() : "manual";
            c.suspect = e.suspect();
            if (e.confidence() < minConfidence) {
                ctx.annotate(Annotation.on(c.name, "skew-not-applied").span(b.startFs(), b.startFs()).severity(Severity.WARNING)
                        .label("skew estimate not applied")
                        .text("detail", String.format(Locale.ROOT, "the estimate %+.3f ps for %s has confidence %.2f, below"
                                + " minConfidence %.2f: not applied (0 ps used)", e.offsetPs(), c.name, e.confidence(), minConfidence))
                        .number("offsetPs", e.offsetPs(), "ps").number("confidence", e.confidence(), "").build());
            }
        } else {
            double v = given.get(c.index);
            c.offsetFs = switch (unit) {
                case "ns" -> v * Femtos.PER_NS;
                case "samples" -> v * period;
                default -> v * Femtos.PER_PS;
            };
        }
        if (kind == DataKind.ANALOG) {
            double s = c.offsetFs / period;
            if (Math.abs(s) > MAX_DELAY_SAMPLES) {
                throw new OptionException(table != null ? "offsetsFile" : "offsets", who + ": offset of channel '" + c.name + "' ("
                        + Femtos.format(c.offsetFs) + ") is " + String.format(Locale.ROOT, "%.0f", s) + " samples; at most "
                        + (long) MAX_DELAY_SAMPLES + " samples are supported");
            }
            long[] m = sharedMargins(period);
            if (!marginNoted && m[0] + m[1] > 0) {
                // said once, as information, when the first channel starts: these samples were never the user's (the
                // kernel needs neighbours on both sides); in a segmented run only the first segment's note is kept
                marginNoted = true;
                ctx.annotate(Annotation.on(ctx.instanceId(), "kernel-margin").span(b.startFs(), b.startFs())
                        .label("interpolation kernel: the first " + m[0] + " and at most the last " + m[1]
                                + " samples of every channel are not produced")
                        .number("startSamples", m[0], "").number("endSamples", m[1], "").number("channels", n, "").build());
            }
            // every channel starts on the same sample (a later stage may need the legs to start together); each ends
            // where its own kernel allows, so blocks are cut where they were before the margins were left out
            c.line = new AnalogDelayLine(kernel, s, m[0], 0, blk -> c.made.add(blk));
        }
        c.resolved = true;
        ctx.annotate(Annotation.on(c.name, "skew-applied").span(b.startFs(), b.startFs())
                .label(String.format(Locale.ROOT, "offset %+.3f ps", c.offsetFs / Femtos.PER_PS))
                .number("offsetPs", c.offsetFs / Femtos.PER_PS, "ps").text("method", c.method)
                .text("source", appliedSource(c.method).text()).build());
        if (c.suspect.isEmpty() && c.confidence < SUSPECT_CONFIDENCE) {
            c.suspect = String.format(Locale.ROOT, "confidence %.2f is below %.2f", c.confidence, SUSPECT_CONFIDENCE);
        }
        if (!c.suspect.isEmpty()) {
            ctx.annotate(Annotation.on(c.name, "skew-suspect").span(b.startFs(), b.startFs()).severity(Severity.WARNING)
                    .label("suspect skew correction")
                    .text("detail", String.format(Locale.ROOT, "the correction %+.3f ps for %s from %s is suspect: %s; whatever is"
                            + " decoded from this channel is suspect too", c.offsetFs / Femtos.PER_PS, c.name, tableName, c.suspect))
                    .number("offsetPs", c.offsetFs / Femtos.PER_PS, "ps").number("confidence", c.confidence, "")
                    .text("reason", c.suspect).build());
        }
    }

    /** The offset applied for a table row, ps: the row's, or 0 when its confidence is below minConfidence. */
    private double applied(SkewTable.Entry e) {
        return e.confidence() < minConfidence ? 0 : e.offsetPs();
    }

    /**
     * The largest kernel margins {front, end} over every offset this stage may apply, in samples of
     * the given period: every channel leaves out the same samples at the capture ends, so channels
     * that came in on one sample grid leave on one too.
     */
    private long[] sharedMargins(double period) {
        List<Double> offsetsFs = new ArrayList<>();
        if (table != null) {
            for (SkewTable.Entry e : table.entries()) {
                offsetsFs.add(applied(e) * Femtos.PER_PS);
            }
        } else {
            for (double v : given) {
                offsetsFs.add(switch (unit) {
                    case "ns" -> v * Femtos.PER_NS;
                    case "samples" -> v * period;
                    default -> v * Femtos.PER_PS;
                });
            }
        }
        long[] m = new long[2];
        for (double fs : offsetsFs) {
            double s = fs / period;
            if (Math.abs(s) <= MAX_DELAY_SAMPLES) {
                long[] k = AnalogDelayLine.margins(kernel, s);
                m[0] = Math.max(m[0], k[0]);
                m[1] = Math.max(m[1], k[1]);
            }
        }
        return m;
    }

    @Override
    public void finish() {
        if (worker != null) {
            for (Channel c : ch) {
                awaitJob(c);
            }
            worker.close(); // every job has ended
        }
        for (Channel c : ch) {
            if (c.line != null) {
                handOn(c.index, c.made); // every leg's last block first, then every leg's tail
            }
        }
        List<SkewTable.Entry> rows = new ArrayList<>();
        java.util.Set<String> used = new java.util.HashSet<>();
        for (Channel c : ch) {
            if (c.line != null) {
                c.line.finish();
                handOn(c.index, c.made);
            }
            if (c.resolved) {
                // two inputs carrying the same channel name are told apart by their port name
                String key = used.add(c.name) ? c.name : "in" + c.index;
                used.add(key);
                rows.add(new SkewTable.Entry(key, c.offsetFs / Femtos.PER_PS, c.confidence, c.method, 0, c.suspect));
            } else if (table == null && tableInputs == 0 && !unit.equals("samples")) {
                double fs = given.get(c.index) * (unit.equals("ns") ? Femtos.PER_NS : Femtos.PER_PS);
                rows.add(new SkewTable.Entry("in" + c.index, fs / Femtos.PER_PS, 1, "manual", 0));
            }
        }
        if (ctx.isConnected(n)) {
            byte[] json = new SkewTable("manual", rows).toJson().getBytes(StandardCharsets.UTF_8);
            long s = firstFs == Long.MAX_VALUE ? 0 : firstFs;
            long e = lastFs == Long.MIN_VALUE ? s : Math.max(s, lastFs);
            ctx.emit(n, new Artifact(ctx.instanceId(), s, e, ctx.instanceId() + "-applied-skew.json", "application/json", json));
        }
    }

    /**
     * Stops the worker thread. Outputs still held (a run that failed or was closed without
     * {@link #finish}) are dropped: nothing is emitted after the chain has stopped.
     */
    @Override
    public void close() {
        if (worker != null) {
            worker.close();
        }
        for (Channel c : ch) {
            c.made.clear();
        }
    }

    /**
     * Where an applied offset comes from: the {@code offsets} option ({@code manual}), or a skew
     * table measured by an earlier pass and given as {@code offsetsFile} (its method named).
     */
    static Source appliedSource(String method) {
        return "manual".equals(method) ? Source.given("the offsets option")
                : Source.given("the offsetsFile skew table, method " + method);
    }
}
