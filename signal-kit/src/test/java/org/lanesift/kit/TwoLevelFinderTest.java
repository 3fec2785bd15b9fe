package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class TwoLevelFinderTest {
    /**
     * A random NRZ data line with tanh-shaped edges, Gaussian noise and quantisation to an ADC
     * code step, as a scope would record it.
     */
    static float[] nrz(double lowVolts, double highVolts, double uiSeconds, double sampleSeconds, double riseSeconds,
                       double noiseVolts, double stepVolts, int n, long seed) {
        Random r = new Random(seed);
        float[] v = new float[n];
        boolean prev = false;
        boolean cur = r.nextBoolean();
        int bit = 0;
        for (int i = 0; i < n; i++) {
            double t = i * sampleSeconds;
            int b = (int) (t / uiSeconds);
            while (bit < b) {
                prev = cur;
                cur = r.nextBoolean();
                bit++;
            }
            double since = t - b * uiSeconds;
            double from = prev ? highVolts : lowVolts;
            double to = cur ? highVolts : lowVolts;
            // common practice: a tanh edge whose 10-90 % time is about 1.1 time constants wide on each side
            double x = 0.5 * (1 + Math.tanh((since - riseSeconds) / (riseSeconds / 2.2)));
            double val = from + (to - from) * x + noiseVolts * r.nextGaussian();
            v[i] = (float) (stepVolts > 0 ? stepVolts * Math.rint(val / stepVolts) : val);
        }
        return v;
    }

    @ParameterizedTest
    @ValueSource(doubles = {200e6, 225e6, 250e6})
    void quantisedPacketLinkLevelsWithinAFewMillivolts(double clockHz) {
        // a symmetric -0.21 / +0.19 V data line clocked on both edges at 200-250 MHz, sampled at
        // 10 GS/s by an ADC with 2 mV codes (the case a peak-bin finder read as -0.289 / +0.203 V)
        float[] v = nrz(-0.21, 0.19, 0.5 / clockHz, 100e-12, 250e-12, 0.003, 0.002, 50_000, 7);
        TwoLevels lv = TwoLevelFinder.find(v, v.length);
        assertTrue(lv.twoLevels());
        assertEquals(-0.21, lv.low(), 0.003);
        assertEquals(0.19, lv.high(), 0.003);
        assertEquals(-0.01, lv.mid(), 0.003);
    }

    @ParameterizedTest
    @ValueSource(doubles = {0.0005, 0.001, 0.002, 0.004, 0.008})
    void resultDoesNotDependOnTheCodeStep(double stepVolts) {
        float[] v = nrz(-0.175, 0.175, 2.2e-9, 200e-12, 300e-12, 0.002, stepVolts, 40_000, 11);
        TwoLevels lv = TwoLevelFinder.find(v, v.length);
        assertTrue(lv.twoLevels());
        // within half a code step plus noise and edge effects
        assertEquals(-0.175, lv.low(), stepVolts / 2 + 0.002);
        assertEquals(0.175, lv.high(), stepVolts / 2 + 0.002);
    }

    @Test
    void oneNoisyLevelIsNotTwo() {
        Random r = new Random(3);
        float[] v = new float[20_000];
        for (int i = 0; i < v.length; i++) {
            v[i] = (float) (1.2 + 0.01 * r.nextGaussian());
        }
        TwoLevels lv = TwoLevelFinder.find(v, v.length);
        assertFalse(lv.twoLevels());
        assertEquals(lv.min(), lv.low());
        assertEquals(lv.max(), lv.high());
    }

    @Test
    void aRampIsNotTwoLevels() {
        float[] v = new float[10_001];
        for (int i = 0; i < v.length; i++) {
            v[i] = i * 1e-4f;
        }
        assertFalse(TwoLevelFinder.find(v, v.length).twoLevels());
    }

    @Test
    void aSineWaveHasItsCrestsAsLevels() {
        float[] v = new float[9_973];
        for (int i = 0; i < v.length; i++) {
            v[i] = (float) (0.3 + 0.2 * Math.sin(2 * Math.PI * i / 97.3));
        }
        TwoLevels lv = TwoLevelFinder.find(v, v.length);
        assertTrue(lv.twoLevels());
        // a sine's two crests are found symmetric about its centre, between the crest mean over the half-wave
        // (2/pi of the amplitude) and the amplitude
        assertEquals(lv.high() - 0.3, 0.3 - lv.low(), 2e-4);
        assertTrue(lv.high() - 0.3 > 0.2 * 2 / Math.PI && lv.high() - 0.3 < 0.2, "crest " + lv.high());
        assertEquals(0.3, lv.mid(), 1e-4);
    }

    @Test
    void rarePulsesAndSpikesAreHandled() {
        float[] v = new float[10_000];
        for (int i = 0; i < v.length; i++) {
            v[i] = (i % 50) < 2 ? 1f : 0f; // 4 % high
        }
        v[17] = 40f; // one spike far off
        TwoLevels lv = TwoLevelFinder.find(v, v.length);
        assertTrue(lv.twoLevels());
        assertEquals(0.0, lv.low(), 1e-9);
        assertEquals(1.0, lv.high(), 1e-9);
    }

    @Test
    void medianMinAndMaxAgainstASort() {
        Random r = new Random(5);
        for (int n : new int[] {1, 2, 3, 10, 1001}) {
            float[] v = new float[n];
            for (int i = 0; i < n; i++) {
                v[i] = r.nextFloat();
            }
            float[] s = v.clone();
            java.util.Arrays.sort(s);
            TwoLevels lv = TwoLevelFinder.find(v, n);
            assertEquals(s[0], lv.min());
            assertEquals(s[n - 1], lv.max());
            double median = n % 2 == 1 ? s[n / 2] : (s[n / 2 - 1] + (double) s[n / 2]) / 2;
            assertEquals(median, lv.median(), 1e-12);
        }
    }

    @Test
    void nonFiniteSamplesAreSkippedAndNoneGivesNaN() {
        float[] v = {Float.NaN, 0f, 1f, Float.POSITIVE_INFINITY, 0f, 1f, 0f, 1f};
        TwoLevels lv = TwoLevelFinder.find(v, v.length);
        assertEquals(0.0, lv.min());
        assertEquals(1.0, lv.max());
        TwoLevels none = TwoLevelFinder.find(new float[] {Float.NaN}, 1);
        assertFalse(none.twoLevels());
        assertTrue(Double.isNaN(none.low()));
    }
}
