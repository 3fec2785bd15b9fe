package org.lanesift.dist.sift;

import java.util.Random;

/**
 * The {@link PixelLinkCapture} link (a repeating picture) as a logic analyser sees it: each lane
 * sampled at the capture's rate, a sample reading the slot in force at its time minus the lane's
 * delay, with Gaussian jitter on the sample time standing in for edge noise. The picture
 * repeats every frame, so any time of the link can be sampled (times wrap by whole frames).
 */
final class LogicLink {
    static final double UI_S = 1 / PixelLinkCapture.PIXEL_CLOCK_HZ / 7;
    static final int FRAME_SLOTS = 7 * PixelLinkCapture.H_TOTAL * PixelLinkCapture.V_TOTAL;
    static final double FRAME_S = FRAME_SLOTS * UI_S;

    final PixelLinkCapture gen = new PixelLinkCapture();
    /** Clock, then lanes 0 to 2, one bit per slot. */
    final int[][] bits;

    LogicLink(long seed) {
        bits = gen.slotBits(seed, true);
    }

    /**
     * One lane sampled.
     *
     * @param lane     0 clock, 1 to 3 data lanes 0 to 2
     * @param startS   link time of sample 0 (slot 0 of the generator starts at 0)
     * @param rateHz   samples per second
     * @param n        samples
     * @param delayS   the lane's delay (probe and trace skew)
     * @param jitterS  standard deviation of the timing noise
     * @param rnd      noise source
     * @return one level per sample
     */
    boolean[] sample(int lane, double startS, double rateHz, int n, double delayS, double jitterS, Random rnd) {
        boolean[] out = new boolean[n];
        for (int i = 0; i < n; i++) {
            double t = startS + i / rateHz - delayS + jitterS * rnd.nextGaussian();
            long slot = (long) Math.floor(t / UI_S);
            out[i] = bits[lane][(int) Math.floorMod(slot, (long) FRAME_SLOTS)] == 1;
        }
        return out;
    }

    /** Packs channels into logic8 bytes: channel k goes to bit {@code bitOf[k]}; {@code fill} sets the other bits. */
    static byte[] logic8(boolean[][] channels, int[] bitOf, Random fill) {
        int n = channels[0].length;
        byte[] b = new byte[n];
        fill.nextBytes(b);
        for (int k = 0; k < channels.length; k++) {
            int m = 1 << bitOf[k];
            for (int i = 0; i < n; i++) {
                b[i] = (byte) (channels[k][i] ? b[i] | m : b[i] & ~m);
            }
        }
        return b;
    }

    /**
     * One lane as a scope channel on its P leg sees it: 1.25 V +/- 175 mV (inside the LVDS offset and
     * swing ranges, docs/reference-facts.md#lvds-electrical-levels), each transition a linear ramp of
     * {@code riseS}, Gaussian voltage noise.
     */
    float[] leg(int lane, double startS, double rateHz, int n, double delayS, double riseS, double noiseVolts, Random rnd) {
        float[] out = new float[n];
        for (int i = 0; i < n; i++) {
            double t = startS + i / rateHz - delayS;
            long slot = (long) Math.floor(t / UI_S);
            double into = t - slot * UI_S;
            int now = bits[lane][(int) Math.floorMod(slot, (long) FRAME_SLOTS)];
            int before = bits[lane][(int) Math.floorMod(slot - 1, (long) FRAME_SLOTS)];
            double level = into < riseS ? before + (now - before) * into / riseS : now;
            out[i] = (float) (1.25 + 0.35 * (level - 0.5) + noiseVolts * rnd.nextGaussian());
        }
        return out;
    }
}
