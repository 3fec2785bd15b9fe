package org.lanesift.plugins.si;

import java.util.Locale;

/**
 * Preferred number series for resistors of IEC 60063: E12 and E24 as tabulated there (two
 * significant figures; several E24 values differ from the rounded geometric series), E96 as the
 * geometric series {@code 10^(i/96)} rounded to three significant figures, which is how its values
 * are defined. Values are the mantissas in one decade, 100 to 999 (E12/E24 times ten).
 */
enum ESeries {
    /** 12 values per decade (about 10 % steps). */
    E12(new int[] {100, 120, 150, 180, 220, 270, 330, 390, 470, 560, 680, 820}),
    /** 24 values per decade (about 5 % steps). */
    E24(new int[] {100, 110, 120, 130, 150, 160, 180, 200, 220, 240, 270, 300, 330, 360, 390, 430, 470, 510, 560, 620,
        680, 750, 820, 910}),
    /** 96 values per decade (about 1 % steps). */
    E96(geometric(96));

    private final int[] mantissas;

    ESeries(int[] mantissas) {
        this.mantissas = mantissas;
    }

    private static int[] geometric(int n) {
        int[] m = new int[n];
        for (int i = 0; i < n; i++) {
            m[i] = (int) Math.round(100 * Math.pow(10, (double) i / n));
        }
        return m;
    }

    /** The mantissas of one decade, 100..999. */
    int[] mantissas() {
        return mantissas.clone();
    }

    static ESeries parse(String s) {
        for (ESeries e : values()) {
            if (e.name().equalsIgnoreCase(s.trim())) {
                return e;
            }
        }
        throw new IllegalArgumentException("expected E12, E24 or E96, got '" + s + "'");
    }

    /**
     * The series value nearest to {@code ohms} on a logarithmic scale, and its neighbours.
     *
     * @param ohms a positive resistance
     * @return {below or equal, above or equal, nearest}
     */
    double[] snap(double ohms) {
        if (!(ohms > 0) || !Double.isFinite(ohms)) {
            throw new IllegalArgumentException("resistance must be positive, got " + ohms);
        }
        int decade = (int) Math.floor(Math.log10(ohms)) - 2;
        double below = Double.NaN;
        double above = Double.NaN;
        for (int d = decade - 1; d <= decade + 1; d++) {
            for (int m : mantissas) {
                double v = Double.parseDouble(String.format(Locale.ROOT, "%de%d", m, d)); // exact decimal, no 10^d rounding
                if (v <= ohms * (1 + 1e-12) && (Double.isNaN(below) || v > below)) {
                    below = v;
                }
                if (v >= ohms * (1 - 1e-12) && (Double.isNaN(above) || v < above)) {
                    above = v;
                }
            }
        }
        double nearest = Math.log(ohms / below) <= Math.log(above / ohms) ? below : above;
        return new double[] {below, above, nearest};
    }
}
