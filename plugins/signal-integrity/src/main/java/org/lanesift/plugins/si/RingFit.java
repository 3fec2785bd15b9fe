package org.lanesift.plugins.si;

import java.util.Arrays;
import org.apache.commons.math3.exception.ConvergenceException;
import org.apache.commons.math3.exception.TooManyEvaluationsException;
import org.apache.commons.math3.exception.TooManyIterationsException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresProblem;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.MultivariateJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;

/**
 * Fits a damped sinusoid {@code v(t) = A exp(-alpha t) cos(omega t + phi) + c} to the samples after
 * an edge, starting at the first overshoot peak, with Apache Commons Math's Levenberg-Marquardt
 * optimiser. Start values come from the residual's zero crossings (period) and the decay of its
 * peaks (alpha). Internally time is in nanoseconds for good conditioning.
 */
final class RingFit {
    /** At most this many points go into one fit (longer tails are decimated evenly). */
    static final int MAX_POINTS = 4000;

    /**
     * The outcome of one fit.
     *
     * @param ok           whether a ring was found and fitted
     * @param reason       why not, when {@code ok} is false
     * @param startFs      time of the first fitted sample (the first peak)
     * @param ringHz       damped ring frequency omega / 2 pi
     * @param naturalHz    undamped natural frequency sqrt(omega^2 + alpha^2) / 2 pi
     * @param alphaPerS    decay rate, 1/s
     * @param zeta         damping ratio alpha / omega0
     * @param q            quality factor 1 / (2 zeta)
     * @param amplitudeVolts fitted amplitude at the first peak
     * @param offsetVolts  fitted final level
     * @param rSquared     coefficient of determination of the fit
     * @param points       points used
     */
    record Result(boolean ok, String reason, double startFs, double ringHz, double naturalHz, double alphaPerS, double zeta,
                  double q, double amplitudeVolts, double offsetVolts, double rSquared, int points) {
        static Result fail(String reason) {
            return new Result(false, reason, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                    Double.NaN, Double.NaN, Double.NaN, 0);
        }
    }

    private RingFit() {
    }

    /**
     * Fits the ring in {@code v[0..n)} sampled every {@code periodFs} from {@code startFs}.
     *
     * @param v        samples after the edge (from its far crossing on)
     * @param n        number of samples to use
     * @param startFs  time of {@code v[0]}
     * @param periodFs sample period
     * @param rising   whether the edge was rising (the first peak is then a maximum)
     * @param swing    signal swing, volts (for the minimum amplitude of a ring worth fitting)
     * @return the result
     */
    static Result fit(float[] v, int n, double startFs, double periodFs, boolean rising, double swing) {
        if (n < 16) {
            return Result.fail("fewer than 16 samples after the edge");
        }
        // final level: median of the last quarter
        float[] lastQ = Arrays.copyOfRange(v, n - Math.max(4, n / 4), n);
        Arrays.sort(lastQ);
        double c0 = lastQ[lastQ.length / 2];
        double s = rising ? 1 : -1;
        // first peak: the extreme between the first crossing beyond the final level and the next crossing back
        int i = 0;
        while (i < n && s * (v[i] - c0) <= 0) {
            i++;
        }
        // the crossing back, with a hysteresis of three times the noise (from the spread of the last
        // quarter about its median) so that noise near the level does not end the first lobe early
        double[] dev = new double[lastQ.length];
        for (int k = 0; k < dev.length; k++) {
            dev[k] = Math.abs(lastQ[k] - c0);
        }
        Arrays.sort(dev);
        double noise = 1.4826 * dev[dev.length / 2]; // median absolute deviation of a Gaussian (textbook)
        int j = i;
        while (j < n && s * (v[j] - c0) > -3 * noise) {
            j++;
        }
        if (i >= n || j >= n) {
            return Result.fail("no overshoot that comes back through the final level");
        }
        int p = i;
        for (int k = i; k < j; k++) {
            if (s * v[k] > s * v[p]) {
                p = k;
            }
        }
        double a0 = v[p] - c0;
        if (Math.abs(a0) < 0.01 * swing) {
            return Result.fail("overshoot below 1 % of the swing");
        }
        int m = n - p;
        int stride = Math.max(1, (m + MAX_POINTS - 1) / MAX_POINTS);
        int np = (m + stride - 1) / stride;
        double dtNs = periodFs * 1e-6;
        double[] t = new double[np];
        double[] y = new double[np];
        for (int k = 0; k < np; k++) {
            t[k] = k * stride * dtNs;
            y[k] = v[p + k * stride];
        }
        // zero crossings of the residual with hysteresis, for the period; peaks between them for the decay
        double hyst = Math.max(0.02 * Math.abs(a0), 1e-6);
        int sign = a0 > 0 ? 1 : -1;
        double firstCross = Double.NaN;
        double lastCross = Double.NaN;
        int crossings = 0;
        double peakT = 0;
        double peakA = Math.abs(a0);
        double sx = 0;
        double sy = 0;
        double sxx = 0;
        double sxy = 0;
        int npk = 0;
        for (int k = 1; k < np; k++) {
            double r = y[k] - c0;
            if (Math.abs(r) > peakA && Integer.signum((int) Math.signum(r)) == sign) {
                peakA = Math.abs(r);
                peakT = t[k];
            }
            if (sign * r < -hyst) {
                // crossed: interpolate the zero between k-1 and k (approximate)
                double r0 = y[k - 1] - c0;
                double tc = t[k - 1] + (r0 / (r0 - r)) * (t[k] - t[k - 1]);
                if (crossings == 0) {
                    firstCross = tc;
                }
                lastCross = tc;
                crossings++;
                sx += peakT;
                sy += Math.log(peakA);
                sxx += peakT * peakT;
                sxy += peakT * Math.log(peakA);
                npk++;
                sign = -sign;
                peakA = 0;
            }
        }
        if (crossings < 3) {
            return Result.fail("fewer than 3 zero crossings of the residual (no full ring cycle)");
        }
        double periodNs = 2 * (lastCross - firstCross) / (crossings - 1);
        double omega0 = 2 * Math.PI / periodNs;
        double alpha0 = npk >= 2 ? -(npk * sxy - sx * sy) / (npk * sxx - sx * sx) : 1 / (t[np - 1] + dtNs);
        if (!(alpha0 > 0) || !Double.isFinite(alpha0)) {
            alpha0 = 1 / (t[np - 1] + dtNs);
        }
        MultivariateJacobianFunction model = point -> {
            double a = point.getEntry(0);
            double al = point.getEntry(1);
            double w = point.getEntry(2);
            double ph = point.getEntry(3);
            double c = point.getEntry(4);
            double[] val = new double[np];
            double[][] jac = new double[np][5];
            for (int k = 0; k < np; k++) {
                double tk = t[k];
                double e = Math.exp(-al * tk);
                double cs = Math.cos(w * tk + ph);
                double sn = Math.sin(w * tk + ph);
                val[k] = a * e * cs + c;
                jac[k][0] = e * cs;
                jac[k][1] = -tk * a * e * cs;
                jac[k][2] = -a * e * tk * sn;
                jac[k][3] = -a * e * sn;
                jac[k][4] = 1;
            }
            return new Pair<RealVector, org.apache.commons.math3.linear.RealMatrix>(new ArrayRealVector(val, false),
                    new Array2DRowRealMatrix(jac, false));
        };
        LeastSquaresProblem problem = new LeastSquaresBuilder()
                .start(new double[] {a0, alpha0, omega0, 0, c0})
                .model(model)
                .target(y)
                .maxEvaluations(2000)
                .maxIterations(1000)
                .build();
        LeastSquaresOptimizer.Optimum opt;
        try {
            opt = new LevenbergMarquardtOptimizer().optimize(problem);
        } catch (TooManyEvaluationsException | TooManyIterationsException | ConvergenceException e) {
            return Result.fail("the fit did not converge (" + e.getClass().getSimpleName() + ")");
        }
        double[] q = opt.getPoint().toArray();
        double amp = q[0];
        double alpha = q[1];
        double omega = Math.abs(q[2]);
        double mean = 0;
        for (double yk : y) {
            mean += yk;
        }
        mean /= np;
        double ssTot = 0;
        for (double yk : y) {
            ssTot += (yk - mean) * (yk - mean);
        }
        double rms = opt.getRMS();
        double r2 = ssTot > 0 ? 1 - rms * rms * np / ssTot : Double.NaN;
        if (!(alpha > 0) || !(omega > 0) || !Double.isFinite(alpha) || !Double.isFinite(omega)) {
            return Result.fail("the fit gave no decaying oscillation");
        }
        if (!(r2 > 0.8)) {
            return Result.fail(String.format(java.util.Locale.ROOT, "poor fit (R^2 = %.2f)", r2));
        }
        double w0 = Math.sqrt(omega * omega + alpha * alpha);
        double zeta = alpha / w0;
        return new Result(true, "", startFs + p * periodFs, omega / (2 * Math.PI) * 1e9, w0 / (2 * Math.PI) * 1e9, alpha * 1e9,
                zeta, 1 / (2 * zeta), Math.abs(amp), q[4], r2, np);
    }
}
