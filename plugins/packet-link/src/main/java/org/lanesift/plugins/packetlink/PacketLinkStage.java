package org.lanesift.plugins.packetlink;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import org.lanesift.kit.FramePictures;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.Frame;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The running decoder: routes inputs to lanes, pairs the lanes' bursts, merges their words and
 * hands them to the DSI decoder or the framed-link export.
 */
final class PacketLinkStage implements Stage {
    private static final int OUT_PACKETS = 0;
    private static final int OUT_FRAMES = 1;
    private static final int OUT_FILES = 2;

    private final StageContext ctx;
    private final LinkConfig cfg;
    private final String id;
    private final Lane[] lanes;
    private final DsiDecoder dsi;
    private final FramedExport framed;
    private final FrameAssembler frames;
    private final CommandLog log;
    private long burstCount;
    private long pngWritten;
    private long firstFs = Long.MAX_VALUE;
    private long lastFs = Long.MIN_VALUE;
    private final List<ArrayDeque<long[]>> pendingGroups = new ArrayList<>();
    private final List<ArrayDeque<Object[]>> laneGroups = new ArrayList<>();
    /** Low-power data waiting for earlier high-speed bursts: {lane, bytes, start times, end times}. */
    private final ArrayDeque<Object[]> pendingLp = new ArrayDeque<>();
    private long groupIndex;
    private boolean syncAnnounced;
    private final SyncAlignment syncAlignment;

    PacketLinkStage(StageContext ctx, LinkConfig cfg) {
        this.ctx = ctx;
        this.cfg = cfg;
        this.id = ctx.instanceId();
        lanes = new Lane[cfg.lanes];
        syncAlignment = new SyncAlignment(cfg.lanes, ctx::annotate);
        log = new CommandLog(cfg.maxLogEntries);
        frames = new FrameAssembler(id, cfg.maxFramePixels, this::frame, ctx::annotate);
        if (cfg.dsi) {
            dsi = new DsiDecoder(id, log, frames, new LinkFacts(cfg.lanes), new PacketExport(cfg.maxLogEntries), w -> ctx.emit(OUT_PACKETS, w), ctx::annotate);
            framed = null;
        } else {
            dsi = null;
            framed = new FramedExport(id, cfg.wordBits, cfg.maxLogEntries, w -> ctx.emit(OUT_PACKETS, w), ctx::annotate);
        }
        for (int k = 0; k < cfg.lanes; k++) {
            final int lane = k;
            laneGroups.add(new ArrayDeque<>());
            pendingGroups.add(new ArrayDeque<>());
            LaneStateTracker tr = new LaneStateTracker(k, cfg.lpHighVolts, cfg.lpLowVolts, cfg.hsCmMinVolts, cfg.hsCmMaxVolts,
                    cfg.minStateFs, ctx::annotate, cfg.dsi ? this::lpdt : null);
            lanes[k] = new Lane(k, tr, l -> new LaneDeserializer(l, cfg.dsi ? 0xB8 : cfg.syncWire, cfg.dsi ? 8 : cfg.syncBits,
                    cfg.dsi ? 0 : cfg.syncErrors, !cfg.dsi && cfg.syncRestart, cfg.dsi ? 8 : cfg.wordBits, !cfg.dsi && cfg.msbFirst, cfg.dsi ? 0 : cfg.groupWords, cfg.maxBits(),
                    d -> laneGroup(lane, d)), new MarginRuns(k, ctx::annotate));
        }
    }

    @Override
    public void accept(int input, Block block) {
        firstFs = Math.min(firstFs, block.startFs());
        lastFs = Math.max(lastFs, block.endFs());
        int per = cfg.inputsPerLane();
        Lane lane = lanes[input / per];
        int role = per == 1 ? 2 : input % per;
        if (role == 2) {
            lane.acceptBits((BitStream) block);
        } else {
            lane.acceptLeg(role == 0, (AnalogBlock) block);
        }
        if (cfg.lpStates) {
            for (Lane l : lanes) {
                l.drainBits();
            }
            mergeBursts(false);
        } else if (cfg.gapBursts()) {
            lane.drainGapped(cfg.burstGapFs, cfg.idleBits);
            mergeBursts(false);
        } else {
            lane.drainContinuous();
            drainContinuous(false);
        }
    }

    // ------------------------------------------------------------------ bursts (line states)

    private void mergeBursts(boolean finishing) {
        while (true) {
            boolean all = true;
            boolean any = false;
            for (Lane l : lanes) {
                all &= !l.done.isEmpty();
                any |= !l.done.isEmpty();
            }
            if (!any || (!all && !finishing)) {
                if (cfg.dsi) {
                    releaseLp(finishing && !any ? Long.MAX_VALUE : unmergedBurstBoundFs());
                }
                return;
            }
            Lane.Burst first = null;
            for (Lane l : lanes) {
                Lane.Burst b = l.done.peek();
                if (b != null && (first == null || b.startFs < first.startFs)) {
                    first = b;
                }
            }
            Lane.Burst[] group = new Lane.Burst[lanes.length];
            List<String> missing = new ArrayList<>();
            for (int k = 0; k < lanes.length; k++) {
                Lane.Burst b = lanes[k].done.peek();
                if (b != null && b.startFs < first.endFs && b.endFs > first.startFs) {
                    group[k] = lanes[k].done.poll();
                } else {
                    missing.add("lane " + k);
                }
            }
            if (!missing.isEmpty()) {
                ctx.annotate(Annotation.on("packets", "lane-burst-missing").span(first.startFs, first.endFs).severity(Severity.ERROR)
                        .label("high-speed burst without a matching burst on " + String.join(", ", missing) + "; not decoded").build());
                continue;
            }
            if (cfg.dsi) {
                releaseLp(first.startFs);
            }
            burst(group);
        }
    }

    private void burst(Lane.Burst[] g) {
        burstCount++;
        int n = g.length;
        long start = Long.MAX_VALUE;
        long end = Long.MIN_VALUE;
        for (Lane.Burst b : g) {
            start = Math.min(start, b.startFs);
            end = Math.max(end, b.endFs);
        }
        int[] laneWords = new int[n];
        StringBuilder trails = new StringBuilder();
        for (int k = 0; k < n; k++) {
            LaneDeserializer d = g[k].words;
            if (d.overflow) {
                ctx.annotate(Annotation.on("lane" + k + ".bits", "burst-too-long").span(g[k].startFs, g[k].endFs).severity(Severity.ERROR)
                        .label("burst longer than maxBurstBytes (" + cfg.maxBurstBytes + "); the rest is not decoded")
                        .field("lane", Field.integer(k, "")).build());
            }
            if (!d.synced) {
                ctx.annotate(Annotation.on("lane" + k + ".bits", "hs-sync-missing").span(g[k].startFs, g[k].endFs).severity(Severity.ERROR)
                        .label(cfg.dsi ? "no sync byte B8 in the high-speed burst" : "no sync pattern in the burst")
                        .field("lane", Field.integer(k, "")).field("bitsSeen", Field.integer(d.seekBits, "")).build());
                return;
            }
            // a burst cut at maxBurstBytes has no trail in the buffer: keep every whole word
            boolean trail = cfg.dropTrail && !d.overflow;
            int data = trail ? d.dataBits() : d.nbits;
            int w = d.wordBits;
            if (trail && data % w != 0) {
                ctx.annotate(Annotation.on("lane" + k + ".bits", "hs-trail-unaligned").span(g[k].startFs, g[k].endFs).severity(Severity.WARNING)
                        .label("trail does not start on a word boundary (" + (data % w) + " bits into a word)")
                        .field("lane", Field.integer(k, "")).build());
            }
            laneWords[k] = trail ? Math.min((data + w - 1) / w, d.completeWords() + (d.nbits % w == 0 ? 0 : 1)) : d.completeWords();
            if (trails.length() > 0) {
                trails.append(", ");
            }
            trails.append(d.nbits - Math.min(d.nbits, laneWords[k] * w));
        }
        LaneDeserializer[] synced = new LaneDeserializer[n];
        for (int k = 0; k < n; k++) {
            synced[k] = g[k].words;
        }
        syncAlignment.check(synced);
        int merged;
        int total = 0;
        for (int k = 0; k < n; k++) {
            total += laneWords[k];
        }
        if (cfg.independent) {
            merged = total;
        } else {
            merged = Integer.MAX_VALUE;
            for (int k = 0; k < n; k++) {
                merged = Math.min(merged, laneWords[k] * n + k);
            }
            if (total > merged) {
                ctx.annotate(Annotation.on("packets", "lane-bytes-uneven").span(start, end).severity(Severity.WARNING)
                        .label((total - merged) + " words after the point where a lane ran out are not used").build());
            }
        }
        ctx.annotate(Annotation.on("packets", "hs-burst").span(start, end)
                .label("burst " + (burstCount - 1) + ": " + merged + (cfg.dsi ? " bytes" : " words"))
                .field("index", Field.integer(burstCount - 1, "")).field("words", Field.integer(merged, ""))
                .field("lanes", Field.integer(n, "")).text("trailBitsPerLane", trails.toString()).build());
        long[] v = new long[merged];
        long[] s = new long[merged];
        long[] e = new long[merged];
        int[] ln = new int[merged];
        byte[] f = new byte[merged];
        if (cfg.independent) {
            int o = 0;
            for (int k = 0; k < n; k++) {
                o = copyLane(g[k].words, laneWords[k], k, v, s, e, ln, f, o);
            }
        } else {
            for (int i = 0; i < merged; i++) {
                int k = i % n;
                int q = i / n;
                LaneDeserializer d = g[k].words;
                v[i] = d.word(q);
                s[i] = d.wordStart(q);
                e[i] = d.wordEnd(q);
                ln[i] = k;
                f[i] = d.wordFlagged(q) ? WordStream.FLAG_SUSPECT : 0;
            }
        }
        if (merged > 0) {
            f[0] |= WordStream.FLAG_GAP_BEFORE;
        }
        if (cfg.dsi) {
            byte[] b = new byte[merged];
            for (int i = 0; i < merged; i++) {
                b[i] = (byte) v[i];
            }
            dsi.burst(b, s, e, ln, f, merged, false);
        } else {
            framed.unit("burst", burstCount - 1, v, s, e, ln, f, merged);
            framed.words(v, s, e, ln, f, merged, -1);
        }
    }

    private static int copyLane(LaneDeserializer d, int count, int k, long[] v, long[] s, long[] e, int[] ln, byte[] f, int o) {
        for (int q = 0; q < count; q++, o++) {
            v[o] = d.word(q);
            s[o] = d.wordStart(q);
            e[o] = d.wordEnd(q);
            ln[o] = k;
            f[o] = d.wordFlagged(q) ? WordStream.FLAG_SUSPECT : 0;
        }
        return o;
    }

    /**
     * Low-power data from one lane. A lane can settle it before a high-speed burst that started
     * earlier has ended on every lane, so it waits in time order with the bursts: packets, the
     * command log and the packets output then follow the capture's time order.
     */
    private void lpdt(int lane, byte[] data, long[] s, long[] e, int n) {
        if (n == 0) {
            return;
        }
        pendingLp.add(new Object[] {lane, java.util.Arrays.copyOf(data, n), java.util.Arrays.copyOf(s, n), java.util.Arrays.copyOf(e, n)});
    }

    /** Decodes waiting low-power data that starts before {@code beforeFs}. */
    private void releaseLp(long beforeFs) {
        Object[] p;
        while ((p = pendingLp.peek()) != null && ((long[]) p[2])[0] < beforeFs) {
            pendingLp.poll();
            byte[] data = (byte[]) p[1];
            int n = data.length;
            int[] ln = new int[n];
            java.util.Arrays.fill(ln, (Integer) p[0]);
            byte[] f = new byte[n];
            f[0] = WordStream.FLAG_GAP_BEFORE;
            dsi.burst(data, (long[]) p[2], (long[]) p[3], ln, f, n, true);
        }
    }

    /** The earliest time a burst not yet merged could start: waiting low-power data before it is safe to decode. */
    private long unmergedBurstBoundFs() {
        long bound = Long.MAX_VALUE;
        for (Lane l : lanes) {
            Lane.Burst b = l.done.peek();
            if (b != null) {
                bound = Math.min(bound, b.startFs);
            }
            LaneStateTracker.Interval iv = l.tracker.intervals.peek();
            if (iv != null) {
                bound = Math.min(bound, iv.startFs);
            }
            bound = Math.min(bound, l.tracker.knownUntilFs());
        }
        return bound;
    }

    // ------------------------------------------------------------------ framed, continuous or grouped

    /** A lane finished a fixed-length group of words. */
    private void laneGroup(int lane, LaneDeserializer d) {
        int n = d.completeWords();
        long[] v = new long[n];
        long[] s = new long[n];
        long[] e = new long[n];
        byte[] f = new byte[n];
        for (int q = 0; q < n; q++) {
            v[q] = d.word(q);
            s[q] = d.wordStart(q);
            e[q] = d.wordEnd(q);
            f[q] = d.wordFlagged(q) ? WordStream.FLAG_SUSPECT : 0;
        }
        if (n > 0) {
            f[0] |= DsiDecoder.FLAG_PACKET_START;
        }
        laneGroups.get(lane).add(new Object[] {v, s, e, f});
        emitGroups();
    }

    private void emitGroups() {
        if (cfg.independent) {
            for (int k = 0; k < lanes.length; k++) {
                Object[] g;
                while ((g = laneGroups.get(k).poll()) != null) {
                    long[] v = (long[]) g[0];
                    int[] ln = new int[v.length];
                    java.util.Arrays.fill(ln, k);
                    framed.words(v, (long[]) g[1], (long[]) g[2], ln, (byte[]) g[3], v.length, groupIndex++);
                }
            }
            return;
        }
        while (true) {
            for (ArrayDeque<Object[]> q : laneGroups) {
                if (q.isEmpty()) {
                    return;
                }
            }
            int n = lanes.length;
            int g = cfg.groupWords;
            long[] v = new long[n * g];
            long[] s = new long[n * g];
            long[] e = new long[n * g];
            int[] ln = new int[n * g];
            byte[] f = new byte[n * g];
            Object[][] parts = new Object[n][];
            for (int k = 0; k < n; k++) {
                parts[k] = laneGroups.get(k).poll();
            }
            for (int i = 0; i < n * g; i++) {
                int k = i % n;
                int q = i / n;
                v[i] = ((long[]) parts[k][0])[q];
                s[i] = ((long[]) parts[k][1])[q];
                e[i] = ((long[]) parts[k][2])[q];
                f[i] = (byte) (((byte[]) parts[k][3])[q] & ~DsiDecoder.FLAG_PACKET_START);
                ln[i] = k;
            }
            f[0] |= DsiDecoder.FLAG_PACKET_START;
            framed.words(v, s, e, ln, f, n * g, groupIndex++);
        }
    }

    private void drainContinuous(boolean finishing) {
        if (!syncAnnounced) {
            boolean all = true;
            long t = Long.MIN_VALUE;
            for (Lane l : lanes) {
                all &= l.continuous().synced;
                t = Math.max(t, l.continuous().syncFoundFs);
            }
            if (all && cfg.syncBits > 0) {
                syncAnnounced = true;
                ctx.annotate(Annotation.on("words", "framed-sync").span(t, t).label("sync pattern found on every lane").build());
                LaneDeserializer[] synced = new LaneDeserializer[lanes.length];
                for (int k = 0; k < lanes.length; k++) {
                    synced[k] = lanes[k].continuous();
                }
                syncAlignment.check(synced);
            }
        }
        if (cfg.groupWords > 0) {
            return;
        }
        int n = lanes.length;
        int[] avail = new int[n];
        int merged;
        if (cfg.independent) {
            for (int k = 0; k < n; k++) {
                LaneDeserializer d = lanes[k].continuous();
                int c = d.completeWords();
                if (c == 0) {
                    continue;
                }
                long[] v = new long[c];
                long[] s = new long[c];
                long[] e = new long[c];
                int[] ln = new int[c];
                byte[] f = new byte[c];
                copyLane(d, c, k, v, s, e, ln, f, 0);
                framed.words(v, s, e, ln, f, c, -1);
                d.dropWords(c);
            }
            return;
        }
        merged = Integer.MAX_VALUE;
        for (int k = 0; k < n; k++) {
            avail[k] = lanes[k].continuous().completeWords();
            merged = Math.min(merged, avail[k] * n + k);
        }
        // keep the last word of each lane until the next one starts, so that its end time is known
        if (!finishing) {
            merged = Math.max(0, merged - n);
        }
        if (merged <= 0) {
            return;
        }
        long[] v = new long[merged];
        long[] s = new long[merged];
        long[] e = new long[merged];
        int[] ln = new int[merged];
        byte[] f = new byte[merged];
        for (int i = 0; i < merged; i++) {
            int k = i % n;
            int q = i / n;
            LaneDeserializer d = lanes[k].continuous();
            v[i] = d.word(q);
            s[i] = d.wordStart(q);
            e[i] = d.wordEnd(q);
            ln[i] = k;
            f[i] = d.wordFlagged(q) ? WordStream.FLAG_SUSPECT : 0;
        }
        framed.words(v, s, e, ln, f, merged, -1);
        for (int k = 0; k < n; k++) {
            lanes[k].continuous().dropWords((merged - k + n - 1) / n);
        }
    }

    // ------------------------------------------------------------------ frames and files

    private void frame(Frame f) {
        ctx.emit(OUT_FRAMES, f);
        if (pngWritten < cfg.pngFrames && f.width() > 0 && f.height() > 0) {
            pngWritten++;
            ctx.emit(OUT_FILES, FramePictures.artifact(id, f));
        }
    }

    @Override
    public void finish() {
        if (cfg.lpStates) {
            for (Lane l : lanes) {
                l.finish();
            }
            mergeBursts(true);
        } else if (cfg.gapBursts()) {
            for (Lane l : lanes) {
                l.finishGapped();
            }
            mergeBursts(true);
        } else {
            for (Lane l : lanes) {
                l.drainContinuous();
            }
            drainContinuous(true);
            for (Lane l : lanes) {
                LaneDeserializer d = l.continuous();
                long rest = !d.synced ? d.unsyncedBits : cfg.groupWords > 0 ? d.nbits : d.nbits % d.wordBits;
                if (rest > 0) {
                    ctx.annotate(Annotation.on("words", "trailing-bits").span(d.lastBitFs, d.lastBitFs)
                            .label(rest + " bits after the last whole " + (cfg.groupWords > 0 ? "group" : "word")
                                    + (d.synced || cfg.syncBits == 0 ? "" : " (no sync pattern in them)") + " ignored")
                            .field("lane", Field.integer(l.index, "")).field("bits", Field.integer(rest, "")).build());
                }
            }
        }
        frames.finish();
        long s = firstFs == Long.MAX_VALUE ? 0 : firstFs;
        long e = Math.max(s, lastFs);
        if (cfg.dsi) {
            if (log.overflow) {
                ctx.annotate(Annotation.on("commands", "command-log-full").span(s, e).severity(Severity.WARNING)
                        .label("command log limit " + cfg.maxLogEntries + " reached; later commands not exported").build());
            }
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-commands.json", "application/json", log.json(id)));
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-commands.csv", "text/csv", log.csv()));
            if (dsi.export.dropped > 0) {
                ctx.annotate(Annotation.on("packets", "packet-export-full").span(s, e).severity(Severity.WARNING)
                        .label("packet export limit reached (maxLogEntries " + cfg.maxLogEntries + " rows or "
                                + (PacketExport.MAX_DATA_BYTES >> 20) + " MiB of data); " + dsi.export.dropped
                                + " later packets only on the packets output").build());
            }
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-packets.jsonl", "application/jsonl", dsi.export.jsonl()));
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-packets.csv", "text/csv", dsi.export.csv()));
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-init.h", "text/x-c", new InitHeader(id, log, dsi.facts).bytes()));
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-timing.json", "application/json", frames.timingJson(id)));
            ctx.annotate(Annotation.on("packets", "summary").span(s, e)
                    .label(dsi.packetCount + " packets, " + log.entries.size() + " commands, " + frames.timings.size() + " frames")
                    .field("packets", Field.integer(dsi.packetCount, "")).field("eccCorrected", Field.integer(dsi.eccCorrected, ""))
                    .field("eccUncorrectable", Field.integer(dsi.eccUncorrectable, ""))
                    .field("checksumBad", Field.integer(dsi.checksumBad, "")).build());
        } else {
            if (framed.truncated) {
                ctx.annotate(Annotation.on("words", "word-export-full").span(s, e).severity(Severity.WARNING)
                        .label("word export limit " + cfg.maxLogEntries + " reached; later words only on the packets output").build());
            }
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-words.csv", "text/csv", framed.csv()));
            ctx.emit(OUT_FILES, new Artifact(id, s, e, id + "-bursts.jsonl", "application/jsonl", framed.unitsJsonl()));
        }
    }
}
