package org.lanesift.runner.capture;

import org.lanesift.data.EdgeListBuilder;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;

/** A 1-bit VCD variable: level changes become edges, x and z unknown spans. */
final class VcdScalar extends VcdSignal {
    private boolean level;
    private boolean unknown = true;
    private long unknownSince;
    private boolean spanInitial;
    private final EdgeListBuilder edges = new EdgeListBuilder();

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
        Edges e = edges.build(port(), spanStartFs, endFs, spanInitial);
        spanInitial = level;
        edges.clear();
        return e;
    }

    private void addTime(long t) {
        edges.addTime(t);
    }

    private void addSpan(long a, long b) {
        edges.addSpanJoined(a, b);
    }
}
