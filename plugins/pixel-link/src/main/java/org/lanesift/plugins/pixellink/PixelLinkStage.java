package org.lanesift.plugins.pixellink;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.data.Frame;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The running decoder: buffers each lane's pixels, merges the lanes by clock period index once all
 * have delivered, looks the slot words up in the mapping tables, checks clock continuity and feeds
 * the {@link FrameAssembler}.
 */
final class PixelLinkStage implements Stage {
    /** Pixel clocks one lane may run ahead of another before the stage gives up. */
    static final int MAX_LAG = 1 << 22;
    private static final int BATCH = 4096;

    private final StageContext ctx;
    private final LaneBuffer[] lanes;
    private final int perLink;
    private final boolean dual;
    private final int[][] tables;
    private final FrameAssembler asm;
    private final Timing timing;
    private final SlotMapping mapping;
    private final boolean reverse;
    private final int[] px;
    private final long[] tt;
    private int fill;
    private long prevEdge = Long.MIN_VALUE;
    private long prevT;
    private long refDt;
    private double sumDt;
    private long nDt;
    private long clocks;
    /** The sampler's findings named in the bit streams, for the consequences seen here. */
    private final UpstreamFindings upstream = new UpstreamFindings();

    PixelLinkStage(StageContext ctx, SlotMapping mapping, boolean reverse, boolean dual, List<String> laneNames,
                   FrameAssembler.Detail detail, Pictures.Mode picMode, long[] picRange, int maxWidth, int maxHeight,
                   int hsForced, int vsForced, double clockTolPercent) {
        this.ctx = ctx;
        this.dual = dual;
        this.perLink = mapping.laneCount();
        this.lanes = new LaneBuffer[laneNames.size()];
        for (int i = 0; i < lanes.length; i++) {
            lanes[i] = new LaneBuffer(laneNames.get(i), i == 0);
        }
        this.tables = mapping.lookupTables(reverse);
        this.mapping = mapping;
        this.reverse = reverse;
        this.timing = new Timing();
        timing.mapping = mapping.name();
        timing.dual = dual;
        timing.reverseSlots = reverse;
        timing.pixelsPerClock = dual ? 2 : 1;
        timing.clockTolerancePercent = clockTolPercent;
        String id = ctx.instanceId();
        Pictures pics = picMode == Pictures.Mode.NONE ? null
                : new Pictures(id, picMode, picRange[0], picRange[1], a -> ctx.emit(1, a));
        FrameAssembler.Out out = new FrameAssembler.Out() {
            @Override
            public void frame(Frame f) {
                ctx.emit(0, f);
            }

            @Override
            public void annotate(Annotation a) {
                ctx.annotate(a);
            }
        };
        this.asm = new FrameAssembler(id, out, timing, pics, maxWidth, maxHeight, detail, hsForced, vsForced, clockTolPercent,
                mapping.controlLanes(laneNames),
                dual ? null : java.util.Arrays.copyOf(tables, Math.min(tables.length, lanes.length)), i -> lanes[i].label(), upstream);
        this.px = new int[BATCH * 2];
        this.tt = new long[BATCH * 2];
    }

    @Override
    public void accept(int input, Block block) {
        BitStream b = (BitStream) block;
        LaneBuffer lb = lanes[input];
        upstream.add(b.causes());
        lb.add(b);
        if (lb.size() > MAX_LAG) {
            List<String> empty = new ArrayList<>();
            for (LaneBuffer l : lanes) {
                if (l.size() == 0) {
                    empty.add("'" + l.name + "' (" + l.bitsSeen + " bits so far)");
                }
            }
            throw new org.lanesift.plugin.InputFormatException("lane '" + lb.name + "' holds " + lb.size() + " pixel clocks waiting for lane"
                    + (empty.size() > 1 ? "s " : " ") + String.join(", ", empty)
                    + "; every lane must be wired and sampled against the same pixel clock");
        }
        drain(false);
    }

    private void drain(boolean finishing) {
        while (true) {
            int m = Integer.MAX_VALUE;
            boolean anyData = false;
            for (LaneBuffer l : lanes) {
                m = Math.min(m, l.size());
                anyData |= l.size() > 0;
            }
            if (!anyData) {
                break;
            }
            if (m == 0) {
                if (!finishing) {
                    break;
                }
                slowOne();
                continue;
            }
            if (fastRun(m) == 0) {
                slowOne();
            }
        }
        flush();
    }

    private void flush() {
        if (fill > 0) {
            asm.process(px, tt, fill);
            upstream.dropBefore(tt[fill - 1]);
            fill = 0;
        }
    }

    private int fastRun(int m) {
        int nl = lanes.length;
        if (!dual && nl <= 4) {
            return fastRunSingle(m, nl);
        }
        LaneBuffer l0 = lanes[0];
        long[] e0 = l0.edge;
        long[] t0 = l0.timeFs;
        int h0 = l0.head;
        int q = 0;
        outer:
        for (; q < m; q++) {
            long e = e0[h0 + q];
            for (int j = 1; j < nl; j++) {
                LaneBuffer lj = lanes[j];
                if (lj.edge[lj.head + q] != e) {
                    break outer;
                }
            }
            long t = t0[h0 + q];
            int gap = clockCheck(e, t);
            if (fill >= BATCH * 2 - 2) {
                flush();
            }
            decodeDual(q, gap, t, null);
        }
        consume(q);
        return q;
    }

    private void consume(int q) {
        if (q > 0) {
            for (LaneBuffer l : lanes) {
                l.consumeTo(l.head + q);
            }
        }
    }

    /** Single link of up to 4 lanes; missing lanes read a constant empty lane. */
    private int fastRunSingle(int m, int nl) {
        LaneBuffer l0 = lanes[0];
        long[] e0 = l0.edge;
        long[] t0 = l0.timeFs;
        int[] w0 = l0.word;
        int h0 = l0.head;
        int[] tb0 = tables[0];
        int[] tb1 = tables[1 % nl];
        int[] tb2 = tables[2 % nl];
        int[] tb3 = tables[3 % nl];
        LaneBuffer l1 = lanes[1 % nl];
        LaneBuffer l2 = lanes[2 % nl];
        LaneBuffer l3 = lanes[3 % nl];
        long[] e1 = l1.edge;
        long[] e2 = l2.edge;
        long[] e3 = l3.edge;
        int[] w1 = l1.word;
        int[] w2 = l2.word;
        int[] w3 = l3.word;
        int d1 = l1.head - h0;
        int d2 = l2.head - h0;
        int d3 = l3.head - h0;
        // lanes beyond nl repeat lane 0..: their table contributions are ORed twice, which is harmless
        int end = h0 + m;
        int k = h0;
        int[] pxa = px;
        long[] tta = tt;
        int f = fill;
        long pe = prevEdge;
        long pt = prevT;
        long ref = refDt;
        double sum = sumDt;
        long cnt = nDt;
        boolean first = pe == Long.MIN_VALUE;
        for (; k < end; k++) {
            long e = e0[k];
            if (e1[k + d1] != e || e2[k + d2] != e || e3[k + d3] != e) {
                break;
            }
            long t = t0[k];
            int gap = 0;
            if (first) {
                first = false;
            } else {
                long dt = t - pt;
                if (e != pe + 1 || dt <= 0 || (ref > 0 && (2 * dt > 3 * ref || 2 * dt < ref))) {
                    gap = FrameAssembler.GAP;
                } else {
                    ref = dt;
                    sum += dt;
                    cnt++;
                }
            }
            pe = e;
            pt = t;
            int a = w0[k];
            int b = w1[k + d1];
            int c = w2[k + d2];
            int d = w3[k + d3];
            int or = a | b | c | d;
            int and = a & b & c & d;
            pxa[f] = tb0[a & 127] | tb1[b & 127] | tb2[c & 127] | tb3[d & 127] | gap
                    | ((or & LaneBuffer.FLAGS) != 0 ? FrameAssembler.SUSPECT : 0)
                    | ((or & LaneBuffer.EXPLAINED) != 0 ? FrameAssembler.CAUSED : 0)
                    | ((and & LaneBuffer.COMPLETE) == 0 ? FrameAssembler.INCOMPLETE : 0);
            tta[f++] = t;
            if (f == BATCH * 2) {
                fill = f;
                flush();
                f = 0;
            }
        }
        int q = k - h0;
        clocks += q;
        fill = f;
        prevEdge = pe;
        prevT = pt;
        refDt = ref;
        sumDt = sum;
        nDt = cnt;
        consume(q);
        return q;
    }

    /** Decodes both pixels of one dual-link clock; {@code present} null means all lanes present at head+q. */
    private void decodeDual(int q, int gap, long t, boolean[] present) {
        int a = decodeLink(0, q, present);
        int b = decodeLink(perLink, q, present);
        int ctrlA = a & 0x07000000;
        int ctrlB = b & 0x07000000;
        px[fill] = a | gap;
        tt[fill++] = t;
        px[fill] = (b & ~0x07000000) | ctrlA
                | (ctrlB != ctrlA && ((a | b) & FrameAssembler.INCOMPLETE) == 0 ? FrameAssembler.MISMATCH : 0);
        tt[fill++] = t;
    }

    private int decodeLink(int first, int q, boolean[] present) {
        int acc = 0;
        int and = LaneBuffer.COMPLETE;
        int or = 0;
        for (int k = 0; k < perLink; k++) {
            int j = first + k;
            if (present != null && !present[j]) {
                and = 0;
                continue;
            }
            LaneBuffer lj = lanes[j];
            int w = lj.word[lj.head + q];
            acc |= tables[k][w & 127];
            and &= w;
            or |= w;
        }
        return acc | ((or & LaneBuffer.FLAGS) != 0 ? FrameAssembler.SUSPECT : 0)
                | ((or & LaneBuffer.EXPLAINED) != 0 ? FrameAssembler.CAUSED : 0) | (and == 0 ? FrameAssembler.INCOMPLETE : 0);
    }

    private int clockCheck(long e, long t) {
        clocks++;
        int gap = 0;
        if (prevEdge != Long.MIN_VALUE) {
            long dt = t - prevT;
            if (e != prevEdge + 1 || dt <= 0 || (refDt > 0 && (2 * dt > 3 * refDt || 2 * dt < refDt))) {
                gap = FrameAssembler.GAP;
            } else {
                refDt = dt;
                sumDt += dt;
                nDt++;
            }
        }
        prevEdge = e;
        prevT = t;
        return gap;
    }

    /** One clock period when lanes disagree or some are exhausted: lanes without it count as missing. */
    private void slowOne() {
        long e = Long.MAX_VALUE;
        for (LaneBuffer l : lanes) {
            if (l.size() > 0) {
                e = Math.min(e, l.edge[l.head]);
            }
        }
        boolean[] present = new boolean[lanes.length];
        long t = Long.MIN_VALUE;
        for (int j = 0; j < lanes.length; j++) {
            LaneBuffer l = lanes[j];
            present[j] = l.size() > 0 && l.edge[l.head] == e;
        }
        if (present[0]) {
            t = lanes[0].timeFs[lanes[0].head];
        } else {
            // the first lane lacks this clock period: estimate its time from the clock
            t = prevEdge == Long.MIN_VALUE ? 0 : prevT + Math.max(refDt, 1) * Math.max(1, e - prevEdge);
        }
        boolean stale = prevEdge != Long.MIN_VALUE && e <= prevEdge;
        int gap = stale ? FrameAssembler.GAP : clockCheck(e, t);
        if (stale) {
            clocks++;
        }
        if (fill >= BATCH * 2 - 2) {
            flush();
        }
        if (!dual) {
            int acc = 0;
            int and = stale ? 0 : LaneBuffer.COMPLETE;
            int or = 0;
            for (int j = 0; j < lanes.length; j++) {
                if (!present[j]) {
                    and = 0;
                    continue;
                }
                LaneBuffer lj = lanes[j];
                int w = lj.word[lj.head];
                acc |= tables[j][w & 127];
                and &= w;
                or |= w;
            }
            px[fill] = acc | gap | ((or & LaneBuffer.FLAGS) != 0 ? FrameAssembler.SUSPECT : 0)
                    | ((or & LaneBuffer.EXPLAINED) != 0 ? FrameAssembler.CAUSED : 0) | (and == 0 ? FrameAssembler.INCOMPLETE : 0);
            tt[fill++] = stale ? prevT : t;
        } else {
            if (stale) {
                java.util.Arrays.fill(present, false);
            }
            decodeDual(0, gap, stale ? prevT : t, present);
        }
        for (int j = 0; j < lanes.length; j++) {
            if (lanes[j].size() > 0 && lanes[j].edge[lanes[j].head] == e) {
                lanes[j].consumeTo(lanes[j].head + 1);
            }
        }
    }

    @Override
    public void finish() {
        long withBits = 0;
        List<String> silent = new ArrayList<>();
        for (LaneBuffer l : lanes) {
            l.flushPending();
            if (l.bitsSeen > 0) {
                withBits++;
            } else {
                silent.add(l.name);
            }
        }
        if (withBits > 0 && !silent.isEmpty()) {
            String msg = "lane" + (silent.size() > 1 ? "s " : " ") + String.join(", ", silent)
                    + " delivered no bits while the other lanes did; nothing was decoded (a picture without "
                    + (silent.size() > 1 ? "them" : "it") + " would be wrong)";
            timing.errors.add(msg);
            timing.anomaly("missing-lane");
            ctx.annotate(Annotation.on(ctx.instanceId() + ".anomalies", "missing-lane").span(0, 0).severity(Severity.ERROR)
                    .label(msg).build());
            for (LaneBuffer l : lanes) {
                l.consumeTo(l.tail);
            }
        } else {
            drain(true);
        }
        asm.finish();
        timing.clocks = clocks;
        timing.linkClockSumDtFs = sumDt;
        timing.linkClockIntervals = nDt;
        String id = ctx.instanceId();
        long end = Math.max(0, prevT);
        ctx.emit(1, new Artifact(id, end, end, id + "-timing.json", "application/json",
                timing.toJson(id).getBytes(StandardCharsets.UTF_8)));
        ctx.emit(1, new Artifact(id, end, end, id + "-timing.txt", "text/plain",
                timing.toText(id).getBytes(StandardCharsets.UTF_8)));
        PanelTimingExport panel = new PanelTimingExport(timing, id);
        if (panel.measured()) {
            ctx.emit(1, new Artifact(id, end, end, id + "-timing.dts", "text/plain", panel.dts().getBytes(StandardCharsets.UTF_8)));
            ctx.emit(1, new Artifact(id, end, end, id + "-timing.h", "text/x-c", panel.cHeader().getBytes(StandardCharsets.UTF_8)));
        }
        TransmitterExport tx = new TransmitterExport(timing, mapping, reverse, id);
        if (tx.possible(panel)) {
            ctx.emit(1, new Artifact(id, end, end, id + "-tx.v", "text/x-verilog", tx.verilog(panel).getBytes(StandardCharsets.UTF_8)));
        }
    }

    Timing timing() {
        return timing;
    }
}
