package org.lanesift.runner.capture;

import java.util.Arrays;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Block;
import org.lanesift.data.DataKind;
import org.lanesift.time.Femtos;

/**
 * A VCD real variable: its changes are sampled and held on a fixed grid of period
 * {@code realPeriodFs} (grid point k at k x period); a point where the value is unknown (before the
 * first value, or after {@code $dumpoff}) is marked invalid.
 */
final class VcdReal extends VcdSignal {
    private double held = Double.NaN;
    private long[] rt = new long[8];
    private double[] rv = new double[8];
    private int rcount;

    VcdReal(int index, String path, String code) {
        super(index, 64, path, code);
    }

    @Override
    DataKind dataKind() {
        return DataKind.ANALOG;
    }

    @Override
    String help(double realPeriodFs) {
        return "real '" + path + "' sampled and held at " + Femtos.format(realPeriodFs) + " intervals";
    }

    @Override
    void start(long timeFs) {
    }

    @Override
    void dumpOff(long timeFs) {
        set(timeFs, Double.NaN);
    }

    /**
     * A value change.
     *
     * @param timeFs time, fs
     * @param v      the value, NaN for unknown
     */
    void set(long timeFs, double v) {
        if (rcount == rt.length) {
            rt = Arrays.copyOf(rt, rcount * 2);
            rv = Arrays.copyOf(rv, rcount * 2);
        }
        rt[rcount] = timeFs;
        rv[rcount] = v;
        rcount++;
    }

    @Override
    Block take(long spanStartFs, long endFs, boolean last, double realPeriodFs) {
        long k0 = (long) Math.ceil(spanStartFs / realPeriodFs);
        long k1 = (long) Math.ceil(endFs / realPeriodFs);
        int n = (int) Math.max(0, k1 - k0);
        float[] v = new float[n];
        long[] inv = null;
        int j = 0;
        double cur = held;
        for (int i = 0; i < n; i++) {
            double t = (k0 + i) * realPeriodFs;
            while (j < rcount && rt[j] <= t) {
                cur = rv[j++];
            }
            if (Double.isNaN(cur)) {
                if (inv == null) {
                    inv = new long[(n + 63) >>> 6];
                }
                inv[i >>> 6] |= 1L << i;
            } else {
                v[i] = (float) cur;
            }
        }
        if (rcount > 0) {
            held = rv[rcount - 1];
        }
        rcount = 0;
        return new AnalogBlock(port(), k0, Math.round(k0 * realPeriodFs), realPeriodFs, v, n, inv);
    }
}
