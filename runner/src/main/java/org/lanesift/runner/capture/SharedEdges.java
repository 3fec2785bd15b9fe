package org.lanesift.runner.capture;

import java.util.Arrays;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.kit.TwoLevelFinder;
import org.lanesift.kit.TwoLevels;

/**
 * The transitions of one acquisition's shared channel, collected for the alignment of a capture
 * set: from logic samples (the host API's converter), from edge lists as they are, or from analog
 * samples at the midpoint of the two levels of the first block (the shared level finder), timed by
 * linear interpolation. Keeps at most {@link #MAX_EDGES}; also the sample period and the span.
 */
final class SharedEdges {
    static final int MAX_EDGES = 1 << 20;
    long[] timesFs = new long[1024];
    /** Bit k set when transition k rises. */
    long[] rising = new long[16];
    int count;
    double periodFs = Double.NaN;
    long startFs = Long.MAX_VALUE;
    long endFs = Long.MIN_VALUE;
    private final LogicEdges logic = new LogicEdges();
    private float threshold = Float.NaN;
    private float prev = Float.NaN;
    private long prevFs;

    void accept(Block b) {
        startFs = Math.min(startFs, b.startFs());
        endFs = Math.max(endFs, b.endFs());
        if (b instanceof LogicBlock lb) {
            periodFs = lb.periodFs();
            edges(logic.toEdges(lb));
        } else if (b instanceof Edges e) {
            edges(e);
        } else if (b instanceof AnalogBlock ab) {
            periodFs = ab.periodFs();
            analog(ab);
        }
    }

    private void edges(Edges e) {
        for (int i = 0; i < e.count(); i++) {
            add(e.timesFs()[i], e.levelAfter(i));
        }
    }

    private void analog(AnalogBlock b) {
        float[] v = b.volts();
        if (Float.isNaN(threshold)) {
            TwoLevels lv = TwoLevelFinder.find(v, b.length());
            threshold = lv != null && lv.twoLevels() ? (float) ((lv.low() + lv.high()) / 2) : Float.NaN;
            if (Float.isNaN(threshold)) {
                return;
            }
        }
        float t = threshold;
        for (int i = 0, n = b.length(); i < n; i++) {
            long at = b.startFs() + Math.round(i * b.periodFs());
            if (!b.isValid(i)) {
                prev = Float.NaN;
                continue;
            }
            float x = v[i];
            if (prev == prev && (prev < t) != (x < t)) {
                add(prevFs + Math.round((double) (t - prev) / (x - prev) * (at - prevFs)), x >= t);
            }
            prev = x;
            prevFs = at;
        }
    }

    private void add(long t, boolean up) {
        if (count == MAX_EDGES) {
            return;
        }
        if (count == timesFs.length) {
            timesFs = Arrays.copyOf(timesFs, 2 * count);
            rising = Arrays.copyOf(rising, (2 * count + 63) >>> 6);
        }
        if (up) {
            rising[count >>> 6] |= 1L << count;
        }
        timesFs[count++] = t;
    }

    boolean rises(int k) {
        return (rising[k >>> 6] >>> k & 1) != 0;
    }
}
