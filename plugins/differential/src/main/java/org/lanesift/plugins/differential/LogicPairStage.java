package org.lanesift.plugins.differential;

import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Set;
import org.lanesift.data.EdgeListBuilder;
import org.lanesift.kit.PackedBits;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Artifact;
import org.lanesift.data.BitSets;
import org.lanesift.data.Block;
import org.lanesift.data.LogicBlock;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The stage for a P/N pair captured as two logic channels. The output follows P; samples where
 * both legs agree (both high or both low, impossible on a healthy differential pair) or where
 * either input is unknown are marked invalid and hold the previous level. Transitions sit half a
 * sample before the first sample of the new level, as for any logic capture; a level that changed
 * across an unknown run changes exactly at the run's end. Works 64 samples at a time.
 */
final class LogicPairStage implements Stage {
    static final int MAX_ANNOTATIONS = 1000;

    private final StageContext ctx;
    private final Settings s;
    private final List<ArrayDeque<LogicBlock>> queues = List.of(new ArrayDeque<>(), new ArrayDeque<>());
    private final int[] headOffset = new int[2];
    private final long[] expected = new long[2];
    private final boolean[] seen = new boolean[2];
    private double periodFs = Double.NaN;
    private long originFs;
    private boolean started;
    private long next;
    private boolean level;
    private long emittedUntil;
    private boolean emittedLevel;
    private long transitions;
    // open runs (stream index) of agreeing legs and of unknown input, -1 when none
    private long agreeStart = -1;
    private long inputStart = -1;
    private long unknownStart = -1;
    private long agreeRuns;
    private long agreeSamples;
    private long inputRuns;
    private long inputSamples;
    private int annotated;
    private final List<long[]> windows = new ArrayList<>();
    private long[] window;
    private int merge = 1;
    private int openCount;

    LogicPairStage(StageContext ctx, Settings s) {
        this.ctx = ctx;
        this.s = s;
    }

    private TimeBase time;

    long timeAt(long k, double frac) {
        return time.at(k, frac);
    }

    @Override
    public void accept(int input, Block block) {
        LogicBlock b = (LogicBlock) block;
        if (Double.isNaN(periodFs)) {
            periodFs = b.periodFs();
        }
        if (b.length() == 0) {
            return;
        }
        String name = input == 0 ? "p" : "n";
        if (seen[input] && Math.abs(b.startFs() - expected[input]) > periodFs / 2) {
            throw new org.lanesift.plugin.InputFormatException("input '" + name + "': block starts at " + b.startFs()
                    + " fs but the previous block ended at " + expected[input] + " fs; blocks must follow each other without gaps");
        }
        if (!seen[input]) {
            seen[input] = true;
            int other = 1 - input;
            if (seen[other] && Math.abs(b.startFs() - firstStart(other)) > periodFs / 2) {
                throw new org.lanesift.plugin.InputFormatException("input '" + name + "' starts at " + b.startFs() + " fs but input '"
                        + (other == 0 ? "p" : "n") + "' at " + firstStart(other)
                        + " fs; the legs of a logic pair must be sampled together (correct the skew first)");
            }
            firstStarts[input] = b.startFs();
        }
        expected[input] = b.startFs() + Math.round(b.length() * b.periodFs());
        queues.get(input).add(b);
        pump();
        detach();
    }

    /**
     * Copies the blocks still waiting for the other leg (bits and invalid mask), so that nothing
     * queued refers to a received block's arrays once {@link #accept} returns: blocks may be lent
     * (host-api {@code Block}, "Ownership"). Logic blocks are one bit per sample, so the copy is small.
     */
    private void detach() {
        for (ArrayDeque<LogicBlock> q : queues) {
            int n = q.size();
            for (int i = 0; i < n; i++) {
                LogicBlock b = q.poll();
                int words = BitSets.words(b.length());
                q.add(copies.contains(b) ? b : own(new LogicBlock(b.channel(), b.firstIndex(), b.startFs(), b.periodFs(),
                        Arrays.copyOf(b.bits(), words), b.length(), b.invalid() == null ? null : Arrays.copyOf(b.invalid(), words))));
            }
        }
    }

    private LogicBlock own(LogicBlock b) {
        copies.add(b);
        return b;
    }

    /** The queued blocks that are copies of our own (never copied again); forgotten when handed on. */
    private final Set<LogicBlock> copies = Collections.newSetFromMap(new IdentityHashMap<>());

    private final long[] firstStarts = new long[2];

    private long firstStart(int i) {
        return firstStarts[i];
    }

    private void pump() {
        while (!queues.get(0).isEmpty() && !queues.get(1).isEmpty()) {
            LogicBlock p = queues.get(0).peek();
            LogicBlock n = queues.get(1).peek();
            int po = headOffset[0];
            int no = headOffset[1];
            int len = Math.min(p.length() - po, n.length() - no);
            if (!started) {
                started = true;
                originFs = p.startFs() + Math.round(po * periodFs);
                emittedUntil = originFs;
                time = new TimeBase(originFs, periodFs);
            }
            process(p, po, n, no, len);
            headOffset[0] += len;
            headOffset[1] += len;
            if (headOffset[0] == p.length()) {
                copies.remove(queues.get(0).poll());
                headOffset[0] = 0;
            }
            if (headOffset[1] == n.length()) {
                copies.remove(queues.get(1).poll());
                headOffset[1] = 0;
            }
        }
    }

    private void process(LogicBlock p, int po, LogicBlock n, int no, int len) {
        int words = BitSets.words(len);
        long tailMask = (len & 63) == 0 ? -1L : (1L << len) - 1;
        long[] pw = new long[words];
        long[] nw = new long[words];
        PackedBits.orShifted(pw, p.bits(), po, len);
        PackedBits.orShifted(nw, n.bits(), no, len);
        long[] inputInv = Chunk.mask(p.invalid(), po, len, n.invalid(), no);
        long[] inv = new long[words];
        long[] agree = new long[words];
        long base = next;
        long[] out = new long[words];
        EdgeListBuilder edges = new EdgeListBuilder();
        if (base == 0 && words > 0) {
            long ii0 = inputInv == null ? 0 : inputInv[0];
            boolean valid0 = (ii0 & 1) == 0 && ((pw[0] ^ nw[0]) & 1) != 0;
            level = valid0 && (pw[0] & 1) != 0;
            emittedLevel = level;
        }
        for (int w = 0; w < words; w++) {
            long m = w == words - 1 ? tailMask : -1L;
            long ii = inputInv == null ? 0 : inputInv[w];
            long ag = ~(pw[w] ^ nw[w]) & ~ii & m;
            agree[w] = ag;
            long iv = (ag | ii) & m;
            inv[w] = iv;
            long x;
            if (iv == 0) {
                x = pw[w];
            } else {
                // hold the previous level through unknown samples, bit by bit (rare)
                x = 0;
                boolean l = level;
                for (int bit = 0; bit < 64; bit++) {
                    long mk = 1L << bit;
                    if ((iv & mk) == 0) {
                        l = (pw[w] & mk) != 0;
                    }
                    if (l) {
                        x |= mk;
                    }
                }
            }
            x &= m;
            long carry = level ? 1L : 0L;
            long diff = (x ^ ((x << 1) | carry)) & m;
            while (diff != 0) {
                int j = Long.numberOfTrailingZeros(diff);
                edges.addTime(timeAt(base + ((long) w << 6) + j, -0.5));
                diff &= diff - 1;
            }
            out[w] = x;
            int last = w == words - 1 ? ((len - 1) & 63) : 63;
            level = (x >>> last & 1) != 0;
        }
        transitions += edges.timeCount();
        next = base + len;
        agreeStart = runs(agree, len, base, agreeStart, true);
        inputStart = runs(inputInv, len, base, inputStart, false);
        countWindow(agree, inputInv, len, base);
        // unknown spans of this block
        long blockEnd = timeAt(next, -0.5);
        int i = 0;
        long open = unknownStart;
        unknownStart = -1;
        while (i < len) {
            int a = nextBit(inv, i, len, true);
            if (a >= len) {
                break;
            }
            int z = nextBit(inv, a, len, false);
            long start = (a == 0 && open >= 0) ? open : base + a;
            long sFs = Math.max(emittedUntil, Math.max(originFs, timeAt(start, -0.5)));
            long eFs = z >= len ? blockEnd : timeAt(base + z, -0.5);
            if (eFs > sFs) {
                edges.addSpan(sFs, eFs);
            }
            if (z >= len) {
                unknownStart = start;
            }
            i = z;
        }
        if (s.invert) {
            for (int w = 0; w < words; w++) {
                out[w] = ~out[w] & (w == words - 1 ? tailMask : -1L);
            }
        }
        ctx.emit(AnalogStage.OUT_LOGIC, new LogicBlock(s.channel, base, timeAt(base, 0), periodFs, out, len, inv));
        emitEdges(edges, blockEnd);
    }

    private static int nextBit(long[] bits, int i, int end, boolean set) {
        while (i < end) {
            long w = (set ? bits[i >>> 6] : ~bits[i >>> 6]) & (-1L << i);
            if (w != 0) {
                return Math.min(end, ((i >>> 6) << 6) + Long.numberOfTrailingZeros(w));
            }
            i = ((i >>> 6) + 1) << 6;
        }
        return end;
    }

    private void emitEdges(EdgeListBuilder edges, long end) {
        long start = emittedUntil;
        if (end < start) {
            end = start;
        }
        boolean initial = emittedLevel ^ s.invert;
        if ((edges.timeCount() & 1) != 0) {
            emittedLevel = !emittedLevel;
        }
        emittedUntil = end;
        ctx.emit(AnalogStage.OUT_EDGES, edges.build(s.channel, start, end, initial));
    }

    /** Annotates runs of set bits, carrying an open run (stream index, or -1) into the next block; returns the open run. */
    private long runs(long[] mask, int len, long base, long open, boolean agreeing) {
        int i = 0;
        if (open >= 0) {
            if (mask != null && len > 0 && BitSets.get(mask, 0)) {
                int z = nextBit(mask, 0, len, false);
                if (z >= len) {
                    return open;
                }
                closeRun(open, base + z, agreeing);
                i = z;
            } else {
                closeRun(open, base, agreeing);
            }
            open = -1;
        }
        while (mask != null && i < len) {
            int a = nextBit(mask, i, len, true);
            if (a >= len) {
                break;
            }
            int z = nextBit(mask, a, len, false);
            if (z >= len) {
                return base + a;
            }
            closeRun(base + a, base + z, agreeing);
            i = z;
        }
        return -1;
    }

    private void closeRun(long from, long to, boolean agreeing) {
        if (agreeing) {
            agreeRuns++;
            agreeSamples += to - from;
        } else {
            inputRuns++;
            inputSamples += to - from;
        }
        if (annotated++ >= MAX_ANNOTATIONS) {
            return;
        }
        long a = Math.max(originFs, timeAt(from, -0.5));
        long z = timeAt(to, -0.5);
        ctx.annotate(Annotation.on(s.channel, agreeing ? "legs-agree" : "input-invalid").span(a, z).severity(Severity.WARNING)
                .label(agreeing ? (to - from) + " samples with both legs at the same level" : (to - from) + " unknown input samples")
                .field("firstSample", Field.integer(from, "")).field("samples", Field.integer(to - from, "")).build());
    }

    private void countWindow(long[] agree, long[] inputInv, int len, long base) {
        int W = s.windowSamples;
        int pos = 0;
        while (pos < len) {
            long abs = base + pos;
            if (window == null) {
                window = new long[] {abs, abs, 0, 0};
                openCount = 0;
            }
            long winEnd = (abs / W + 1) * W;
            int e = (int) Math.min(len, pos + (winEnd - abs));
            window[2] += countRange(agree, pos, e);
            window[3] += inputInv == null ? 0 : countRange(inputInv, pos, e);
            window[1] = base + e;
            pos = e;
            if (base + e == winEnd) {
                closeWindow();
            }
        }
    }

    private void closeWindow() {
        if (++openCount < merge) {
            return;
        }
        windows.add(window);
        window = null;
        if (windows.size() >= AnalogStage.MAX_REPORT_WINDOWS) {
            List<long[]> m = new ArrayList<>();
            for (int i = 0; i + 1 < windows.size(); i += 2) {
                long[] x = windows.get(i);
                long[] y = windows.get(i + 1);
                m.add(new long[] {x[0], y[1], x[2] + y[2], x[3] + y[3]});
            }
            windows.clear();
            windows.addAll(m);
            merge *= 2;
        }
    }

    private static long countRange(long[] bits, int from, int to) {
        long c = 0;
        for (int i = from; i < to; ) {
            if ((i & 63) == 0 && i + 64 <= to) {
                c += Long.bitCount(bits[i >>> 6]);
                i += 64;
            } else {
                if (BitSets.get(bits, i)) {
                    c++;
                }
                i++;
            }
        }
        return c;
    }

    @Override
    public void finish() {
        if (!started) {
            return;
        }
        if (agreeStart >= 0) {
            closeRun(agreeStart, next, true);
            agreeStart = -1;
        }
        if (inputStart >= 0) {
            closeRun(inputStart, next, false);
            inputStart = -1;
        }
        long end = timeAt(next, 0);
        EdgeListBuilder last = new EdgeListBuilder();
        if (unknownStart >= 0) {
            long a = Math.max(emittedUntil, Math.max(originFs, timeAt(unknownStart, -0.5)));
            if (end > a) {
                last.addSpan(a, end);
            }
        }
        emitEdges(last, end);
        if (window != null) {
            windows.add(window);
            window = null;
        }
        long t0 = originFs;
        if (annotated > MAX_ANNOTATIONS) {
            ctx.annotate(Annotation.on(s.channel, "legs-agree-summary").span(t0, end).severity(Severity.WARNING)
                    .label((annotated - MAX_ANNOTATIONS) + " further runs not annotated singly")
                    .field("agreeRuns", Field.integer(agreeRuns, "")).field("agreeSamples", Field.integer(agreeSamples, "")).build());
        }
        if (!ctx.isConnected(AnalogStage.OUT_REPORT)) {
            return; // nothing reads the report: its text is not made
        }
        JsonWriter j = JsonWriter.compact().numberStyle(NumberStyle.significant(9)).nonFiniteAsNull();
        j.beginObject().field("instance", ctx.instanceId()).field("channel", s.channel).field("mode", s.modeName())
                .field("samplePeriodFs", periodFs).field("startFs", originFs).field("samples", next)
                .field("transitions", transitions).field("agreeRuns", agreeRuns).field("agreeSamples", agreeSamples)
                .field("invalidInputRuns", inputRuns).field("invalidInputSamples", inputSamples)
                .field("windowSamples", (long) s.windowSamples * merge);
        j.name("windows").beginArray();
        for (long[] w : windows) {
            j.beginObject().field("startFs", timeAt(w[0], 0)).field("endFs", timeAt(w[1], 0)).field("samples", w[1] - w[0])
                    .field("agreeSamples", w[2]).field("invalidInputSamples", w[3]).endObject();
        }
        j.endArray().endObject();
        ctx.emit(AnalogStage.OUT_REPORT, new Artifact(s.channel, t0, end, ctx.instanceId() + "-levels.json", "application/json",
                j.finish().getBytes(StandardCharsets.UTF_8)));
    }
}
