package org.lanesift.plugins.deskew;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.lanesift.data.AnalogBlock;

/**
 * Which outputs of {@link AnalogDelayLine} are marked invalid, against a direct statement of the
 * rule over seeded inputs: output {@code n} is invalid exactly when an input its kernel reads
 * ({@code n + fl + lo .. n + fl + hi}) is marked invalid or is not finite. The inputs mix long
 * clean stretches (where the delay line keeps no invalid flags) with sparse invalid bits, NaN and
 * infinities, in random block splits, so marks made after many clean blocks are checked too.
 */
class InvalidMarkingTest {
    static final double PERIOD_FS = 400_000;

    @Test
    void invalidOutputsAreExactlyThoseWhoseKernelReadsABadInput() {
        int checked = 0;
        for (long seed = 1; seed <= 300; seed++) {
            Random r = new Random(seed);
            int len = 2000 + r.nextInt(6000);
            float[] x = new float[len];
            boolean[] badIn = new boolean[len];
            long[] invAll = new long[(len + 63) / 64];
            int cleanUntil = r.nextInt(len); // nothing bad before this sample
            for (int i = 0; i < len; i++) {
                x[i] = (float) Math.sin(i * 0.21 + seed);
                if (i >= cleanUntil && r.nextInt(400) == 0) {
                    badIn[i] = true;
                    switch (r.nextInt(3)) {
                        case 0 -> x[i] = Float.NaN;
                        case 1 -> x[i] = r.nextBoolean() ? Float.POSITIVE_INFINITY : Float.NEGATIVE_INFINITY;
                        default -> invAll[i >>> 6] |= 1L << i;
                    }
                }
            }
            double delay = (r.nextDouble() - 0.5) * 6;
            if (seed % 10 == 0) {
                delay = Math.rint(delay) + 0.5; // half a sample
            }
            List<AnalogBlock> got = new ArrayList<>();
            AnalogDelayLine line = new AnalogDelayLine(DelayKernel.SINC, delay, got::add);
            int at = 0;
            while (at < len) {
                int end = Math.min(len, at + 1 + r.nextInt(r.nextBoolean() ? 50 : 2500));
                int n = end - at;
                float[] v = java.util.Arrays.copyOfRange(x, at, end);
                long[] inv = null;
                for (int i = 0; i < n; i++) {
                    if ((invAll[(at + i) >>> 6] & (1L << (at + i))) != 0) {
                        if (inv == null) {
                            inv = new long[(n + 63) / 64];
                        }
                        inv[i >>> 6] |= 1L << i;
                    }
                }
                line.accept(new AnalogBlock("v", at, Math.round(at * PERIOD_FS), PERIOD_FS, v, n, inv));
                at = end;
            }
            line.finish();
            double a = -delay;
            int fl = (int) Math.floor(a);
            int lo = -DelayKernel.SINC.half + 1;
            int hi = DelayKernel.SINC.half;
            for (AnalogBlock b : got) {
                for (int i = 0; i < b.length(); i++) {
                    long k = b.firstIndex() + i;
                    boolean expect = false;
                    for (long j = k + fl + lo; j <= k + fl + hi; j++) {
                        expect |= badIn[(int) j];
                    }
                    assertEquals(expect, !b.isValid(i), "seed " + seed + ", output " + k + " (delay " + delay + ")");
                    assertTrue(Float.isFinite(b.volts()[i]), "seed " + seed + ", output " + k + " is " + b.volts()[i]);
                    checked++;
                }
            }
        }
        assertTrue(checked > 300 * 1500, "outputs checked: " + checked);
    }
}
