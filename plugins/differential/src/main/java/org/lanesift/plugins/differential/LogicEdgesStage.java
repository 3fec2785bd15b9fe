package org.lanesift.plugins.differential;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.plugin.Stage;
import org.lanesift.plugin.StageContext;

/**
 * The running {@code logic-edges} stage: one stateful converter and one activity record per channel.
 *
 * <p>The shortest pulses are measured over the transition times. Once a channel's shortest high and
 * low pulses are both one sample period, nothing can be shorter as long as every transition lies
 * on one grid of whole sample periods (a whole number of femtoseconds per sample, and every
 * block's start {@code firstIndex} periods after one origin); from then on the times are no
 * longer read, which on a busy channel was a quarter of the stage's time.
 */
final class LogicEdgesStage implements Stage {
    static final String TRACK = "activity";
    /** No grid origin yet. */
    private static final long NO_GRID = Long.MIN_VALUE;
    private final StageContext ctx;
    private final LogicEdges[] conv;
    private final long[] nextIndex;
    private final long[] transitions;
    private final long[] gaps;
    private final long[] lastEdgeFs;
    private final long[] shortestHighFs;
    private final long[] shortestLowFs;
    private final String[] names;
    /** Time of sample 0 on the grid of the channel's current gap-free stretch, femtoseconds, or NO_GRID. */
    private final long[] gridOriginFs;
    /** Set for good once a channel's blocks leave the grid: its pulses are then always measured. */
    private final boolean[] offGrid;

    LogicEdgesStage(StageContext ctx, int channels) {
        this.ctx = ctx;
        conv = new LogicEdges[channels];
        nextIndex = new long[channels];
        transitions = new long[channels];
        gaps = new long[channels];
        lastEdgeFs = new long[channels];
        shortestHighFs = new long[channels];
        shortestLowFs = new long[channels];
        names = new String[channels];
        gridOriginFs = new long[channels];
        offGrid = new boolean[channels];
        for (int c = 0; c < channels; c++) {
            gridOriginFs[c] = NO_GRID;
            conv[c] = new LogicEdges();
            nextIndex[c] = -1;
            lastEdgeFs[c] = Long.MIN_VALUE;
            shortestHighFs[c] = Long.MAX_VALUE;
            shortestLowFs[c] = Long.MAX_VALUE;
        }
    }

    @Override
    public void accept(int input, Block block) {
        LogicBlock b = (LogicBlock) block;
        if (names[input] == null) {
            names[input] = b.channel();
        }
        if (nextIndex[input] >= 0 && b.firstIndex() != nextIndex[input]) {
            if (b.firstIndex() < nextIndex[input]) {
                throw new org.lanesift.plugin.InputFormatException("input 'in" + input + "' (" + b.channel() + "): block starts at sample "
                        + b.firstIndex() + " but the previous one ended at sample " + nextIndex[input]
                        + "; blocks must come in time order without overlap");
            }
            conv[input].reset(); // a gap: the level before it says nothing about the level after it
            lastEdgeFs[input] = Long.MIN_VALUE;
            gridOriginFs[input] = NO_GRID; // no pulse is measured across the gap
            gaps[input]++;
        }
        nextIndex[input] = b.firstIndex() + b.length();
        checkGrid(input, b);
        Edges e = conv[input].toEdges(b);
        measure(input, e, b.periodFs());
        ctx.emit(input, e);
    }

    /**
     * Keeps {@code offGrid} up to date: a block is on the grid when the period is a whole number of
     * femtoseconds and its start lies {@code firstIndex} periods after the stretch's origin.
     */
    private void checkGrid(int c, LogicBlock b) {
        if (offGrid[c]) {
            return;
        }
        double p = b.periodFs();
        if (p != Math.rint(p) || p < 1 || p > 0x1p52) {
            offGrid[c] = true;
            return;
        }
        long origin;
        try {
            origin = Math.subtractExact(b.startFs(), Math.multiplyExact(b.firstIndex(), (long) p));
        } catch (ArithmeticException tooFar) {
            offGrid[c] = true;
            return;
        }
        if (gridOriginFs[c] == NO_GRID) {
            gridOriginFs[c] = origin;
        } else if (gridOriginFs[c] != origin) {
            offGrid[c] = true;
        }
    }

    /** Counts transitions and keeps the shortest pulse between two transitions of one gap-free stretch. */
    private void measure(int c, Edges e, double periodFs) {
        int n = e.count();
        if (n == 0) {
            return;
        }
        transitions[c] += n;
        if (e.invalidCount() > 0) {
            lastEdgeFs[c] = Long.MIN_VALUE; // an unknown span may hide edges: no pulse is measured across it
            return;
        }
        long[] t = e.timesFs();
        if (!offGrid[c] && shortestHighFs[c] <= periodFs && shortestLowFs[c] <= periodFs) {
            lastEdgeFs[c] = t[n - 1]; // both at one period, the least on the grid: nothing can be shorter
            return;
        }
        // the interval ending at t[k] has the level before t[k]: the initial level for even k
        long even = lastEdgeFs[c] == Long.MIN_VALUE ? Long.MAX_VALUE : t[0] - lastEdgeFs[c];
        long odd = Long.MAX_VALUE;
        int k = 1;
        for (; k + 1 < n; k += 2) {
            odd = Math.min(odd, t[k] - t[k - 1]);
            even = Math.min(even, t[k + 1] - t[k]);
        }
        if (k < n) {
            odd = Math.min(odd, t[k] - t[k - 1]);
        }
        boolean high = e.initialLevel();
        shortestHighFs[c] = Math.min(shortestHighFs[c], high ? even : odd);
        shortestLowFs[c] = Math.min(shortestLowFs[c], high ? odd : even);
        lastEdgeFs[c] = t[n - 1];
    }

    @Override
    public void finish() {
        for (int c = 0; c < conv.length; c++) {
            String name = names[c] == null ? "in" + c : names[c];
            Annotation.Builder a = Annotation.on(TRACK, "logic-activity").severity(Severity.INFO)
                    .label(name + ": " + transitions[c] + " transitions" + (gaps[c] > 0 ? ", " + gaps[c] + " gaps" : ""))
                    .text("channel", name).number("transitions", transitions[c], "").number("gaps", gaps[c], "");
            if (shortestHighFs[c] != Long.MAX_VALUE) {
                a.number("shortestHighFs", shortestHighFs[c], "fs");
            }
            if (shortestLowFs[c] != Long.MAX_VALUE) {
                a.number("shortestLowFs", shortestLowFs[c], "fs");
            }
            ctx.annotate(a.build());
        }
    }
}
