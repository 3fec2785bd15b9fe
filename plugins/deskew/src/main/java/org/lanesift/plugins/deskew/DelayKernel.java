package org.lanesift.plugins.deskew;

/**
 * Fractional-delay FIR kernels. A delay of {@code s} samples (any real number) is written as
 * {@code -s = fl + mu} with {@code fl = floor(-s)} and {@code 0 <= mu < 1}; output sample
 * {@code n} is {@code sum_j h[j] * x[n + fl + j]} for {@code j = lo..hi}, an estimate of
 * {@code x(n - s)}.
 *
 * <ul>
 * <li>{@link #SINC}: 16-tap windowed sinc ({@code j = -7..8}), Kaiser window with beta = 5 over
 * a half-width of 8 samples, taps normalised to unit DC gain. Worst passband error
 * {@code max |H(f) exp(i 2 pi f mu) - 1|} over every fraction {@code mu} is 0.50 % of amplitude up
 * to 0.4 of the sample rate and 0.26 % up to 0.25 (measured by {@code DelayKernelTest}).</li>
 * <li>{@link #CUBIC}: 4-tap cubic convolution (Keys, a = -0.5, {@code j = -1..2}); cheap but
 * its passband error grows quickly with frequency: 0.05 % up to 0.05 of the sample rate,
 * 0.44 % up to 0.1, 11.6 % up to 0.25 and 55 % up to 0.4 (measured by {@code DelayKernelTest});
 * use it only for signals oversampled ten times or more.</li>
 * </ul>
 * A fraction within 1e-9 of a whole sample uses the exact one-tap kernel (a plain shift).
 */
enum DelayKernel {
    /** 16-tap Kaiser-windowed sinc, beta 5. */
    SINC(8, 5.0),
    /** 4-tap cubic convolution, a = -0.5. */
    CUBIC(2, 0);

    /** Taps either side: the kernel spans {@code j = -half+1 .. half}. */
    final int half;
    final double beta;

    DelayKernel(int half, double beta) {
        this.half = half;
        this.beta = beta;
    }

    /**
     * Parses the option value.
     *
     * @param name {@code "sinc"} or {@code "cubic"}
     * @return the kernel
     */
    static DelayKernel of(String name) {
        return "cubic".equals(name) ? CUBIC : SINC;
    }

    /** Taps for a fraction: index {@code j - lo}. */
    float[] taps(double mu) {
        double[] h = tapsDouble(mu);
        float[] f = new float[h.length];
        for (int i = 0; i < h.length; i++) {
            f[i] = (float) h[i];
        }
        return f;
    }

    /** Lowest tap index for a fraction. */
    int lo(double mu) {
        return isWhole(mu) ? 0 : -half + 1;
    }

    /** Highest tap index for a fraction. */
    int hi(double mu) {
        return isWhole(mu) ? 0 : half;
    }

    static boolean isWhole(double mu) {
        return mu < 1e-9;
    }

    double[] tapsDouble(double mu) {
        if (isWhole(mu)) {
            return new double[] {1.0};
        }
        double[] h = new double[2 * half];
        double sum = 0;
        for (int j = -half + 1; j <= half; j++) {
            double x = j - mu;
            double v = this == CUBIC ? keys(x) : sinc(x) * kaiser(x / half, beta);
            h[j + half - 1] = v;
            sum += v;
        }
        for (int i = 0; i < h.length; i++) {
            h[i] /= sum;
        }
        return h;
    }

    private static double sinc(double x) {
        if (x == 0) {
            return 1;
        }
        double px = Math.PI * x;
        return Math.sin(px) / px;
    }

    /** Keys cubic convolution kernel with a = -0.5. */
    private static double keys(double x) {
        double a = -0.5;
        double t = Math.abs(x);
        if (t <= 1) {
            return (a + 2) * t * t * t - (a + 3) * t * t + 1;
        } else if (t < 2) {
            return a * t * t * t - 5 * a * t * t + 8 * a * t - 4 * a;
        }
        return 0;
    }

    private static double kaiser(double r, double beta) {
        if (Math.abs(r) > 1) {
            return 0;
        }
        return besselI0(beta * Math.sqrt(1 - r * r)) / besselI0(beta);
    }

    /** Modified Bessel function of the first kind, order 0, by its power series. */
    static double besselI0(double x) {
        double sum = 1;
        double term = 1;
        double q = x / 2;
        for (int k = 1; k < 60; k++) {
            term *= (q / k) * (q / k);
            sum += term;
            if (term < 1e-17 * sum) {
                break;
            }
        }
        return sum;
    }

    /**
     * Worst passband error of this kernel up to a frequency: the largest
     * {@code |H(f) - exp(-i 2 pi f mu)|} over 0 &le; f &le; {@code maxFraction} of the sample
     * rate and over fractions mu in steps of 1/64.
     *
     * @param maxFraction highest frequency as a fraction of the sample rate, below 0.5
     * @return error as a fraction of amplitude
     */
    double passbandError(double maxFraction) {
        double worst = 0;
        for (int m = 0; m < 64; m++) {
            double mu = m / 64.0;
            double[] h = tapsDouble(mu);
            int lo = lo(mu);
            for (int k = 0; k <= 400; k++) {
                double f = maxFraction * k / 400;
                double re = 0;
                double im = 0;
                for (int i = 0; i < h.length; i++) {
                    double a = 2 * Math.PI * f * (lo + i - mu);
                    re += h[i] * Math.cos(a);
                    im += h[i] * Math.sin(a);
                }
                worst = Math.max(worst, Math.hypot(re - 1, im));
            }
        }
        return worst;
    }
}
