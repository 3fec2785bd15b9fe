package org.lanesift.plugins.dualedge;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import org.lanesift.annotation.Annotation;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.Edges;
import org.lanesift.json.JsonValue;
import org.lanesift.testkit.JsonScan;
import org.lanesift.testkit.StageHarness;
import org.lanesift.testkit.Synth;

/** Runs the plugin in the testkit harness and joins each lane's bit-stream blocks into one record. */
final class Run {
    /** One lane's bits, all blocks joined. */
    static final class Lane {
        final List<Boolean> values = new ArrayList<>();
        final List<Long> times = new ArrayList<>();
        final List<Long> edge = new ArrayList<>();
        final List<Boolean> falling = new ArrayList<>();
        final List<Integer> slot = new ArrayList<>();
        final List<Long> setup = new ArrayList<>();
        final List<Long> hold = new ArrayList<>();
        final List<Boolean> flagged = new ArrayList<>();
        final List<Integer> blockSizes = new ArrayList<>();

        int size() {
            return values.size();
        }

        String fingerprint() {
            return values + "|" + times + "|" + edge + "|" + falling + "|" + slot + "|" + setup + "|" + hold + "|" + flagged;
        }
    }

    final List<Lane> lanes = new ArrayList<>();
    final List<Annotation> annotations;
    final String report;
    final List<List<BitStream>> blocks = new ArrayList<>();

    private Run(StageHarness h, int n) {
        for (int i = 0; i < n; i++) {
            List<BitStream> bs = h.outputs("bits" + i, BitStream.class);
            blocks.add(bs);
            Lane l = new Lane();
            for (BitStream b : bs) {
                l.blockSizes.add(b.count());
                for (int k = 0; k < b.count(); k++) {
                    l.values.add(b.bit(k));
                    l.times.add(b.timesFs()[k]);
                    l.edge.add(b.clockEdge()[k]);
                    l.falling.add(BitSets.get(b.falling(), k));
                    l.slot.add(b.slot() == null ? -1 : (int) b.slot()[k]);
                    l.setup.add(b.setupFs()[k]);
                    l.hold.add(b.holdFs()[k]);
                    l.flagged.add(b.isFlagged(k));
                }
            }
            lanes.add(l);
        }
        annotations = List.copyOf(h.annotations());
        List<Artifact> arts = h.outputs("report", Artifact.class);
        report = arts.isEmpty() ? null : new String(arts.get(0).content(), StandardCharsets.UTF_8);
    }

    /** Pushes each input whole. */
    static Run whole(Map<String, ?> options, Edges clock, Edges... lanes) {
        try (StageHarness h = StageHarness.of(new DualEdgePlugin(), options)) {
            h.push("clock", clock);
            for (int i = 0; i < lanes.length; i++) {
                h.push("lane" + i, lanes[i]);
            }
            h.finish();
            return new Run(h, lanes.length);
        }
    }

    /** Pushes pieces of all inputs, each input cut at its own times, in the given order of input indices. */
    static Run pieces(Map<String, ?> options, List<List<Edges>> perInput, int[] order) {
        try (StageHarness h = StageHarness.of(new DualEdgePlugin(), options)) {
            int[] next = new int[perInput.size()];
            for (int in : order) {
                Edges e = perInput.get(in).get(next[in]++);
                h.push(in == 0 ? "clock" : "lane" + (in - 1), e);
            }
            h.finish();
            return new Run(h, perInput.size() - 1);
        }
    }

    /**
     * Cuts an edge list at the given times (sorted, inside the span) with testkit's
     * {@code Synth.split}, then gives each piece the part of the unknown spans that falls inside it
     * ({@code Synth.split} drops unknown spans).
     */
    static List<Edges> cut(Edges e, long[] cuts) {
        List<Edges> parts = Synth.split(e, cuts);
        if (e.invalidCount() == 0) {
            return parts;
        }
        List<Edges> out = new ArrayList<>();
        for (Edges p : parts) {
            long[] sp = new long[2 * e.invalidCount()];
            int n = 0;
            for (int i = 0; i < e.invalidCount(); i++) {
                long a = Math.max(p.startFs(), e.invalidSpans()[2 * i]);
                long b = Math.min(p.endFs(), e.invalidSpans()[2 * i + 1]);
                if (b > a) {
                    sp[2 * n] = a;
                    sp[2 * n + 1] = b;
                    n++;
                }
            }
            out.add(new Edges(p.channel(), p.startFs(), p.endFs(), p.initialLevel(), p.timesFs(), p.count(), sp, n));
        }
        return out;
    }

    List<Annotation> of(String kind) {
        return annotations.stream().filter(a -> a.kind().equals(kind)).toList();
    }

    /**
     * A number from the report, read with the JSON reader: the first member {@code key} in
     * document order, after the first member named {@code anchor} when that is not null (true is
     * 1, false 0, null NaN).
     */
    double reportNumber(String anchor, String key) {
        return reportNumber(anchor, null, key);
    }

    /** As {@link #reportNumber(String, String)}, the anchor member also having the value {@code anchorValue} (JSON text). */
    double reportNumber(String anchor, String anchorValue, String key) {
        JsonValue root = JsonScan.parse("report", report);
        return anchor == null ? JsonScan.number(root, key) : JsonScan.number(JsonScan.after(root, anchor, anchorValue, key));
    }

    static Comparator<Annotation> byTime() {
        return Comparator.comparingLong(Annotation::startFs);
    }
}
