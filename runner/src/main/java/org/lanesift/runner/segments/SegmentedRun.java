package org.lanesift.runner.segments;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
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
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.plugin.PluginRegistry;
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
 * first difference. The back chain receives the kept streams and annotations in the order the
 * front emitted them, as one pass would have delivered them, only cut at the seams (which no
 * stage may depend on). Front artifacts must be identical in every segment and are written once.
 *
 * <p>The segment being stitched (the head) is handed on while its worker decodes it
 * ({@link SegmentFeed}): only the events around its first seam wait, until that seam is checked.
 * At most {@code jobs} segments run ahead of the head, each keeping its output until the head
 * reaches it, so memory stays bounded and most blocks die young (cheap to collect).
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
    private final Set<Chain> fronts = ConcurrentHashMap.newKeySet();
    private final Set<SegmentFeed> feeds = ConcurrentHashMap.newKeySet();
    private int segmentsDone;
    private int segmentCount;

    /** Unread events at which the worker of the segment being stitched waits for the stitching thread. */
    private static final int FEED_LIMIT = 256;

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
        for (SegmentFeed f : feeds) {
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
        SegmentFeed[] bySegment = new SegmentFeed[segmentCount];
        try (Chain back = bb.build()) {
            backChain = back;
            Map<String, Artifact> artifacts = new LinkedHashMap<>();
            Seam seam = null;
            int next = 0;
            for (int k = 0; k < segmentCount && !cancelled; k++) {
                // the head and at most jobs segments ahead of it: bounded memory
                while (next < segmentCount && next <= k + jobs) {
                    int s = next++;
                    SegmentFeed f = new SegmentFeed(FEED_LIMIT);
                    bySegment[s] = f;
                    feeds.add(f);
                    pool.submit(() -> decode(s, f));
                }
                seam = stitch(k, bySegment[k], seam, back, artifacts);
                feeds.remove(bySegment[k]);
                bySegment[k] = null;
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
            for (SegmentFeed f : feeds) {
                f.cancel();
            }
            pool.shutdownNow();
        }
    }

    long frameOf(int k) {
        return Math.min(plan.layout.frames(), k * segmentFrames);
    }

    /** Start of segment k's kept range; -inf for the first. */
    private long keepFrom(int k) {
        return k == 0 ? Long.MIN_VALUE : plan.layout.timeOf(frameOf(k));
    }

    private long keepTo(int k) {
        return k + 1 >= segmentCount ? Long.MAX_VALUE : plan.layout.timeOf(frameOf(k + 1));
    }

    /** Runs the front chain over segment k and its margins, handing what it emits to the feed. */
    private void decode(int k, SegmentFeed feed) {
        Throwable failure = null;
        try {
            long first = Math.max(0, frameOf(k) - marginFrames);
            long end = Math.min(plan.layout.frames(), frameOf(k + 1) + marginFrames);
            List<ChainSpec.Node> nodes = new ArrayList<>();
            for (ChainSpec.Node n : plan.front.nodes()) {
                if (n.id().equals(plan.sourceId)) {
                    Map<String, Object> o = new LinkedHashMap<>(n.options());
                    o.put("firstFrame", first);
                    o.put("frameCount", Math.max(1, end - first));
                    n = new ChainSpec.Node(n.id(), n.plugin(), o);
                }
                nodes.add(n);
            }
            Map<String, Integer> portIndex = new HashMap<>();
            for (int i = 0; i < plan.ports.size(); i++) {
                portIndex.put(plan.ports.get(i).key(), i);
            }
            ChainBuilder b = ChainBuilder.fromSpec(new ChainSpec(nodes, plan.front.wires()), registry)
                    .outputs((id, port, block) -> feed.add(new SegmentFeed.Out(portIndex.get(id + "." + port), block)))
                    .annotations((src, a) -> feed.add(new SegmentFeed.Note(src, a)));
            if (!cancelled) {
                try (Chain c = b.build()) {
                    fronts.add(c);
                    try {
                        c.run();
                    } finally {
                        fronts.remove(c);
                    }
                }
            }
        } catch (RuntimeException | Error e) {
            failure = e;
        } finally {
            feed.finish(failure);
        }
    }

    /**
     * The check of one seam, between the segment before it (complete: its blocks and annotations
     * around the seam) and the segment after it, whose events are checked while they arrive.
     */
    private final class Seam {
        final long seamFs;
        final long z0;
        final long z1;
        final List<List<Block>> earlier = new ArrayList<>();
        final List<String> earlierNotes = new ArrayList<>();
        final List<List<Block>> later = new ArrayList<>();
        final List<String> laterNotes = new ArrayList<>();
        /** Earlier annotations in the zone that the later segment has not matched yet, once checked. */
        Map<String, Integer> unmatched;

        Seam(long seamFs) {
            this.seamFs = seamFs;
            this.z0 = seamFs - zoneFs;
            this.z1 = seamFs + zoneFs;
            for (int i = 0; i < plan.ports.size(); i++) {
                earlier.add(new ArrayList<>());
                later.add(new ArrayList<>());
            }
        }

        boolean overlaps(Block b) {
            return b.startFs() < z1 && Math.max(b.endFs(), b.startFs() + 1) > z0;
        }

        boolean overlaps(Annotation a) {
            return a.startFs() < z1 && Math.max(a.endFs(), a.startFs() + 1) > z0;
        }

        /** Compares the streams and the annotations seen so far; later annotations are matched one by one. */
        void check() {
            for (int i = 0; i < plan.ports.size(); i++) {
                SegmentPlan.Port p = plan.ports.get(i);
                if (p.kind() == DataKind.ARTIFACT) {
                    continue;
                }
                String da = Streams.describe(earlier.get(i), z0, z1);
                String db = Streams.describe(later.get(i), z0, z1);
                if (!da.equals(db)) {
                    throw seamError(seamFs, "output '" + p.key() + "'", Streams.firstDifference(da, db));
                }
                earlier.get(i).clear();
                later.get(i).clear();
            }
            unmatched = new HashMap<>();
            for (String n : earlierNotes) {
                unmatched.merge(n, 1, Integer::sum);
            }
            for (String n : laterNotes) {
                match(n);
            }
        }

        /** A later annotation in the zone: the earlier segment must have had it too. */
        void match(String note) {
            Integer c = unmatched.get(note);
            if (c == null) {
                List<String> a = new ArrayList<>(earlierNotes);
                a.sort(null);
                throw seamError(seamFs, "the annotations", Streams.firstDifference(String.join("\n", a), note));
            }
            if (c == 1) {
                unmatched.remove(note);
            } else {
                unmatched.put(note, c - 1);
            }
        }

        /** At the end of the later segment: every earlier annotation in the zone was matched. */
        void close() {
            if (!unmatched.isEmpty()) {
                List<String> a = new ArrayList<>(unmatched.keySet());
                a.sort(null);
                throw seamError(seamFs, "the annotations", "earlier segment: " + Streams.abbreviate(a.get(0))
                        + "; later segment: (nothing)");
            }
        }
    }

    /**
     * Takes segment k's events as they come: checks its starting seam against the segment before
     * (holding only the events of the zone until then), sends its kept range on, and collects
     * what the next seam's check needs.
     *
     * @return the next seam, its earlier side filled in, or null after the last segment
     */
    private Seam stitch(int k, SegmentFeed feed, Seam seam, Chain back, Map<String, Artifact> artifacts) {
        long from = keepFrom(k);
        long to = keepTo(k);
        Seam ahead = k + 1 < segmentCount ? new Seam(to) : null;
        boolean checked = seam == null;
        List<Object> pending = new ArrayList<>();
        boolean[] past = new boolean[plan.ports.size()];
        int streams = 0;
        for (SegmentPlan.Port p : plan.ports) {
            streams += p.kind() == DataKind.ARTIFACT ? 0 : 1;
        }
        int pastCount = 0;
        feed.attach();
        Object e;
        while ((e = feed.next()) != null && !cancelled) {
            if (e instanceof SegmentFeed.Out o) {
                SegmentPlan.Port p = plan.ports.get(o.port());
                Block blk = o.block();
                if (p.kind() == DataKind.ARTIFACT) {
                    mergeArtifact(k, p, (Artifact) blk, artifacts);
                    continue;
                }
                if (ahead != null && ahead.overlaps(blk)) {
                    ahead.earlier.get(o.port()).add(blk);
                }
                Block kept = Streams.clip(blk, from, to);
                if (checked) {
                    if (kept != null) {
                        send(p, kept, back);
                    }
                    continue;
                }
                if (seam.overlaps(blk)) {
                    seam.later.get(o.port()).add(blk);
                }
                if (kept != null) {
                    pending.add(new SegmentFeed.Out(o.port(), kept));
                }
                if (!past[o.port()] && blk.startFs() >= seam.z1) {
                    past[o.port()] = true;
                    pastCount++;
                }
                if (pastCount == streams) {
                    seam.check();
                    checked = true;
                    flush(pending, back);
                }
            } else {
                SegmentFeed.Note n = (SegmentFeed.Note) e;
                Annotation a = n.annotation();
                if (ahead != null && ahead.overlaps(a)) {
                    ahead.earlierNotes.add(n.source() + " " + canonical(a));
                }
                if (seam != null && seam.overlaps(a)) {
                    if (checked) {
                        seam.match(n.source() + " " + canonical(a));
                    } else {
                        seam.laterNotes.add(n.source() + " " + canonical(a));
                    }
                }
                if (a.startFs() >= from && a.startFs() < to) {
                    if (checked) {
                        annotations.accept(n.source(), a);
                    } else {
                        pending.add(n);
                    }
                }
            }
        }
        if (cancelled) {
            return null;
        }
        if (!checked) {
            seam.check();
            flush(pending, back);
        }
        if (seam != null) {
            seam.close();
        }
        segmentsDone++;
        progress.progress(Math.min(plan.layout.frames(), (long) segmentsDone * segmentFrames), plan.layout.frames());
        return ahead;
    }

    private void flush(List<Object> pending, Chain back) {
        for (Object e : pending) {
            if (e instanceof SegmentFeed.Out o) {
                send(plan.ports.get(o.port()), o.block(), back);
            } else {
                SegmentFeed.Note n = (SegmentFeed.Note) e;
                annotations.accept(n.source(), n.annotation());
            }
        }
        pending.clear();
    }

    private void send(SegmentPlan.Port p, Block b, Chain back) {
        if (p.backTargets().isEmpty()) {
            outputs.accept(p.node(), p.port(), b);
        } else {
            back.push(p.inputId(), b);
        }
    }

    private void mergeArtifact(int k, SegmentPlan.Port p, Artifact a, Map<String, Artifact> merged) {
        Artifact m = merged.get(p.key());
        if (m == null) {
            merged.put(p.key(), a);
        } else if (!m.fileName().equals(a.fileName()) || !Arrays.equals(m.content(), a.content())) {
            throw new SegmentException("output '" + p.key() + "': artifact " + a.fileName() + " of segment " + k
                    + " differs from the one of segment 0, so it depends on where the capture was cut; decode without --jobs");
        } else {
            merged.put(p.key(), new Artifact(m.channel(), Math.min(m.startFs(), a.startFs()), Math.max(m.endFs(), a.endFs()),
                    m.fileName(), m.mediaType(), m.content()));
        }
    }

    private SegmentException seamError(long seam, String what, String diff) {
        return new SegmentException("the segments meeting at " + Femtos.format(seam) + " disagree on " + what + " within "
                + Femtos.format(zoneFs) + " of the seam (" + diff + "): some instance keeps state longer than it declares;"
                + " decode without --jobs");
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

        static String abbreviate(String s) {
            return s.length() > 160 ? s.substring(0, 160) + "..." : s;
        }
    }
}
