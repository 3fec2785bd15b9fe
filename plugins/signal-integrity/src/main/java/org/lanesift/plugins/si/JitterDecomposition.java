package org.lanesift.plugins.si;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.apache.commons.math3.distribution.NormalDistribution;

/**
 * Splits a time-interval error (TIE) distribution into random jitter (RJ) and deterministic jitter
 * (DJ) under the dual-Dirac model, and extrapolates total jitter (TJ) at a bit error ratio.
 *
 * <p><b>Model.</b> The TIE density is taken as two Gaussians of weight 1/2 each at {@code muL} and
 * {@code muR}, with standard deviations {@code sigmaL} and {@code sigmaR}. Deep in the left tail only
 * the left Gaussian matters, so there {@code F(x) = Phi((x - muL) / sigmaL) / 2}, with F the
 * empirical cumulative distribution: on the "Q scale" {@code q = Phi^-1(2 F(x))} the tail is a
 * straight line {@code x = muL + sigmaL q}, fitted by least squares from where about
 * {@code Phi(-Q_SHALLOW) / 2} of the edges lie beyond down to where only a few do. The right tail
 * likewise, with {@code 1 - F}. For a single Gaussian (no DJ) the fit reports a small DJ and a
 * smaller RJ whose TJ is still close; for sinusoidal DJ it reports less than the peak-to-peak (the
 * dual-Dirac DJ is a model figure, not a peak-to-peak; {@link PeriodicJitter} gives the
 * peak-to-peak of periodic jitter); docs/jitter.md. Then RJ = (sigmaL + sigmaR) / 2 (RMS),
 * DJ(dual-Dirac) = muR - muL, and TJ(BER) = DJ + 2 Q(BER) RJ with Q(BER) = -Phi^-1(BER), the
 * relation of the dual-Dirac model (docs/reference-facts.md#jitter-under-the-dual-dirac-model).
 *
 * <p>The model does not describe every distribution: the result lists the reasons it may not hold
 * here (too few edges for the tails, tails that are not straight on the Q scale, very different
 * left and right widths). Units: whatever the input is in (the plugin uses picoseconds).
 */
final class JitterDecomposition {
    /** Shallow end of the tail fit on the Q scale (about 3.3 % of the edges per tail lie beyond it at the weight 1/2). */
    static final double Q_SHALLOW = 1.5;
    /** Deepest tail point used: the fit stops where fewer than {@link #MIN_BEYOND} edges lie beyond, or at this Q. */
    static final double Q_DEEP = 5.0;
    /** Points beyond the deepest one used, at least (the extreme order statistics are too noisy). */
    static final int MIN_BEYOND = 5;
    /** Fewest edges for a tail fit at all. */
    static final int MIN_EDGES = 1000;
    /** Fewest points in each tail fit. */
    static final int MIN_TAIL_POINTS = 20;
    /** A tail whose Q-scale line explains less than this share of its variance is called non-Gaussian. */
    static final double MIN_R2 = 0.98;

    private static final NormalDistribution PHI = new NormalDistribution(0, 1);

    /**
     * A fitted tail.
     *
     * @param mu     position of the Dirac (the line at q = 0)
     * @param sigma  Gaussian width
     * @param r2     share of the variance of x explained by the line
     * @param points points used
     * @param weight fitted weight of this tail's Dirac (1/2 for two equal Diracs, 1 for one Gaussian)
     */
    record Tail(double mu, double sigma, double r2, int points, double weight) {
    }

    /**
     * The result.
     *
     * @param edges    TIE values used
     * @param left     left tail fit, or null if there was none
     * @param right    right tail fit, or null
     * @param rjRms    random jitter, RMS
     * @param djDd     deterministic jitter, dual-Dirac (separation of the Diracs, at least 0)
     * @param ber      bit error ratio for TJ
     * @param qBer     Q(BER) = -Phi^-1(BER)
     * @param tj       total jitter at the BER
     * @param caveats  reasons the dual-Dirac model may not hold for this data; empty if none found
     */
    record Result(int edges, Tail left, Tail right, double rjRms, double djDd, double ber, double qBer, double tj,
                  List<String> caveats) {
        boolean fitted() {
            return left != null && right != null;
        }

        /** Whether the model was fitted and no caveat was found. */
        boolean modelHolds() {
            return fitted() && caveats.isEmpty();
        }
    }

    private JitterDecomposition() {
    }

    /**
     * Q(BER) = -Phi^-1(BER), the number of standard deviations of a Gaussian tail that holds the
     * probability {@code ber}.
     *
     * @param ber probability, 0 < ber < 0.5
     * @return Q
     */
    static double q(double ber) {
        return -PHI.inverseCumulativeProbability(ber);
    }

    /** The upper tail probability of a standard Gaussian, 1 - Phi(z). */
    static double upper(double z) {
        return PHI.cumulativeProbability(-z);
    }

    /**
     * Decomposes {@code tie[0..n)} (need not be sorted; not modified).
     *
     * @param tie TIE values
     * @param n   how many
     * @param ber bit error ratio for TJ, 0 < ber < 0.5
     * @return the result
     */
    static Result decompose(double[] tie, int n, double ber) {
        double[] x = Arrays.copyOf(tie, n);
        Arrays.sort(x);
        return decomposeSorted(x, n, ber);
    }

    /**
     * {@link #decompose} of values already sorted (not modified).
     *
     * @param x   TIE values, increasing
     * @param n   how many
     * @param ber bit error ratio for TJ, 0 < ber < 0.5
     * @return the result
     */
    static Result decomposeSorted(double[] x, int n, double ber) {
        double qb = q(ber);
        List<String> caveats = new ArrayList<>();
        if (n < MIN_EDGES) {
            caveats.add(String.format(Locale.ROOT, "only %d edges: a tail fit needs at least %d", n, MIN_EDGES));
            return new Result(n, null, null, Double.NaN, Double.NaN, ber, qb, Double.NaN, caveats);
        }
        Tail left = tail(x, n, false);
        Tail right = tail(x, n, true);
        if (left == null || right == null) {
            caveats.add("too few edges in the tails for a fit (at least " + MIN_TAIL_POINTS + " points beyond Q = "
                    + Q_SHALLOW + " each)");
            return new Result(n, left, right, Double.NaN, Double.NaN, ber, qb, Double.NaN, caveats);
        }
        double rj = (left.sigma() + right.sigma()) / 2;
        double dj = right.mu() - left.mu();
        if (dj < 0) {
            caveats.add(String.format(Locale.ROOT, "the tails are narrower than Gaussians of their width would be "
                    + "(Dirac separation %.4g < 0, taken as 0): bounded or sub-Gaussian random jitter", dj));
            dj = 0;
        }
        for (Tail t : new Tail[] {left, right}) {
            if (t.r2() < MIN_R2) {
                caveats.add(String.format(Locale.ROOT, "the %s tail is not straight on the Q scale (R^2 %.4f < %.2f): "
                        + "not Gaussian", t == left ? "left" : "right", t.r2(), MIN_R2));
            }
        }
        double ratio = Math.max(left.sigma(), right.sigma()) / Math.min(left.sigma(), right.sigma());
        if (ratio > 1.5) {
            caveats.add(String.format(Locale.ROOT, "left and right tails have different widths (%.4g and %.4g): "
                    + "the random jitter is not one Gaussian", left.sigma(), right.sigma()));
        }
        return new Result(n, left, right, rj, dj, ber, qb, dj + 2 * qb * rj, caveats);
    }

    /** Tail points used at most per fit (evenly spaced in rank; the fit is repeated for every weight tried). */
    static final int MAX_TAIL_POINTS = 400;

    /** Weight of each Dirac: two equal ones. */
    static final double WEIGHT = 0.5;

    /**
     * Fits one tail: the line {@code x = mu + sigma Phi^-1(F / WEIGHT)} over the ranks from
     * {@link #MIN_BEYOND} to where {@code F} reaches {@code Phi(-Q_SHALLOW) / 2}, no deeper than
     * {@code Phi(-Q_DEEP)}; null if too few points or no positive width.
     */
    private static Tail tail(double[] sorted, int n, boolean upperTail) {
        double fMax = upper(Q_SHALLOW) / 2;
        double fMin = upper(Q_DEEP);
        int r0 = Math.max(MIN_BEYOND, (int) Math.ceil(fMin * n - 0.5));
        int r1 = (int) Math.floor(fMax * n - 0.5);
        int avail = r1 - r0 + 1;
        if (avail < MIN_TAIL_POINTS) {
            return null;
        }
        int m = Math.min(avail, MAX_TAIL_POINTS);
        double[] f = new double[m];
        double[] x = new double[m];
        for (int i = 0; i < m; i++) {
            int r = r0 + (int) ((long) i * (avail - 1) / Math.max(1, m - 1));
            f[i] = (r + 0.5) / n;
            x[i] = upperTail ? -sorted[n - 1 - r] : sorted[r]; // the upper tail mirrored onto the lower
        }
        double[] q = new double[m];
        for (int i = 0; i < m; i++) {
            q[i] = PHI.inverseCumulativeProbability(f[i] / WEIGHT);
        }
        double[] line = line(q, x, m);
        if (!(line[1] > 0)) {
            return null;
        }
        // for the upper tail x was mirrored: x = -(mu + sigma q) there
        return new Tail(upperTail ? -line[0] : line[0], line[1], line[3], m, WEIGHT);
    }

    /** Least squares x = a + b q: {a, b, residual sum of squares, R^2}. */
    private static double[] line(double[] q, double[] x, int m) {
        double sq = 0;
        double sx = 0;
        for (int i = 0; i < m; i++) {
            sq += q[i];
            sx += x[i];
        }
        double mq = sq / m;
        double mx = sx / m;
        double vq = 0;
        double vx = 0;
        double c = 0;
        for (int i = 0; i < m; i++) {
            double dq = q[i] - mq;
            double dx = x[i] - mx;
            vq += dq * dq;
            vx += dx * dx;
            c += dq * dx;
        }
        double b = vq > 0 ? c / vq : Double.NaN;
        double ss = vx - (vq > 0 ? c * c / vq : 0);
        return new double[] {mx - b * mq, b, Math.max(0, ss), vx > 0 ? 1 - Math.max(0, ss) / vx : 1};
    }

    /**
     * The bathtub curve of the dual-Dirac model: the probability that an edge falls on the wrong side
     * of a sampling instant {@code x} after the ideal edge time, for edges at 0 and at {@code ui},
     * transition density 1 (every interval ends in an edge, as a clock does).
     *
     * @param r  the decomposition (fitted)
     * @param ui interval between ideal edges
     * @param x  sampling instant, 0..ui
     * @return the error probability
     */
    static double bathtubModel(Result r, double ui, double x) {
        Tail a = r.left();
        Tail b = r.right();
        // an edge of the interval's start arriving after x, or of its end arriving before x
        return b.weight() * upper((x - b.mu()) / b.sigma()) + a.weight() * upper((ui + a.mu() - x) / a.sigma());
    }

    /**
     * The measured bathtub: the share of TIE values later than {@code x} plus the share earlier than
     * {@code x - ui}.
     *
     * @param sorted TIE values, sorted
     * @param n      how many
     * @param ui     interval between ideal edges
     * @param x      sampling instant
     * @return the measured share, 0 where none was seen
     */
    static double bathtubMeasured(double[] sorted, int n, double ui, double x) {
        int late = n - upperIndex(sorted, n, x);
        int early = upperIndex(sorted, n, x - ui);
        return (double) (late + early) / n;
    }

    /** Number of values {@code <= v}. */
    private static int upperIndex(double[] s, int n, double v) {
        int lo = 0;
        int hi = n;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (s[mid] <= v) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }
}
