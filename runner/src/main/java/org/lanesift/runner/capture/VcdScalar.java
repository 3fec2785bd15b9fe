package org.lanesift.runner.capture;

import java.util.Arrays;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;

/** A 1-bit VCD variable: level changes become edges, x and z unknown spans. */
final class VcdScalar extends VcdSignal {
    private boolean level;
    private boolean unknown = true;
    private long unknownSince;
    private boolean spanInitial;
    private long[] times = new long[16];
    private int count;
    private long[] spans = new long[8];
    private int spanCount;

    VcdScalar(int index, String path, String code) {
        super(index, 1, path, code);
    }

    @Override
    DataKind dataKind() {
        return DataKind.EDGES;
    }

    @Override
    String help(double realPeriodFs) {
        return "scalar '" + path + "' as edges";
    }

    @Override
    void start(long timeFs) {
        unknownSince = timeFs;
    }

    @Override
    void dumpOff(long timeFs) {
        if (!unknown) {
            unknown = true;
            unknownSince = timeFs;
        }
    }

    /**
     * A value change.
     *
     * @param timeFs time, fs
     * @param c      {@code '0'}, {@code '1'}, or anything else for unknown
     */
    void set(long timeFs, byte c) {
        if (c == '0' || c == '1') {
            boolean lv = c == '1';
            if (unknown) {
                addSpan(unknownSince, timeFs);
                unknown = false;
            }
            if (lv != level) {
                addTime(timeFs);
                level = lv;
            }
        } else if (!unknown) {
            unknown = true;
            unknownSince = timeFs;
        }
    }

    @Override
    Block take(long spanStartFs, long endFs, boolean last, double realPeriodFs) {
        if (unknown) {
            addSpan(Math.max(unknownSince, spanStartFs), endFs);
            unknownSince = endFs;
        }
        Edges e = new Edges(port(), spanStartFs, endFs, spanInitial, times, count, spans, spanCount);
        spanInitial = level;
        times = new long[Math.max(16, Math.min(count, 1 << 16))];
        count = 0;
        spans = new long[8];
        spanCount = 0;
        return e;
    }

    private void addTime(long t) {
        if (count == times.length) {
            times = Arrays.copyOf(times, count * 2);
        }
        times[count++] = t;
    }

    private void addSpan(long a, long b) {
        if (b <= a) {
            return;
        }
        if (spanCount > 0 && spans[2 * spanCount - 1] == a) {
            spans[2 * spanCount - 1] = b;
            return;
        }
        if (2 * spanCount + 2 > spans.length) {
            spans = Arrays.copyOf(spans, spans.length * 2);
        }
        spans[2 * spanCount] = a;
        spans[2 * spanCount + 1] = b;
        spanCount++;
    }
}
