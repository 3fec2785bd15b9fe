package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;
import org.lanesift.testkit.Synth;

/**
 * The segmented FFT correlation (Apache Commons Math FastFourierTransformer) against the
 * definition of the cross-correlation summed directly, r(k) = sum_i p[i] q[i + k].
 */
class LegsEstimatorTest {

    @Test
    void fftSegmentsMatchTheDirectSum() {
        AnalogBlock[] pn = LinkSynth.legs(6000, 1_000_000, 10e9, 250_000, 231_000, 20_000, 0.005, 11);
        int maxLag = 25;
        LegsEstimator est = new LegsEstimator(maxLag);
        for (AnalogBlock b : Synth.split(pn[0], 7001)) {
            est.p(b);
        }
        for (AnalogBlock b : Synth.split(pn[1], 5003)) {
            est.n(b);
        }
        est.finish();
        double[] fft = est.correlation();
        float[] p = pn[0].volts();
        float[] n = pn[1].volts();
        int len = Math.min(p.length, n.length);
        double mp = 0;
        double mq = 0;
        for (int i = 0; i < len; i++) {
            mp += p[i];
            mq -= n[i];
        }
        mp /= len;
        mq /= len;
        double[] direct = new double[2 * maxLag + 1];
        for (int k = -maxLag; k <= maxLag; k++) {
            double s = 0;
            for (int i = maxLag; i < len - maxLag; i++) {
                s += (p[i] - mp) * (-n[i + k] - mq);
            }
            direct[k + maxLag] = s;
        }
        double peak = 0;
        for (double d : direct) {
            peak = Math.max(peak, Math.abs(d));
        }
        for (int j = 0; j < direct.length; j++) {
            assertEquals(direct[j] / peak, fft[j] / peak, 2e-3, "lag " + (j - maxLag));
        }
        // the sub-sample peak: 231 ps at 100 ps per sample
        LegsEstimator.Result r = est.result();
        assertEquals(2.31, r.lagSamples(), 0.05);
        assertTrue(r.correlation() > 0.95);
        assertEquals(len - 2 * maxLag, r.samples());
    }

    @Test
    void commonModeStepsDoNotPullTheEstimate() {
        // a lane that leaves high speed for low-power states: both legs move by 1 V together, slowly,
        // every 3000 samples (the D-PHY pattern of LP-11 between bursts; levels from docs/reference-facts.md#d-phy-levels-and-states)
        AnalogBlock[] pn = LinkSynth.legs(60000, 1_000_000, 10e9, 250_000, 231_000, 20_000, 0.005, 11);
        float[] p = pn[0].volts().clone();
        float[] n = pn[1].volts().clone();
        double cm = 0;
        for (int i = 0; i < p.length; i++) {
            double target = (i / 3000) % 2 == 0 ? 0 : 1.0;
            cm += (target - cm) * 0.02;
            p[i] += (float) cm;
            n[i] += (float) cm;
        }
        LegsEstimator est = new LegsEstimator(25);
        est.p(new AnalogBlock("P", 0, 0, pn[0].periodFs(), p, p.length, null));
        est.n(new AnalogBlock("N", 0, 0, pn[1].periodFs(), n, n.length, null));
        est.finish();
        LegsEstimator.Result r = est.result();
        assertEquals(2.31, r.lagSamples(), 0.1, "231 ps at 100 ps per sample: within 1 % of the 1 ns UI");
        org.junit.jupiter.api.Assertions.assertTrue(r.correlation() > 0.5, "confident: " + r.correlation());
    }
}
