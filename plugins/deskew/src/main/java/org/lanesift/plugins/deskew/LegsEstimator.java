package org.lanesift.plugins.deskew;

import java.util.Arrays;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;
import org.lanesift.data.AnalogBlock;

/**
 * Skew between the two legs of one differential pair: the cross-correlation of P against -N over
 * lags {@code -maxLag..maxLag} samples, accumulated segment by segment, with a parabolic fit
 * through the peak and its two neighbours for the sub-sample lag.
 *
 * <p>The capture streams through in segments of {@code L} samples of P, each correlated against
 * the matching -N samples extended by {@code maxLag} either side, so every lag sums the same
 * {@code L} products (no triangular bias). Each segment is correlated with Apache Commons Math's
 * {@link FastFourierTransformer} (size the next power of two at or above {@code L + 2 maxLag});
 * both legs have their segment mean removed first. When the levels correlate weakly (below 0.5),
 * as on a lane whose low-power states move both legs together, the correlation of the slopes in
 * differential mode is used instead (see {@code slopeSegment}). Memory: two segments.
 *
 * <p>A positive lag means -N arrives later than P by that many samples.
 */
final class LegsEstimator {
    private final int maxLag;
    private final int segment;
    private final int fftSize;
    private final double[] acc;
    private double energyP;
    private double energyQ;
    private long products;
    // the same correlation taken between slopes with common-mode moves left out (see segment)
    private final double[] accSlope;
    private double energySlopeP;
    private double energySlopeQ;
    private long nonFinite;

    private float[] p = new float[0];
    private float[] q = new float[0];
    private int pLen;
    private int qLen;
    private int pos;            // buffer index of the next segment's first P sample (>= maxLag)
    private final double[][] fp;
    private final double[][] fq;

    LegsEstimator(int maxLag) {
        this.maxLag = maxLag;
        this.segment = Math.max(8192, 4 * maxLag);
        int f = Integer.highestOneBit(segment + 2 * maxLag);
        if (f < segment + 2 * maxLag) {
            f <<= 1;
        }
        this.fftSize = f;
        this.acc = new double[2 * maxLag + 1];
        this.accSlope = new double[2 * maxLag + 1];
        this.pos = maxLag;
        this.fp = new double[2][fftSize];
        this.fq = new double[2][fftSize];
    }

    int maxLag() {
        return maxLag;
    }

    /** Next P block. */
    void p(AnalogBlock b) {
        p = append(p, pLen, b, false);
        pLen += b.length();
        run(false);
    }

    /** Next N block (negated on the way in). */
    void n(AnalogBlock b) {
        q = append(q, qLen, b, true);
        qLen += b.length();
        run(false);
    }

    void finish() {
        run(true);
    }

    private float[] append(float[] buf, int len, AnalogBlock b, boolean negate) {
        int n = b.length();
        if (len + n > buf.length) {
            buf = Arrays.copyOf(buf, Math.max(len + n, buf.length * 2));
        }
        float[] v = b.volts();
        float prev = len > 0 ? buf[len - 1] : 0f;
        for (int i = 0; i < n; i++) {
            float x = negate ? -v[i] : v[i];
            if (Float.isFinite(x)) {
                prev = x;
            } else {
                x = prev; // a NaN or infinity would poison every lag: hold the previous sample
                nonFinite++;
            }
            buf[len + i] = x;
        }
        return buf;
    }

    /** Samples that were NaN or infinite and replaced by their predecessor. */
    long nonFinite() {
        return nonFinite;
    }

    private void run(boolean atEnd) {
        int avail = Math.min(pLen, qLen);
        while (pos + segment + maxLag <= avail) {
            segment(pos, segment);
            pos += segment;
        }
        if (atEnd) {
            int rest = avail - maxLag - pos;
            if (rest > 0) {
                segment(pos, rest);
                pos += rest;
            }
        }
        // keep from pos - maxLag
        int drop = pos - maxLag;
        if (drop > 0 && drop >= Math.max(pLen, qLen) / 2) {
            System.arraycopy(p, drop, p, 0, pLen - drop);
            System.arraycopy(q, drop, q, 0, qLen - drop);
            pLen -= drop;
            qLen -= drop;
            pos -= drop;
        }
    }

    /** Correlates P[a, a+len) with Q[a-maxLag, a+len+maxLag). */
    private void segment(int a, int len) {
        double mp = 0;
        for (int i = 0; i < len; i++) {
            mp += p[a + i];
        }
        mp /= len;
        int qlen = len + 2 * maxLag;
        double mq = 0;
        for (int i = 0; i < qlen; i++) {
            mq += q[a - maxLag + i];
        }
        mq /= qlen;
        double[] pr = fp[0];
        double[] pi = fp[1];
        double[] qr = fq[0];
        double[] qi = fq[1];
        Arrays.fill(pr, 0);
        Arrays.fill(pi, 0);
        Arrays.fill(qr, 0);
        Arrays.fill(qi, 0);
        double ep = 0;
        for (int i = 0; i < len; i++) {
            double v = p[a + i] - mp;
            pr[i] = v;
            ep += v * v;
        }
        double eq = 0;
        for (int i = 0; i < qlen; i++) {
            double v = q[a - maxLag + i] - mq;
            qr[i] = v;
            if (i >= maxLag && i < maxLag + len) {
                eq += v * v;
            }
        }
        correlateInto(acc);
        energyP += ep;
        energyQ += eq;
        products += len;
        slopeSegment(a, len, qlen);
    }

    /**
     * The correlation between the slopes of P and -N where the pair moves in differential mode:
     * a common-mode move (both legs the same way, such as a low-power state change between bursts
     * on a D-PHY lane) gives slopes of P and -N of opposite sign and is left out. Used when the
     * level correlation is weak because common-mode moves dominate it.
     */
    private void slopeSegment(int a, int len, int qlen) {
        double[] pr = fp[0];
        double[] pi = fp[1];
        double[] qr = fq[0];
        double[] qi = fq[1];
        Arrays.fill(pr, 0);
        Arrays.fill(pi, 0);
        Arrays.fill(qr, 0);
        Arrays.fill(qi, 0);
        double ep = 0;
        for (int i = 0; i < len; i++) {
            int k = a + i;
            double dp = p[k] - p[k - 1];
            double dq = q[k] - q[k - 1];
            double v = dp * dq < 0 && Math.abs(dq) > 0.25 * Math.abs(dp) ? 0 : dp;
            pr[i] = v;
            ep += v * v;
        }
        double eq = 0;
        for (int i = 0; i < qlen; i++) {
            int k = a - maxLag + i;
            double dq = k >= 1 ? q[k] - q[k - 1] : 0;
            double dp = k >= 1 && k < pLen ? p[k] - p[k - 1] : 0;
            double v = dp * dq < 0 && Math.abs(dp) > 0.25 * Math.abs(dq) ? 0 : dq;
            qr[i] = v;
            if (i >= maxLag && i < maxLag + len) {
                eq += v * v;
            }
        }
        correlateInto(accSlope);
        energySlopeP += ep;
        energySlopeQ += eq;
    }

    /** Correlates the segment in {@code fp} against the one in {@code fq} (FFT, conj(P) * Q) and adds lags -maxLag..maxLag to {@code target}. */
    private void correlateInto(double[] target) {
        double[] pr = fp[0];
        double[] pi = fp[1];
        double[] qr = fq[0];
        double[] qi = fq[1];
        FastFourierTransformer.transformInPlace(fp, DftNormalization.STANDARD, TransformType.FORWARD);
        FastFourierTransformer.transformInPlace(fq, DftNormalization.STANDARD, TransformType.FORWARD);
        for (int k = 0; k < fftSize; k++) {
            double ar = pr[k];
            double ai = -pi[k];
            double br = qr[k];
            double bi = qi[k];
            qr[k] = ar * br - ai * bi;
            qi[k] = ar * bi + ai * br;
        }
        FastFourierTransformer.transformInPlace(fq, DftNormalization.STANDARD, TransformType.INVERSE);
        for (int j = 0; j <= 2 * maxLag; j++) {
            target[j] += qr[j];
        }
    }

    /** The accumulated correlation, lag {@code -maxLag} first (a copy). */
    double[] correlation() {
        return acc.clone();
    }

    /** The estimate. */
    record Result(long samples, double lagSamples, double correlation, boolean atEdge, double secondPeakRatio) {
    }

    Result result() {
        if (products == 0) {
            return new Result(0, 0, 0, false, 0);
        }
        Result levels = result(acc, energyP, energyQ);
        if (levels.correlation() >= 0.5) {
            return levels;
        }
        // weak: common-mode moves (low-power states) may dominate the levels; try the slopes
        Result slopes = result(accSlope, energySlopeP, energySlopeQ);
        return slopes.correlation() > levels.correlation() ? slopes : levels;
    }

    private Result result(double[] acc, double energyP, double energyQ) {
        int best = 0;
        for (int j = 1; j < acc.length; j++) {
            if (acc[j] > acc[best]) {
                best = j;
            }
        }
        double frac = 0;
        boolean edge = best == 0 || best == acc.length - 1;
        if (!edge) {
            double ym = acc[best - 1];
            double y0 = acc[best];
            double yp = acc[best + 1];
            double den = ym - 2 * y0 + yp;
            if (den < 0) {
                frac = 0.5 * (ym - yp) / den;
            }
        }
        double norm = Math.sqrt(energyP * energyQ);
        double rho = norm > 0 ? Math.max(0, Math.min(1, acc[best] / norm)) : 0;
        // second peak: the highest local maximum outside the main lobe (beyond the first zero or minimum either side)
        int l = best;
        while (l > 0 && acc[l - 1] < acc[l] && acc[l - 1] > 0) {
            l--;
        }
        int r = best;
        while (r < acc.length - 1 && acc[r + 1] < acc[r] && acc[r + 1] > 0) {
            r++;
        }
        double second = 0;
        for (int j = 1; j < acc.length - 1; j++) {
            if ((j < l || j > r) && acc[j] >= acc[j - 1] && acc[j] >= acc[j + 1]) {
                second = Math.max(second, acc[j]);
            }
        }
        double ratio = acc[best] > 0 ? second / acc[best] : 1;
        return new Result(products, best - maxLag + frac, rho, edge, ratio);
    }
}
