package org.lanesift.plugins.differential;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The interpolators alone, against exact crossings worked out by hand (mathematics). */
class CrossingTest {
    @Test
    void linearIsExactOnARamp() {
        // mathematics: y = 0.2 x - 0.05 crosses 0 at x = 0.25
        assertEquals(0.25, Crossing.linear(-0.05, 0.15, 0.0), 1e-15);
        // falling ramp y = 0.3 - 0.4 x crosses 0.1 at x = 0.5
        assertEquals(0.5, Crossing.linear(0.3, -0.1, 0.1), 1e-15);
        // a level on the first sample is crossed at 0
        assertEquals(0.0, Crossing.linear(0.1, 0.5, 0.1), 0);
    }

    @Test
    void cubicReproducesACubicExactly() {
        // mathematics: a four-point Lagrange interpolant reproduces any cubic; p(x) = (x - 0.3)(x + 2)(x - 4) has its
        // root in [0, 1] at exactly 0.3
        java.util.function.DoubleUnaryOperator p = x -> (x - 0.3) * (x + 2) * (x - 4);
        double r = Crossing.cubic(p.applyAsDouble(-1), p.applyAsDouble(0), p.applyAsDouble(1), p.applyAsDouble(2), 0);
        assertEquals(0.3, r, 1e-12);
        // and the same cubic against a non-zero level: p(x) = p(0.7)
        double level = p.applyAsDouble(0.7);
        r = Crossing.cubic(p.applyAsDouble(-1), p.applyAsDouble(0), p.applyAsDouble(1), p.applyAsDouble(2), level);
        assertEquals(0.7, r, 1e-12);
    }

    @Test
    void cubicBeatsLinearOnASineAwayFromItsInflection() {
        // mathematics: sin(w x + phi) = 0.5 at w x + phi = asin(0.5) = pi/6; sample at 8 points per cycle
        double w = 2 * Math.PI / 8;
        double phi = Math.PI / 6 - w * 0.4; // crossing of 0.5 at x = 0.4
        double[] y = new double[4];
        for (int i = 0; i < 4; i++) {
            y[i] = Math.sin(w * (i - 1) + phi);
        }
        double cub = Crossing.cubic(y[0], y[1], y[2], y[3], 0.5);
        double lin = Crossing.linear(y[1], y[2], 0.5);
        assertEquals(0.4, cub, 1e-2); // 8 samples per cycle is coarse: the cubic is within 1 % of a sample
        assertTrue(Math.abs(cub - 0.4) < Math.abs(lin - 0.4), "cubic " + cub + " should be closer than linear " + lin);
    }
}
