package org.lanesift.examples.demo;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * Part (a) of the demo scenario: the invented "Siftlet-64" handheld meter drives its small
 * 64 x 40 colour panel over a 7:1 pixel link, 18-bit colour, one clock pair and three data pairs.
 * Every leg is probed single-ended and recorded by a scope at 2.5 GS/s (8 analog channels).
 *
 * <p>Link facts: slots 0..6 per pixel clock on each lane, lane 0 = G0 R5 R4 R3 R2 R1 R0,
 * lane 1 = B1 B0 G5 G4 G3 G2 G1, lane 2 = DE VS HS B5 B4 B3 B2, clock lane high in slots 0-1 and
 * 5-6 (the 18-bit mapping of JEIDA-59-1999 / VESA, as tabulated in docs/reference-facts.md#pixel-link-clock-and-slot-mappings).
 * Levels: LVDS, 350 mV differential swing around 1.2 V. HS and VS are active low, DE active high.
 *
 * <p>All numbers here are invented for the demo.
 */
public final class PixelLinkScene {
    /** Channel names in recording order. */
    public static final String[] CHANNELS = {"CLK_P", "CLK_N", "D0_P", "D0_N", "D1_P", "D1_N", "D2_P", "D2_N"};

    /** Video timing of the panel (pixels and lines). */
    public static final int H_ACTIVE = 64, H_FRONT = 8, H_SYNC = 8, H_BACK = 8, H_TOTAL = 88;
    /** Vertical timing in lines. */
    public static final int V_ACTIVE = 40, V_FRONT = 2, V_SYNC = 2, V_BACK = 4, V_TOTAL = 48;
    /** Pixel clock, Hz. */
    public static final double PIXEL_CLOCK_HZ = 20e6;
    /** The capture starts at this line of frame 0 (so frame 0 is partial). */
    public static final int FIRST_LINE = 30;
    /** Lines recorded. */
    public static final int LINES = 124;

    /** Skew of each pair against the clock pair, ps (lane 0, 1, 2); the clock pair is the reference. */
    public static final double[] LANE_SKEW_PS = {120, -80, 250};
    /** Skew of each N leg against its P leg, ps (clock, lane 0, 1, 2). */
    public static final double[] LEG_SKEW_PS = {30, -40, 55, 25};

    private static final double VOS = 1.2;
    private static final double HALF_VOD = 0.175;

    private PixelLinkScene() {
    }

    /**
     * The test picture of frame {@code k}: colour bars over a grey ramp, with a white square that
     * moves with the frame number. Colours are 6 bits per component, packed {@code R<<12 | G<<6 | B}.
     *
     * @param k frame number
     * @return {@code H_ACTIVE * V_ACTIVE} packed 18-bit colours
     */
    public static int[] picture(int k) {
        int[] px = new int[H_ACTIVE * V_ACTIVE];
        int[][] bars = {{63, 63, 63}, {63, 63, 0}, {0, 63, 63}, {0, 63, 0}, {63, 0, 63}, {63, 0, 0}, {0, 0, 63}, {0, 0, 0}};
        for (int y = 0; y < V_ACTIVE; y++) {
            for (int x = 0; x < H_ACTIVE; x++) {
                int r;
                int g;
                int b;
                if (y < 24) {
                    int[] c = bars[x / 8];
                    r = c[0];
                    g = c[1];
                    b = c[2];
                } else {
                    r = g = b = x * 63 / (H_ACTIVE - 1);
                    b = (b + y) & 63;
                }
                int sx = 4 + 6 * k;
                if (x >= sx && x < sx + 6 && y >= 28 && y < 34) {
                    r = g = b = 63;
                }
                px[y * H_ACTIVE + x] = (r << 12) | (g << 6) | b;
            }
        }
        return px;
    }

    /** What the capture contains, for checking a decode. */
    public record Truth(List<Integer> completeFrames, List<int[]> pictures, double pixelClockHz, double[] laneSkewPs,
                        double[] legSkewPs) {
    }

    /** The rendered capture. */
    public record Capture(String[] channels, float[][] volts, double sampleRateHz, Truth truth) {
    }

    /**
     * Renders the capture.
     *
     * @param imp impairments
     * @return 8 channels of volts and the ground truth
     */
    public static Capture render(Impairments imp) {
        return render(imp, FIRST_LINE, LINES, true);
    }

    /**
     * Renders a chosen stretch of the link.
     *
     * @param imp       impairments
     * @param firstLine line (counted from the start of frame 0) the record starts at
     * @param lines     lines recorded
     * @param pad       true: 50 ns of record before the first slot and after the last; false: the
     *                  record holds exactly the slots, so that copies of it can be laid end to end
     *                  (at 2.5 GS/s and 20 MHz a line is exactly 11000 samples)
     * @return the channels and the ground truth
     */
    public static Capture render(Impairments imp, int firstLine, int lines, boolean pad) {
        double uiFs = 1e15 / (PIXEL_CLOCK_HZ * 7);
        long t0 = pad ? 50_000_000L : 0L; // the first slot starts 50 ns into the record
        int pixels = lines * H_TOTAL;
        LegSynth.Track[] tracks = new LegSynth.Track[8];
        for (int c = 0; c < 8; c++) {
            boolean n = (c & 1) == 1;
            tracks[c] = new LegSynth.Track(VOS + (n ? -HALF_VOD : HALF_VOD)); // idle state: the clock's slot 6 is high
        }
        Random rnd = new Random(imp.seed());
        double[] laneSkew = {0, LANE_SKEW_PS[0], LANE_SKEW_PS[1], LANE_SKEW_PS[2]};
        List<Integer> complete = new ArrayList<>();
        List<int[]> pics = new ArrayList<>();
        int lastPicFrame = -1;
        int[] pic = null;
        int[][] slots = {{1, 1, 0, 0, 0, 1, 1}, new int[7], new int[7], new int[7]};
        for (int p = 0; p < pixels; p++) {
            int lineAbs = firstLine + p / H_TOTAL;
            int frame = lineAbs / V_TOTAL;
            int line = lineAbs % V_TOTAL;
            int col = p % H_TOTAL;
            if (frame != lastPicFrame) {
                pic = picture(frame);
                lastPicFrame = frame;
                if (line == 0 && col == 0 && (lines - p / H_TOTAL) >= V_TOTAL) {
                    complete.add(frame);
                    pics.add(pic);
                }
            }
            boolean de = line < V_ACTIVE && col < H_ACTIVE;
            boolean hs = !(col >= H_ACTIVE + H_FRONT && col < H_ACTIVE + H_FRONT + H_SYNC);
            boolean vs = !(line >= V_ACTIVE + V_FRONT && line < V_ACTIVE + V_FRONT + V_SYNC);
            int c = de ? pic[line * H_ACTIVE + col] : 0;
            int r = (c >> 12) & 63;
            int g = (c >> 6) & 63;
            int b = c & 63;
            // slot bits of this pixel, slot 0 first; lane 0 of the array is the clock lane (1100011)
            fill(slots[1], bit(g, 0), bit(r, 5), bit(r, 4), bit(r, 3), bit(r, 2), bit(r, 1), bit(r, 0));
            fill(slots[2], bit(b, 1), bit(b, 0), bit(g, 5), bit(g, 4), bit(g, 3), bit(g, 2), bit(g, 1));
            fill(slots[3], de ? 1 : 0, vs ? 1 : 0, hs ? 1 : 0, bit(b, 5), bit(b, 4), bit(b, 3), bit(b, 2));
            for (int s = 0; s < 7; s++) {
                long slotIndex = 7L * p + s;
                double tIdeal = t0 + slotIndex * uiFs;
                double common = rnd.nextGaussian() * imp.randomJitterRmsPs() * 1000
                        + imp.periodicJitterPs() * 1000 * Math.sin(2 * Math.PI * imp.periodicJitterHz() * tIdeal * 1e-15);
                for (int lane = 0; lane < 4; lane++) {
                    double t = tIdeal + common + rnd.nextGaussian() * imp.laneJitterRmsPs() * 1000 + laneSkew[lane] * 1000;
                    boolean one = slots[lane][s] == 1;
                    tracks[2 * lane].to(Math.round(t), VOS + (one ? HALF_VOD : -HALF_VOD), LegSynth.FAST);
                    tracks[2 * lane + 1].to(Math.round(t + LEG_SKEW_PS[lane] * 1000), VOS + (one ? -HALF_VOD : HALF_VOD),
                            LegSynth.FAST);
                }
            }
        }
        double periodFs = 1e15 / imp.sampleRateHz();
        long endFs = t0 + Math.round(7L * pixels * uiFs) + (pad ? 50_000_000L : 0L);
        int n = pad ? (int) Math.ceil(endFs / periodFs) : (int) Math.round(endFs / periodFs);
        LegSynth synth = new LegSynth(imp.ringFrequencyHz(), imp.ringDamping(), 2e6);
        float[][] volts = new float[8][];
        for (int c = 0; c < 8; c++) {
            LegSynth.Track tr = tracks[c];
            volts[c] = synth.render(tr.t, tr.v, tr.k, tr.n, tr.initial, 0, periodFs, n, imp.instrumentBandwidthHz(),
                    imp.noiseRmsVolts(), imp.commonModeOffsetVolts(), new Random(imp.seed() * 31 + c));
        }
        Truth truth = new Truth(complete, pics, PIXEL_CLOCK_HZ, LANE_SKEW_PS.clone(), LEG_SKEW_PS.clone());
        return new Capture(CHANNELS.clone(), volts, imp.sampleRateHz(), truth);
    }

    private static void fill(int[] a, int s0, int s1, int s2, int s3, int s4, int s5, int s6) {
        a[0] = s0;
        a[1] = s1;
        a[2] = s2;
        a[3] = s3;
        a[4] = s4;
        a[5] = s5;
        a[6] = s6;
    }

    private static int bit(int v, int i) {
        return (v >> i) & 1;
    }
}
