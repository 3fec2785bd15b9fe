package org.lanesift.plugins.si;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Periodic jitter (PJ) from the spectral lines of the TIE sequence (TIE against edge number): the
 * peak-to-peak deterministic jitter that a dual-Dirac fit does not give. A sinusoid's values crowd
 * near its extremes and are rounded off by random jitter, so the Dirac separation fitted to the
 * tails lies below its peak-to-peak (docs/reference-facts.md#jitter-under-the-dual-dirac-model);
 * its lines in the spectrum give the peak-to-peak itself.
 *
 * <p>Method (textbook spectral estimation): the TIE values are placed by edge number (a missing
 * edge counts as 0), the mean removed, a Hann window applied and the power spectrum taken by FFT.
 * The strongest bin that is a local maximum and at least {@link #LINE_FACTOR} times the median bin
 * power (white random jitter exceeds that in a bin with probability about 2^-30) is a line: its
 * frequency is refined by maximising the least-squares sinusoid fit within one bin either side,
 * the fitted sinusoid is subtracted from the sequence, and the search repeats, up to
 * {@link #MAX_TONES} lines. PJ(p-p) is the peak-to-peak of the sum of the fitted sinusoids over
 * the sequence; the residual RMS is what is left (random jitter and non-periodic deterministic
 * jitter). Units: those of the input (the plugin uses picoseconds).
 */
final class PeriodicJitter {
    /** Most lines fitted. */
    static final int MAX_TONES = 8;
    /** A line's power over the median bin power, at least. */
    static final double LINE_FACTOR = 30;
    /** Longest sequence analysed (a power of two). */
    static final int MAX_POINTS = 1 << 18;
    /** Shortest sequence analysed. */
    static final int MIN_POINTS = 256;

    /**
     * One line.
     *
     * @param cyclesPerEdge frequency, in cycles per analysed edge interval
     * @param amplitude     half its peak-to-peak
     */
    record Tone(double cyclesPerEdge, double amplitude) {
    }

    /**
     * The result.
     *
     * @param tones       the lines found, strongest first
     * @param peakToPeak  peak-to-peak of their sum over the sequence (0 without lines, NaN when not analysed)
     * @param residualRms RMS of the sequence with the lines removed (NaN when not analysed)
     * @param points      length of the sequence analysed
     */
    record Result(List<Tone> tones, double peakToPeak, double residualRms, int points) {
    }

    private PeriodicJitter() {
    }

    /**
     * Finds the lines.
     *
     * @param tie    TIE of each edge
     * @param number interval number of each edge, increasing
     * @param n      how many edges
     * @return the result
     */
    static Result of(double[] tie, long[] number, int n) {
        long span = n < 2 || number.length < n || tie.length < n ? 0 : number[n - 1] - number[0] + 1;
        if (span < MIN_POINTS) {
            return new Result(List.of(), Double.NaN, Double.NaN, 0);
        }
        int len = Integer.highestOneBit((int) Math.min(span, MAX_POINTS));
        double[] x = new double[len];
        boolean[] present = new boolean[len];
        int count = 0;
        double mean = 0;
        for (int i = 0; i < n; i++) {
            long k = number[i] - number[0];
            if (k >= len) {
                break;
            }
            x[(int) k] = tie[i];
            present[(int) k] = true;
            mean += tie[i];
            count++;
        }
        mean /= Math.max(1, count);
        for (int k = 0; k < len; k++) {
            x[k] = present[k] ? x[k] - mean : 0;
        }
        double[] periodic = new double[len];
        List<Tone> tones = new ArrayList<>();
        FastFourierTransformer fft = new FastFourierTransformer(DftNormalization.STANDARD);
        double[] w = new double[len];
        double[] hann = new double[len];
        for (int k = 0; k < len; k++) {
            hann[k] = 0.5 - 0.5 * Math.cos(2 * Math.PI * k / len);
        }
        while (tones.size() < MAX_TONES) {
            for (int k = 0; k < len; k++) {
                w[k] = x[k] * hann[k];
            }
            org.apache.commons.math3.complex.Complex[] spec = fft.transform(w, TransformType.FORWARD);
            int half = len / 2;
            double[] power = new double[half];
            for (int k = 1; k < half; k++) {
                power[k] = spec[k].getReal() * spec[k].getReal() + spec[k].getImaginary() * spec[k].getImaginary();
            }
            double[] sorted = Arrays.copyOfRange(power, 1, half);
            Arrays.sort(sorted);
            double median = sorted[sorted.length / 2];
            int best = -1;
            for (int k = 2; k < half - 1; k++) {
                if (power[k] > LINE_FACTOR * median && power[k] >= power[k - 1] && power[k] >= power[k + 1]
                        && (best < 0 || power[k] > power[best])) {
                    best = k;
                }
            }
            if (best < 0) {
                break;
            }
            double f = refine(x, present, (double) best / len, 1.0 / len);
            double[] ab = fit(x, present, f);
            double amp = Math.hypot(ab[0], ab[1]);
            for (int k = 0; k < len; k++) {
                double s = ab[0] * Math.cos(2 * Math.PI * f * k) + ab[1] * Math.sin(2 * Math.PI * f * k);
                periodic[k] += s;
                if (present[k]) {
                    x[k] -= s;
                }
            }
            tones.add(new Tone(f, amp));
        }
        double lo = 0;
        double hi = 0;
        for (int k = 0; k < len; k++) {
            lo = Math.min(lo, periodic[k]);
            hi = Math.max(hi, periodic[k]);
        }
        double ss = 0;
        for (int k = 0; k < len; k++) {
            ss += present[k] ? x[k] * x[k] : 0;
        }
        return new Result(List.copyOf(tones), tones.isEmpty() ? 0 : hi - lo, Math.sqrt(ss / Math.max(1, count)), len);
    }

    /** The frequency within {@code f0 +- df} where the least-squares sinusoid is largest (golden-section search). */
    private static double refine(double[] x, boolean[] present, double f0, double df) {
        double g = (Math.sqrt(5) - 1) / 2;
        double a = f0 - df;
        double b = f0 + df;
        double c = b - g * (b - a);
        double d = a + g * (b - a);
        double fc = power(x, present, c);
        double fd = power(x, present, d);
        for (int i = 0; i < 40; i++) {
            if (fc > fd) {
                b = d;
                d = c;
                fd = fc;
                c = b - g * (b - a);
                fc = power(x, present, c);
            } else {
                a = c;
                c = d;
                fc = fd;
                d = a + g * (b - a);
                fd = power(x, present, d);
            }
        }
        return (a + b) / 2;
    }

    private static double power(double[] x, boolean[] present, double f) {
        double[] ab = fit(x, present, f);
        return ab[0] * ab[0] + ab[1] * ab[1];
    }

    /** Least squares x = a cos(2 pi f k) + b sin(2 pi f k) over the present points: {a, b}. */
    private static double[] fit(double[] x, boolean[] present, double f) {
        double cc = 0;
        double ss = 0;
        double cs = 0;
        double xc = 0;
        double xs = 0;
        double cd = Math.cos(2 * Math.PI * f);
        double sd = Math.sin(2 * Math.PI * f);
        double c = 1;
        double s = 0;
        for (int k = 0; k < x.length; k++) {
            if (k % 1024 == 0) { // exact restart: the rotation below drifts slowly
                c = Math.cos(2 * Math.PI * f * k);
                s = Math.sin(2 * Math.PI * f * k);
            }
            double cn = c * cd - s * sd;
            double sn = s * cd + c * sd;
            if (!present[k]) {
                c = cn;
                s = sn;
                continue;
            }
            cc += c * c;
            ss += s * s;
            cs += c * s;
            xc += x[k] * c;
            xs += x[k] * s;
            c = cn;
            s = sn;
        }
        double det = cc * ss - cs * cs;
        if (!(Math.abs(det) > 0)) {
            return new double[] {0, 0};
        }
        return new double[] {(xc * ss - xs * cs) / det, (xs * cc - xc * cs) / det};
    }
}
