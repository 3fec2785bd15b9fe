package org.lanesift.plugins.si;

/**
 * A reference clock that follows the measured edges through a phase-locked loop, updated once per
 * ideal clock interval, and the time-interval error of the edges against it. Unlike the
 * least-squares ideal clock, it follows phase wander slower than its loop bandwidth, so the TIE
 * against it keeps only the faster jitter (the high-pass jitter transfer of the loop).
 *
 * <p>Per interval {@code k} with edge time {@code t_k} and predicted time {@code r_k}: error
 * {@code e_k = t_k - r_k}; first order: {@code r_k+1 = r_k + P + Kp e_k}; second order (type 2,
 * damping 0.707) adds a period integrator {@code P += Ki e_k}. Gains from the loop bandwidth
 * {@code B} (the -3 dB frequency of the loop's jitter tracking) and the interval {@code T}: first
 * order {@code Kp = 2 pi B T}; second order {@code wn = 2 pi B / 2.058}, {@code Kp = 2 zeta wn T},
 * {@code Ki = (wn T)^2} (the continuous-time loop, textbook control theory, valid for
 * {@code B T << 1}). Missing edges advance the prediction by whole intervals without an update.
 * Times femtoseconds in, TIE picoseconds out.
 */
final class TrackingClock {
    /** Damping of the second-order loop. */
    static final double ZETA = Math.sqrt(0.5);
    /** -3 dB bandwidth of a second-order type-2 loop with damping 0.707, in units of its natural frequency (textbook, from memory). */
    static final double BW_PER_WN = 2.058;

    private TrackingClock() {
    }

    /** Largest loop gain per interval, 2 pi B T, accepted: a tenth keeps the sampled loop close to the continuous one. */
    static final double MAX_GAIN = 0.1;

    /**
     * The widest loop bandwidth accepted for edges {@code periodFs} apart.
     *
     * @param periodFs interval between edges, femtoseconds
     * @return hertz
     */
    static double maxBandwidthHz(double periodFs) {
        return MAX_GAIN / (2 * Math.PI * periodFs * 1e-15);
    }

    /**
     * The result.
     *
     * @param tiePs         TIE against the tracking clock, picoseconds, for the edges after the settling time
     * @param count         entries of {@code tiePs}
     * @param settlingEdges edges left out at the start while the loop settles
     */
    record Result(double[] tiePs, int count, int settlingEdges) {
    }

    /**
     * Runs the loop over the edges.
     *
     * @param t           edge times, femtoseconds
     * @param k           interval numbers of the edges (gaps where edges are missing)
     * @param n           edges
     * @param periodFs    ideal interval (least-squares), femtoseconds, the loop's starting period
     * @param bandwidthHz loop bandwidth, Hz
     * @param order       1 or 2
     * @return the TIE against the tracking clock
     */
    static Result run(long[] t, long[] k, int n, double periodFs, double bandwidthHz, int order) {
        double tSec = periodFs * 1e-15;
        double kp;
        double ki;
        if (order == 1) {
            kp = 2 * Math.PI * bandwidthHz * tSec;
            ki = 0;
        } else {
            double wnT = 2 * Math.PI * bandwidthHz / BW_PER_WN * tSec;
            kp = 2 * ZETA * wnT;
            ki = wnT * wnT;
        }
        // settle for five loop time constants 1 / (2 pi B), at most half the edges
        int settle = (int) Math.min(n / 2, Math.ceil(5 / (2 * Math.PI * bandwidthHz * tSec)));
        double[] out = new double[Math.max(0, n - settle)];
        int m = 0;
        double r = 0; // predicted time relative to t[0]
        double p = periodFs;
        for (int i = 0; i < n; i++) {
            if (i > 0) {
                long steps = k[i] - k[i - 1];
                r += (steps - 1) * p; // whole intervals without an edge
            }
            double e = (double) (t[i] - t[0]) - r;
            if (i >= settle) {
                out[m++] = e / 1000;
            }
            p += ki * e;
            r += p + kp * e;
        }
        return new Result(out, m, settle);
    }
}
