package org.lanesift.plugins.discovery;

/**
 * Normalised autocorrelation of a real sequence through a radix-2 FFT (Wiener-Khinchin: the
 * autocorrelation is the inverse transform of the power spectrum; Cooley and Tukey, 1965, for the
 * transform). The sequence is zero-padded to twice its length, so the result is the linear, not
 * the circular, autocorrelation; each lag is divided by the number of overlapping pairs.
 */
final class Autocorrelation {
    private Autocorrelation() {
    }

    /**
     * @param x      samples (mean is removed here)
     * @param n      count
     * @param maxLag largest lag wanted
     * @return r[0..maxLag], r[0] = 1
     */
    static double[] of(double[] x, int n, int maxLag) {
        int size = 1;
        while (size < 2 * n) {
            size <<= 1;
        }
        double mean = 0;
        for (int i = 0; i < n; i++) {
            mean += x[i];
        }
        mean /= Math.max(1, n);
        double[] re = new double[size];
        double[] im = new double[size];
        for (int i = 0; i < n; i++) {
            re[i] = x[i] - mean;
        }
        fft(re, im, false);
        for (int i = 0; i < size; i++) {
            re[i] = re[i] * re[i] + im[i] * im[i];
            im[i] = 0;
        }
        fft(re, im, true);
        double[] r = new double[maxLag + 1];
        double r0 = re[0] / n;
        for (int lag = 0; lag <= maxLag && lag < n; lag++) {
            r[lag] = r0 > 0 ? (re[lag] / (n - lag)) / r0 : 0;
        }
        return r;
    }

    /** In-place iterative radix-2 transform; {@code inverse} without the 1/N scaling. */
    static void fft(double[] re, double[] im, boolean inverse) {
        int n = re.length;
        for (int i = 1, j = 0; i < n; i++) {
            int bit = n >> 1;
            for (; (j & bit) != 0; bit >>= 1) {
                j ^= bit;
            }
            j ^= bit;
            if (i < j) {
                double t = re[i];
                re[i] = re[j];
                re[j] = t;
                t = im[i];
                im[i] = im[j];
                im[j] = t;
            }
        }
        for (int len = 2; len <= n; len <<= 1) {
            double ang = 2 * Math.PI / len * (inverse ? 1 : -1);
            double wr = Math.cos(ang);
            double wi = Math.sin(ang);
            for (int i = 0; i < n; i += len) {
                double cr = 1;
                double ci = 0;
                for (int j = 0; j < len / 2; j++) {
                    int a = i + j;
                    int b = a + len / 2;
                    double xr = re[b] * cr - im[b] * ci;
                    double xi = re[b] * ci + im[b] * cr;
                    re[b] = re[a] - xr;
                    im[b] = im[a] - xi;
                    re[a] += xr;
                    im[a] += xi;
                    double t = cr * wr - ci * wi;
                    ci = cr * wi + ci * wr;
                    cr = t;
                }
            }
        }
    }
}
