package org.lanesift.dist.sift;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * A 7:1 pixel link capture made in the test tree for the {@code sift} tests: 3 data pairs
 * (18-bit), a 25 MHz pixel clock, frames of 16 x 10 active pixels (28 x 15 total) with active-high
 * syncs, random colours, its own per-leg and per-pair skews, edge jitter, noise and ringing. The
 * capture starts inside frame 0, so frames 1 and 2 are complete and 0 and 3 partial.
 * Slot layout: docs/reference-facts.md#pixel-link-clock-and-slot-mappings (18-bit table, clock 1100011).
 */
final class PixelLinkCapture {
    static final double PIXEL_CLOCK_HZ = 25e6;
    static final double RATE_HZ = 2e9;
    static final int H_ACTIVE = 16;
    static final int H_FRONT = 3;
    static final int H_SYNC = 5;
    static final int H_BACK = 4;
    static final int H_TOTAL = H_ACTIVE + H_FRONT + H_SYNC + H_BACK;
    static final int V_ACTIVE = 10;
    static final int V_FRONT = 1;
    static final int V_SYNC = 2;
    static final int V_BACK = 2;
    static final int V_TOTAL = V_ACTIVE + V_FRONT + V_SYNC + V_BACK;
    static final int FIRST_CLOCK = 150;
    static final int CLOCKS = 3 * H_TOTAL * V_TOTAL + 90 - FIRST_CLOCK;
    /** Injected skew of each N leg against its P leg, ps: clock, then lanes 0 to 2. */
    static final double[] LEG_SKEW_PS = {33, -52, 18, -27};
    /** Injected delay of each data pair's P leg against the clock's P leg, ps. */
    static final double[] LANE_SKEW_PS = {170, -95, 60};

    /** The delays this capture injects (LANE_SKEW_PS unless a test changes them), ps. */
    final double[] laneSkewPs = LANE_SKEW_PS.clone();

    /** The frames' 18-bit colours (R6 << 12 | G6 << 6 | B6), one array of H_ACTIVE x V_ACTIVE per frame. */
    final List<int[]> frames = new ArrayList<>();

    void write(Path file, String[] legNames, long seed) throws IOException {
        int[][] bits = slotBits(seed, false);
        int slots = bits[0].length;
        double slotS = 1 / PIXEL_CLOCK_HZ / 7;
        int samples = (int) (slots * slotS * RATE_HZ) - 8;
        writeLegs(file, legNames, seed, bits, slots, slotS, samples);
    }

    /**
     * The link's bits, one per slot: clock, then lanes 0 to 2; fills {@link #frames} with four
     * frames of random colours, or with one random picture four times when {@code repeatPicture}.
     */
    int[][] slotBits(long seed, boolean repeatPicture) {
        Random colours = new Random(seed);
        for (int f = 0; f < 4; f++) {
            int[] px = new int[H_ACTIVE * V_ACTIVE];
            for (int i = 0; i < px.length; i++) {
                px[i] = colours.nextInt(1 << 18);
            }
            frames.add(repeatPicture && f > 0 ? frames.get(0) : px);
        }
        int slots = CLOCKS * 7;
        int[][] bits = new int[4][slots];
        int[] clockPattern = {1, 1, 0, 0, 0, 1, 1};
        for (int c = 0; c < CLOCKS; c++) {
            int k = c + FIRST_CLOCK;
            int frame = k / (H_TOTAL * V_TOTAL);
            int line = k / H_TOTAL % V_TOTAL;
            int x = k % H_TOTAL;
            boolean de = line < V_ACTIVE && x < H_ACTIVE;
            boolean hs = x >= H_ACTIVE + H_FRONT && x < H_ACTIVE + H_FRONT + H_SYNC;
            boolean vs = line >= V_ACTIVE + V_FRONT && line < V_ACTIVE + V_FRONT + V_SYNC;
            int rgb = de ? frames.get(frame)[line * H_ACTIVE + x] : 0;
            int r = rgb >> 12 & 63;
            int g = rgb >> 6 & 63;
            int b = rgb & 63;
            int[] l0 = {g & 1, r >> 5 & 1, r >> 4 & 1, r >> 3 & 1, r >> 2 & 1, r >> 1 & 1, r & 1};
            int[] l1 = {b >> 1 & 1, b & 1, g >> 5 & 1, g >> 4 & 1, g >> 3 & 1, g >> 2 & 1, g >> 1 & 1};
            int[] l2 = {de ? 1 : 0, vs ? 1 : 0, hs ? 1 : 0, b >> 5 & 1, b >> 4 & 1, b >> 3 & 1, b >> 2 & 1};
            for (int s = 0; s < 7; s++) {
                bits[0][c * 7 + s] = clockPattern[s];
                bits[1][c * 7 + s] = l0[s];
                bits[2][c * 7 + s] = l1[s];
                bits[3][c * 7 + s] = l2[s];
            }
        }
        return bits;
    }

    private void writeLegs(Path file, String[] legNames, long seed, int[][] bits, int slots, double slotS, int samples) throws IOException {
        LegWaves waves = new LegWaves(RATE_HZ, samples, 90e-12, seed + 1);
        float[][] volts = new float[8][];
        for (int p = 0; p < 4; p++) {
            double[] hi = new double[slots];
            double[] lo = new double[slots];
            for (int s = 0; s < slots; s++) {
                // TIA/EIA-644-A offset 1.125-1.375 V and |VOD| 247-454 mV: 1.25 V +/- 160 mV per leg (docs/reference-facts.md#lvds-electrical-levels)
                hi[s] = bits[p][s] == 1 ? 1.41 : 1.09;
                lo[s] = bits[p][s] == 1 ? 1.09 : 1.41;
            }
            double pairDelayS = (p == 0 ? 0 : laneSkewPs[p - 1]) * 1e-12 + 1e-9;
            volts[2 * p] = waves.leg(hi, slotS, pairDelayS, 30e-12, 0.06, 700e6, 0.006);
            volts[2 * p + 1] = waves.leg(lo, slotS, pairDelayS + LEG_SKEW_PS[p] * 1e-12, 30e-12, 0.06, 700e6, 0.006);
        }
        LegWaves.writeCsv(file, RATE_HZ, legNames, volts);
    }
}
