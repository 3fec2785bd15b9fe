package org.lanesift.plugins.discovery;

/**
 * Bit statistics per position within a period: the payload bits of the bursts (after the sync,
 * counted from each burst's start) are modelled as independent bits whose probability of a one
 * depends only on the position modulo the period, and each period is scored by the Bayesian
 * information criterion of that model (Schwarz, "Estimating the dimension of a model", Annals of
 * Statistics 6(2), 1978): {@code -2 ln L + P ln n}, with {@code ln L} the maximised
 * log-likelihood (minus {@code n} times the mean binary entropy per position, in nats) and one
 * parameter per position. Words carry fields (the top bits of pixel components, opcodes) whose
 * bits are not equally likely, so the entropy per bit position has the word's period: a period
 * twice the word length only fits noise and pays {@code ln n} per extra position, while the true
 * length against half of it lowers the entropy at every position where the two halves of a word
 * differ. Memory: one count per position; time: at most {@link #MAX_BITS} bits per period.
 */
final class PositionStatistics {
    /** Payload bits examined per period at most (lanes together). */
    static final int MAX_BITS = 1 << 21;

    private PositionStatistics() {
    }

    /**
     * @param link    the bursts
     * @param periods periods to score, in bits
     * @param syncs   sync length that goes with each period
     * @return the criterion of each period (lower is better); each lane is a stream of its own,
     *         its positions counted from the burst start
     */
    static double[] bic(SampledLink link, int[] periods, int[] syncs) {
        double[] out = new double[periods.length];
        int n = link.bursts();
        int from = n > 4 ? 1 : 0;
        int to = n > 4 ? n - 1 : n;
        for (int c = 0; c < periods.length; c++) {
            int p = periods[c];
            long[] ones = new long[p];
            long[] total = new long[p];
            long seen = 0;
            for (int b = from; b < to && seen < MAX_BITS; b++) {
                int start = link.start()[b] + syncs[c];
                int end = link.end()[b];
                for (int k = 0; k < link.lanes().length && seen < MAX_BITS; k++) {
                    long[] lane = link.lanes()[k];
                    int pos = 0;
                    for (int i = start; i < end && seen < MAX_BITS; i++, seen++) {
                        ones[pos] += lane[i >>> 6] >>> i & 1L;
                        total[pos]++;
                        pos = pos + 1 == p ? 0 : pos + 1;
                    }
                }
            }
            double logL = 0;
            for (int j = 0; j < p; j++) {
                logL += xLogX(ones[j], total[j]) + xLogX(total[j] - ones[j], total[j]);
            }
            out[c] = -2 * logL + p * Math.log(Math.max(2, seen));
        }
        return out;
    }

    /** {@code k ln(k / n)}, 0 when {@code k} is 0. */
    private static double xLogX(long k, long n) {
        return k == 0 ? 0 : k * Math.log(k / (double) n);
    }
}
