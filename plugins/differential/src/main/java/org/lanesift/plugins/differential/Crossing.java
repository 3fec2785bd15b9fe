package org.lanesift.plugins.differential;

/**
 * Sub-sample position of a threshold crossing between two samples, in sample periods.
 *
 * <p>Samples are at integer positions; the crossing lies between position 0 (value {@code y1}) and
 * position 1 (value {@code y2}), where {@code y1} and {@code y2} lie on opposite sides of (or on)
 * the level. The linear estimate is the straight line through the two samples. The cubic estimate
 * fits the Lagrange polynomial through four samples at positions -1, 0, 1 and 2 and solves it for
 * the level with a Newton iteration kept inside the bracketing interval by bisection.
 */
final class Crossing {
    private Crossing() {
    }

    /**
     * Linear interpolation.
     *
     * @param y1    value at position 0
     * @param y2    value at position 1
     * @param level the level crossed
     * @return position in [0, 1]
     */
    static double linear(double y1, double y2, double level) {
        double den = y2 - y1;
        if (den == 0) {
            return 0;
        }
        double f = (level - y1) / den;
        return f < 0 ? 0 : (f > 1 ? 1 : f);
    }

    /**
     * Cubic interpolation over four samples.
     *
     * @param y0    value at position -1
     * @param y1    value at position 0
     * @param y2    value at position 1
     * @param y3    value at position 2
     * @param level the level crossed between positions 0 and 1
     * @return position in [0, 1]
     */
    static double cubic(double y0, double y1, double y2, double y3, double level) {
        // p(x) = y1 + x (c1 + x (c2 + x c3)), the Lagrange cubic through (-1,y0) (0,y1) (1,y2) (2,y3)
        double c1 = -y0 / 3 - y1 / 2 + y2 - y3 / 6;
        double c2 = (y0 + y2) / 2 - y1;
        double c3 = (y3 - y0) / 6 + (y1 - y2) / 2;
        double g0 = y1 - level;
        double g1 = y2 - level;
        if (g0 == 0) {
            return 0;
        }
        if (g1 == 0) {
            return 1;
        }
        if ((g0 < 0) == (g1 < 0)) {
            return linear(y1, y2, level);
        }
        boolean rising = g0 < 0;
        double lo = 0;
        double hi = 1;
        double x = linear(y1, y2, level);
        for (int it = 0; it < 40; it++) {
            double g = y1 - level + x * (c1 + x * (c2 + x * c3));
            if (g == 0) {
                return x;
            }
            if ((g < 0) == rising) {
                lo = x;
            } else {
                hi = x;
            }
            double dg = c1 + x * (2 * c2 + x * 3 * c3);
            double nx = dg != 0 ? x - g / dg : Double.NaN;
            if (!(nx > lo && nx < hi)) {
                nx = 0.5 * (lo + hi);
            }
            if (Math.abs(nx - x) < 1e-12 || hi - lo < 1e-12) {
                return nx;
            }
            x = nx;
        }
        return x;
    }
}
