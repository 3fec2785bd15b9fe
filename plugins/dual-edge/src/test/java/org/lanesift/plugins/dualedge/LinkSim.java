package org.lanesift.plugins.dualedge;

import java.util.Arrays;
import java.util.Random;
import org.lanesift.data.Edges;

/**
 * Synthetic source-synchronous links for the tests, built from first principles (no code shared
 * with the plugin): a clock and data lanes whose every transition time is known, with Gaussian
 * random jitter, sinusoidal jitter, duty-cycle distortion and per-lane skew injected on purpose.
 *
 * <p>DDR ({@link #ddr}): clock edge k (rising for even k, the clock starts low) at
 * {@code t0 + k*UI + (k odd ? (2*duty-1)*UI : 0) + clock jitter}; data bit k of a lane occupies
 * {@code [t0 + (k-0.5)*UI, t0 + (k+0.5)*UI)} (centre-aligned) or {@code [t0 + k*UI, t0 + (k+1)*UI)}
 * (edge-aligned), shifted by the lane's skew, each boundary moved by data jitter.
 *
 * <p>7:1 ({@link #sevenToOne}): slot j of pixel p occupies {@code [t0 + (7p+j)*UI, +UI)}, UI = P/7;
 * the clock is high in slots 0, 1, 5, 6 and low in 2, 3, 4 (docs/reference-facts.md#pixel-link-clock-and-slot-mappings), so it falls at
 * the start of slot 2 and rises at the start of slot 5 of every pixel.
 */
final class LinkSim {
    double uiFs;
    long t0;
    int lanes;
    int bits;
    double duty = 0.5;
    double[] skewFs;
    double dataRjFs;
    double clockRjFs;
    double sjAmpFs;
    double sjFreqHz;
    boolean sjOnClock;
    boolean sjOnData = true;
    boolean edgeAligned;
    boolean invertClock;
    long seed = 1;
    boolean seven;
    // results
    boolean[][] data;
    long[] clockT;
    boolean clockInitial;
    /** boundary[l][k]: time of the boundary before bit k of lane l (a transition only if the bit changes). */
    long[][] boundary;
    long endFs;

    static LinkSim ddr(double uiFs, int bits, int lanes) {
        LinkSim s = new LinkSim();
        s.uiFs = uiFs;
        s.bits = bits;
        s.lanes = lanes;
        s.t0 = Math.round(4 * uiFs);
        s.skewFs = new double[lanes];
        return s;
    }

    static LinkSim sevenToOne(double periodFs, int pixels, int lanes) {
        LinkSim s = new LinkSim();
        s.seven = true;
        s.uiFs = periodFs / 7;
        s.bits = 7 * pixels;
        s.lanes = lanes;
        s.t0 = Math.round(3 * s.uiFs);
        s.duty = 4.0 / 7;
        s.skewFs = new double[lanes];
        return s;
    }

    private double sj(double tFs) {
        return sjAmpFs == 0 ? 0 : sjAmpFs * Math.sin(2 * Math.PI * sjFreqHz * tFs * 1e-15 + 0.3);
    }

    LinkSim build() {
        Random r = new Random(seed);
        data = new boolean[lanes][bits];
        for (boolean[] d : data) {
            for (int k = 0; k < bits; k++) {
                d[k] = r.nextBoolean();
            }
        }
        Random cj = new Random(seed * 31 + 7);
        if (!seven) {
            clockT = new long[bits];
            for (int k = 0; k < bits; k++) {
                double nominal = t0 + k * uiFs + ((k & 1) == 1 ? (2 * duty - 1) * uiFs : 0);
                clockT[k] = Math.round(nominal + cj.nextGaussian() * clockRjFs + (sjOnClock ? sj(nominal) : 0));
            }
            clockInitial = invertClock;
        } else {
            int pixels = bits / 7;
            clockT = new long[2 * pixels];
            for (int p = 0; p < pixels; p++) {
                // duty distortion moves the falling edge: high time = duty * P instead of 4/7 * P
                double fall = t0 + (7 * p + 2) * uiFs + (duty - 4.0 / 7) * 7 * uiFs;
                double rise = t0 + (7 * p + 5) * uiFs;
                clockT[2 * p] = Math.round(fall + cj.nextGaussian() * clockRjFs + (sjOnClock ? sj(fall) : 0));
                clockT[2 * p + 1] = Math.round(rise + cj.nextGaussian() * clockRjFs + (sjOnClock ? sj(rise) : 0));
            }
            clockInitial = !invertClock;
        }
        boundary = new long[lanes][bits];
        for (int l = 0; l < lanes; l++) {
            Random dj = new Random(seed * 1000 + l);
            for (int k = 0; k < bits; k++) {
                double nominal = t0 + (seven || edgeAligned ? k : k - 0.5) * uiFs + skewFs[l];
                boundary[l][k] = Math.round(nominal + dj.nextGaussian() * dataRjFs + (sjOnData ? sj(nominal) : 0));
            }
        }
        endFs = Math.round(t0 + (bits + 1) * uiFs);
        return this;
    }

    Edges clock() {
        long[] t = clockT.clone();
        Arrays.sort(t);
        return Edges.of("CLK", 0, endFs, clockInitial, t);
    }

    Edges lane(int l) {
        long[] t = new long[bits];
        int n = 0;
        boolean level = false;
        for (int k = 0; k < bits; k++) {
            if (data[l][k] != level) {
                t[n++] = boundary[l][k];
                level = data[l][k];
            }
        }
        long[] tt = Arrays.copyOf(t, n);
        Arrays.sort(tt); // heavy jitter may reorder transitions
        return Edges.of("D" + l, 0, endFs, false, tt);
    }

    /** Whether bit k of lane l starts with a transition. */
    boolean changesAt(int l, int k) {
        return data[l][k] != (k == 0 ? false : data[l][k - 1]);
    }
}
