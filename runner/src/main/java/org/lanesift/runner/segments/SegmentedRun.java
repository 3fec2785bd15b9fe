package org.lanesift.runner.segments;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.Comparator;
import java.util.Deque;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.PriorityQueue;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.AnnotationSink;
import org.lanesift.annotation.Field;
import org.lanesift.chain.BlockSink;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.ChainSpec;
import org.lanesift.chain.ProgressListener;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;
import org.lanesift.plugin.SegmentSupport;
import org.lanesift.time.Femtos;

/**
 * Decodes a raw capture in time segments on several threads and stitches them exactly.
 *
 * <p>Segment {@code k} covers frames {@code [k L, (k+1) L)}; its front chain reads a margin of
 * {@code M} frames on either side: the warm-up plus a comparison zone {@code V} at least as long,
 * rounded up to whole blocks so that every segment cuts its blocks where one pass does. Each front output is kept
 * from time {@code T_k} (the segment's first frame) to {@code T_{k+1}}. Before a seam is crossed,
 * the two neighbouring segments are compared over {@code [T_k - V, T_k + V)}, where both are
 * past their warm-up and clear of their ends: every transition, unknown span, logic sample and
 * annotation there must be identical, or the run stops with an error naming the output and the
 * first difference. The back chain then receives the kept streams in time order, exactly as one
 * pass would have delivered the same signal, only cut into blocks at different places (which no
 * stage may depend on). Front artifacts must be identical in every segment and are written once.
 * At most {@code jobs + 1} segments are held at a time, so memory stays bounded.
 */
public final class SegmentedRun {
    private final SegmentPlan plan;
    private final PluginRegistry registry;
    private final int jobs;
    private final long segmentFrames;
    private final long marginFrames;
    private final long zoneFs;
    private final BlockSink outputs;
    private final AnnotationSink annotations;
    private final ProgressListener progress;
    private volatile boolean cancelled;
    private volatile Chain backChain;
    private final java.util.Set<Chain> fronts = java.util.concurrent.ConcurrentHashMap.newKeySet();
    private int segmentsDone;
    private int segmentCount;

    private final TimeChunks chunks = new TimeChunks();

    /** What one front run produced. */
    private static final class Result {
        final int index;
        final Map<String, KeptStream> streams = new LinkedHashMap<>();
        final List<String> annSources = new ArrayList<>();
        final List<Annotation> anns = new ArrayList<>();
        private final TimeChunks chunks;

        Result(int index, TimeChunks chunks) {
            this.index = index;
            this.chunks = chunks;
        }

        void keep(String key, Block b) {
            streams.computeIfAbsent(key, x -> new KeptStream(chunks)).add(b);
        }

        List<Block> blocks(String key) {
            KeptStream k = streams.get(key);
            return k == null ? List.of() : k.blocks();
        }

        List<Block> clipped(String key, long fromFs, long toFs) {
            KeptStream k = streams.get(key);
            return k == null ? List.of() : k.clipped(fromFs, toFs);
        }

        Iterator<Block> clippedOneByOne(String key, long fromFs, long toFs) {
            KeptStream k = streams.get(key);
            return k == null ? Collections.emptyIterator() : k.clippedOneByOne(fromFs, toFs);
        }

        void release() {
            for (KeptStream k : streams.values()) {
                k.release();
            }
            streams.clear();
        }
    }

    /**
     * Prepares a run.
     *
     * @param plan          the split chain
     * @param registry      plugins
     * @param jobs          segments decoded at once (threads)
     * @param segmentFrames frames per segment, 0 for the default; rounded up to whole blocks
     * @param outputs       where unwired outputs go (front and back)
     * @param annotations   where annotations go
     * @param progress      progress in frames
     */
    public SegmentedRun(SegmentPlan plan, PluginRegistry registry, int jobs, long segmentFrames, BlockSink outputs,
                        AnnotationSink annotations, ProgressListener progress) {
        if (jobs < 1) {
            throw new SegmentException("--jobs must be at least 1, got " + jobs);
        }
        this.plan = plan;
        this.registry = registry;
        this.jobs = jobs;
        this.outputs = outputs;
        this.annotations = annotations;
        this.progress = progress;
        long b = plan.layout.blockFrames();
        double p = plan.layout.periodFs();
        long warmFrames = (long) Math.ceil(plan.warmupFs / p);
        // the margin: the warm-up plus a comparison zone at least as long, in whole blocks (so that
        // the segments cut their blocks where one pass does); the zone is the rest of the margin
        this.marginFrames = roundUp(2 * Math.max(1, warmFrames), b);
        long zoneFrames = marginFrames - warmFrames;
        this.zoneFs = (long) Math.floor(zoneFrames * p) - 1;
        long dflt = Math.max(8 * marginFrames, 64 * b);
        long l = segmentFrames > 0 ? roundUp(segmentFrames, b) : dflt;
        if (l < 2 * marginFrames) {
            throw new SegmentException("--segment-frames " + segmentFrames + " is shorter than twice the margin of " + marginFrames
                    + " frames each segment needs (warm-up " + Femtos.format(plan.warmupFs) + " plus a comparison zone, in whole blocks)");
        }
        this.segmentFrames = l;
    }

    private static long roundUp(long v, long m) {
        return (v + m - 1) / m * m;
    }

    /**
     * Frames per segment, a whole number of blocks.
     *
     * @return frames
     */
    public long segmentFrames() {
        return segmentFrames;
    }

    /**
     * Frames read before and after each segment.
     *
     * @return frames
     */
    public long marginFrames() {
        return marginFrames;
    }

    /**
     * Number of segments of the capture.
     *
     * @return at least 1
     */
    public int segments() {
        return (int) Math.max(1, (plan.layout.frames() + segmentFrames - 1) / segmentFrames);
    }

    /** Stops after the segment being stitched; safe from any thread. */
    public void cancel() {
        cancelled = true;
        Chain c = backChain;
        if (c != null) {
            c.cancel();
        }
        for (Chain f : fronts) {
            f.cancel();
        }
    }

    /**
     * Whether {@link #cancel()} was called.
     *
     * @return true once cancelled
     */
    public boolean isCancelled() {
        return cancelled;
    }

    /**
     * Runs every segment, stitches and finishes the back chain.
     *
     * @throws SegmentException where two segments disagree
     */
    public void run() {
        segmentCount = segments();
        ChainBuilder bb = ChainBuilder.fromSpec(plan.back, registry).outputs(outputs).annotations(annotations);
        for (SegmentPlan.Port p : plan.ports) {
            if (!p.backTargets().isEmpty()) {
                bb.input(p.inputId(), p.kind());
                for (String t : p.backTargets()) {
                    bb.wire(p.inputId(), t);
                }
            }
        }
        ExecutorService pool = Executors.newFixedThreadPool(jobs, r -> {
            Thread t = new Thread(r, "lanesift-segment");
            t.setDaemon(true);
            return t;
        });
        try (Chain back = bb.build()) {
            backChain = back;
            Deque<Future<Result>> inFlight = new ArrayDeque<>();
            int next = 0;
            Result prev = null;
            Map<String, Artifact> artifacts = new LinkedHashMap<>();
            while ((next < segmentCount || !inFlight.isEmpty()) && !cancelled) {
                while (next < segmentCount && inFlight.size() <= jobs) {
                    int k = next++;
                    inFlight.add(pool.submit(() -> decode(k)));
                }
                Result r = await(inFlight.poll());
                collectArtifacts(r, artifacts);
                if (prev != null) {
                    compare(prev, r);
                    deliver(prev, back);
                }
                prev = r;
            }
            if (prev != null && !cancelled) {
                deliver(prev, back);
            }
            if (!cancelled) {
                for (SegmentPlan.Port p : plan.ports) {
                    Artifact a = artifacts.get(p.key());
                    if (a != null) {
                        outputs.accept(p.node(), p.port(), a);
                    }
                }
            }
            back.finish();
        } finally {
            backChain = null;
            pool.shutdownNow();
        }
    }

    private static Result await(Future<Result> f) {
        try {
            return f.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new SegmentException("interrupted while waiting for a segment");
        } catch (ExecutionException e) {
            Throwable c = e.getCause();
            if (c instanceof RuntimeException re) {
                throw re;
            }
            if (c instanceof Error er) {
                throw er;
            }
            throw new SegmentException(String.valueOf(c));
        }
    }

    long frameOf(int k) {
        return Math.min(plan.layout.frames(), k * segmentFrames);
    }

    /** Whether a plugin declares {@link SegmentSupport#STAGE_THREAD_OPTION} (its stages may use a second thread). */
    private boolean declaresStageThread(String pluginId) {
        org.lanesift.plugin.PluginProvider p = registry.find(pluginId);
        return p != null && p.descriptor().option(SegmentSupport.STAGE_THREAD_OPTION) != null;
    }

    /** Start of segment k's kept range; -inf for the first. */
    private long keepFrom(int k) {
        return k == 0 ? Long.MIN_VALUE : plan.layout.timeOf(frameOf(k));
    }

    private long keepTo(int k) {
        return k + 1 >= segmentCount ? Long.MAX_VALUE : plan.layout.timeOf(frameOf(k + 1));
    }

    /** Runs the front chain over segment k and its margins. */
    private Result decode(int k) {
        long first = Math.max(0, frameOf(k) - marginFrames);
        long end = Math.min(plan.layout.frames(), frameOf(k + 1) + marginFrames);
        List<ChainSpec.Node> nodes = new ArrayList<>();
        for (ChainSpec.Node n : plan.front.nodes()) {
            if (n.id().equals(plan.sourceId)) {
                Map<String, Object> o = new LinkedHashMap<>(n.options());
                o.put("firstFrame", first);
                o.put("frameCount", Math.max(1, end - first));
                // the segments already use the cores: a read-ahead thread per segment cost CPU and
                // won no time (bench/scripts/segments.sh, DEVELOPERS.md "Read-ahead")
                o.put("readAhead", false);
                n = new ChainSpec.Node(n.id(), n.plugin(), o);
            } else if (declaresStageThread(n.plugin())) {
                // likewise a stage's own second thread (deskew's filter worker): the same route, an option
                Map<String, Object> o = new LinkedHashMap<>(n.options());
                o.put(SegmentSupport.STAGE_THREAD_OPTION, false);
                n = new ChainSpec.Node(n.id(), n.plugin(), o);
            }
            nodes.add(n);
        }
        Result r = new Result(k, chunks);
        ChainBuilder b = ChainBuilder.fromSpec(new ChainSpec(nodes, plan.front.wires()), registry)
                .outputs((id, port, block) -> r.keep(id + "." + port, block))
                .annotations((src, a) -> {
                    r.annSources.add(src);
                    r.anns.add(a);
                });
        if (cancelled) {
            return r;
        }
        try (Chain c = b.build()) {
            fronts.add(c);
            try {
                c.run();
            } finally {
                fronts.remove(c);
            }
        }
        return r;
    }

    private void collectArtifacts(Result r, Map<String, Artifact> merged) {
        for (SegmentPlan.Port p : plan.ports) {
            if (p.kind() != org.lanesift.data.DataKind.ARTIFACT) {
                continue;
            }
            for (Block blk : r.blocks(p.key())) {
                Artifact a = (Artifact) blk;
                Artifact m = merged.get(p.key());
                if (m == null) {
                    merged.put(p.key(), a);
                } else if (!m.fileName().equals(a.fileName()) || !Arrays.equals(m.content(), a.content())) {
                    throw new SegmentException("output '" + p.key() + "': artifact " + a.fileName() + " of segment " + r.index
                            + " differs from the one of segment 0, so it depends on where the capture was cut; decode without --jobs");
                } else {
                    merged.put(p.key(), new Artifact(m.channel(), Math.min(m.startFs(), a.startFs()), Math.max(m.endFs(), a.endFs()),
                            m.fileName(), m.mediaType(), m.content()));
                }
            }
        }
    }

    /** Checks that segments a and b (= a + 1) agree around their seam. */
    private void compare(Result a, Result b) {
        long seam = keepFrom(b.index);
        long z0 = seam - zoneFs;
        long z1 = seam + zoneFs;
        for (SegmentPlan.Port p : plan.ports) {
            if (p.kind() == org.lanesift.data.DataKind.ARTIFACT) {
                continue;
            }
            String da = Streams.describe(a.clipped(p.key(), z0, z1), z0, z1);
            String db = Streams.describe(b.clipped(p.key(), z0, z1), z0, z1);
            if (!da.equals(db)) {
                throw seamError(seam, "output '" + p.key() + "'", Streams.firstDifference(da, db));
            }
        }
        List<String> aa = annotationsIn(a, z0, z1);
        List<String> ab = annotationsIn(b, z0, z1);
        if (!aa.equals(ab)) {
            throw seamError(seam, "the annotations", Streams.firstDifference(String.join("\n", aa), String.join("\n", ab)));
        }
    }

    private SegmentException seamError(long seam, String what, String diff) {
        return new SegmentException("the segments meeting at " + Femtos.format(seam) + " disagree on " + what + " within "
                + Femtos.format(zoneFs) + " of the seam (" + diff + "): some instance keeps state longer than it declares;"
                + " decode without --jobs");
    }

    private static List<String> annotationsIn(Result r, long z0, long z1) {
        List<String> l = new ArrayList<>();
        for (int i = 0; i < r.anns.size(); i++) {
            Annotation a = r.anns.get(i);
            if (a.startFs() < z1 && Math.max(a.endFs(), a.startFs() + 1) > z0) {
                l.add(r.annSources.get(i) + " " + canonical(a));
            }
        }
        l.sort(null);
        return l;
    }

    static String canonical(Annotation a) {
        StringBuilder s = new StringBuilder();
        s.append(a.startFs()).append(' ').append(a.endFs()).append(' ').append(a.track()).append(' ').append(a.kind())
                .append(' ').append(a.severity()).append(' ').append(a.label());
        for (Map.Entry<String, Field> e : a.fields().entrySet()) {
            Object v = e.getValue().value();
            s.append(' ').append(e.getKey()).append('=').append(v instanceof byte[] bs ? Arrays.toString(bs) : String.valueOf(v))
                    .append(e.getValue().unit());
        }
        return s.toString();
    }

    /** Sends segment r's kept range on: its annotations, then its streams in time order. */
    private void deliver(Result r, Chain back) {
        long from = keepFrom(r.index);
        long to = keepTo(r.index);
        for (int i = 0; i < r.anns.size(); i++) {
            Annotation a = r.anns.get(i);
            if (a.startFs() >= from && a.startFs() < to) {
                annotations.accept(r.annSources.get(i), a);
            }
        }
        record Item(SegmentPlan.Port port, Block block) {
        }
        PriorityQueue<Item> q = new PriorityQueue<>(Comparator.comparingLong((Item i) -> i.block().startFs()));
        Map<String, Iterator<Block>> queues = new LinkedHashMap<>();
        for (SegmentPlan.Port p : plan.ports) {
            if (p.kind() == org.lanesift.data.DataKind.ARTIFACT) {
                continue;
            }
            Iterator<Block> kept = r.clippedOneByOne(p.key(), from, to);
            queues.put(p.key(), kept);
            if (kept.hasNext()) {
                q.add(new Item(p, kept.next()));
            }
        }
        while (!q.isEmpty() && !cancelled) {
            Item i = q.poll();
            SegmentPlan.Port p = i.port();
            if (p.backTargets().isEmpty()) {
                outputs.accept(p.node(), p.port(), i.block());
            } else {
                back.push(p.inputId(), i.block());
            }
            Iterator<Block> rest = queues.get(p.key());
            if (rest.hasNext()) {
                q.add(new Item(p, rest.next()));
            }
        }
        r.release();
        segmentsDone++;
        progress.progress(Math.min(plan.layout.frames(), (long) segmentsDone * segmentFrames), plan.layout.frames());
    }


    /** Slicing and comparing of the streams that cross a seam. */
    static final class Streams {
        private Streams() {
        }

        /** The part of a block in [from, to), or null when none of it is. */
        static Block clip(Block b, long from, long to) {
            if (b instanceof Edges e) {
                long a = Math.max(e.startFs(), from);
                long z = Math.min(e.endFs(), to);
                if (z < a || (z == a && e.endFs() > e.startFs())) {
                    return null;
                }
                return e.slice(from, to);
            }
            LogicBlock l = (LogicBlock) b;
            int n0 = l.length();
            if (n0 == 0 || (l.timeFs(0) >= from && l.timeFs(n0 - 1) < to)) {
                return n0 == 0 ? null : l;
            }
            int i0 = firstAtOrAfter(l, from);
            int i1 = firstAtOrAfter(l, to);
            if (i1 == i0) {
                return null;
            }
            if (i0 == 0 && i1 == l.length()) {
                return l;
            }
            int n = i1 - i0;
            return new LogicBlock(l.channel(), l.firstIndex() + i0, l.timeFs(i0), l.periodFs(), BitSets.slice(l.bits(), i0, n), n,
                    l.invalid() == null ? null : BitSets.slice(l.invalid(), i0, n));
        }

        /** Index of the first sample at or after time t (sample times increase), or the length. */
        private static int firstAtOrAfter(LogicBlock l, long t) {
            int lo = 0;
            int hi = l.length();
            while (lo < hi) {
                int mid = (lo + hi) >>> 1;
                if (l.timeFs(mid) < t) {
                    lo = mid + 1;
                } else {
                    hi = mid;
                }
            }
            return lo;
        }


        /** A canonical text of a stream within [z0, z1): level at z0, transitions, unknown spans, or logic samples. */
        static String describe(List<Block> blocks, long z0, long z1) {
            StringBuilder s = new StringBuilder();
            boolean first = true;
            long spanStart = Long.MIN_VALUE;
            long spanEnd = Long.MIN_VALUE;
            for (Block b : blocks) {
                Block c = clip(b, z0, z1);
                if (c == null) {
                    continue;
                }
                if (c instanceof Edges e) {
                    if (first) {
                        s.append("level ").append(e.initialLevel() ? 1 : 0).append(" at ").append(e.startFs());
                        first = false;
                    }
                    for (int i = 0; i < e.invalidCount(); i++) {
                        long a = e.invalidSpans()[2 * i];
                        long z = e.invalidSpans()[2 * i + 1];
                        if (a == spanEnd) {
                            spanEnd = z;        // a span cut by a block boundary
                        } else {
                            if (spanStart != Long.MIN_VALUE) {
                                s.append("\nunknown ").append(spanStart).append("..").append(spanEnd);
                            }
                            spanStart = a;
                            spanEnd = z;
                        }
                    }
                    for (int i = 0; i < e.count(); i++) {
                        s.append("\nedge ").append(e.timesFs()[i]);
                    }
                } else {
                    LogicBlock l = (LogicBlock) c;
                    for (int i = 0; i < l.length(); i++) {
                        boolean inv = l.invalid() != null && BitSets.get(l.invalid(), i);
                        s.append(inv ? 'x' : BitSets.get(l.bits(), i) ? '1' : '0');
                    }
                }
            }
            if (spanStart != Long.MIN_VALUE) {
                s.append("\nunknown ").append(spanStart).append("..").append(spanEnd);
            }
            return s.toString();
        }

        static String firstDifference(String a, String b) {
            String[] x = a.split("\n", -1);
            String[] y = b.split("\n", -1);
            for (int i = 0; i < Math.max(x.length, y.length); i++) {
                String u = i < x.length ? x[i] : "(nothing)";
                String v = i < y.length ? y[i] : "(nothing)";
                if (!u.equals(v)) {
                    return "earlier segment: " + abbreviate(u) + "; later segment: " + abbreviate(v);
                }
            }
            return "same text";
        }

        private static String abbreviate(String s) {
            return s.length() > 160 ? s.substring(0, 160) + "..." : s;
        }
    }
}
