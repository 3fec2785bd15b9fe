package org.lanesift.plugins.dualedge;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.PriorityQueue;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.FindingRef;
import org.lanesift.plugin.StageContext;

/**
 * Holds annotations until no earlier one can still come, then publishes them in time order, so
 * the stage's annotations are in time order whatever the block sizes. At most {@link #CAP} of one
 * kind on one track are published; the rest are counted and summarised at the end.
 *
 * <p>The clock findings that break the clock ({@code clock-dropout}, {@code clock-glitch}) are also
 * kept as {@link FindingRef}s until the stage hands them on with its next bits, so the decoders
 * downstream state the breaks they see as consequences of these findings, and only of findings
 * that were made.
 */
final class AnnotationQueue {
    static final int CAP = 1000;

    private record Item(Annotation a, long seq) {
    }

    private final StageContext ctx;
    private final PriorityQueue<Item> queue = new PriorityQueue<>(Comparator
            .comparingLong((Item i) -> i.a.startFs())
            .thenComparing(i -> i.a.track())
            .thenComparing(i -> i.a.kind())
            .thenComparingLong(i -> i.seq));
    private final Map<String, long[]> counts = new LinkedHashMap<>();
    private long seq;
    private long lastFs = Long.MIN_VALUE;
    private final List<FindingRef> clockBreaks = new ArrayList<>();

    AnnotationQueue(StageContext ctx) {
        this.ctx = ctx;
    }

    void add(Annotation a) {
        if (a.severity() != Severity.INFO && a.track().equals(ClockRecovery.TRACK)
                && (a.kind().equals("clock-dropout") || a.kind().equals("clock-glitch"))) {
            clockBreaks.add(new FindingRef(ctx.instanceId(), a.kind(), a.startFs(), FindingRef.Effect.CLOCK_BREAK, a.startFs(),
                    a.endFs()));
        }
        String key = a.track() + "\u0000" + a.kind();
        long[] c = counts.computeIfAbsent(key, k -> new long[] {0, Long.MAX_VALUE, Long.MIN_VALUE});
        c[0]++;
        if (c[0] > CAP) {
            c[1] = Math.min(c[1], a.startFs());
            c[2] = Math.max(c[2], a.endFs());
            return;
        }
        queue.add(new Item(a, seq++));
    }

    /**
     * The clock-break findings made since the last call, for the next bits handed on.
     *
     * @return the references (empty when none), in the order made
     */
    List<FindingRef> takeClockBreaks() {
        if (clockBreaks.isEmpty()) {
            return List.of();
        }
        List<FindingRef> l = List.copyOf(clockBreaks);
        clockBreaks.clear();
        return l;
    }

    /**
     * Withdraws the held (not yet published) annotations of one kind on one track.
     *
     * @param track track
     * @param kind  kind
     */
    void withdraw(String track, String kind) {
        int before = queue.size();
        queue.removeIf(i -> i.a.track().equals(track) && i.a.kind().equals(kind));
        long[] c = counts.get(track + "\u0000" + kind);
        if (c != null) {
            c[0] -= before - queue.size();
        }
    }

    /**
     * Publishes every held annotation that starts before {@code safeFs}.
     *
     * @param safeFs no annotation starting before this time can still be added
     */
    void flush(long safeFs) {
        while (!queue.isEmpty() && queue.peek().a.startFs() < safeFs) {
            Annotation a = queue.poll().a;
            lastFs = Math.max(lastFs, a.startFs());
            ctx.annotate(a);
        }
    }

    /** Publishes everything, then one summary per capped kind and track. */
    void flushAll() {
        flush(Long.MAX_VALUE);
        List<Annotation> extra = new ArrayList<>();
        for (Map.Entry<String, long[]> e : counts.entrySet()) {
            long[] c = e.getValue();
            if (c[0] > CAP) {
                String[] tk = e.getKey().split("\u0000", 2);
                extra.add(Annotation.on(tk[0], "annotations-capped").span(c[1], Math.max(c[1], c[2]))
                        .label((c[0] - CAP) + " more " + tk[1] + " not shown").severity(Severity.INFO)
                        .field("kind", Field.text(tk[1])).field("count", Field.integer(c[0], "")).build());
            }
        }
        for (Annotation a : extra) {
            ctx.annotate(a);
        }
    }

    /**
     * How many annotations of a kind on a track were added (published or not).
     *
     * @param track track
     * @param kind  kind
     * @return count
     */
    long count(String track, String kind) {
        long[] c = counts.get(track + "\u0000" + kind);
        return c == null ? 0 : c[0];
    }
}
