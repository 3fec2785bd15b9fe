package org.lanesift.plugins.deskew;

/**
 * Finite-value checks over sample arrays in one pass the JIT can vectorise: the largest magnitude
 * is kept with {@code Math.max}, which turns NaN if any sample is NaN and infinite if any is
 * infinite, so there is no branch per sample.
 */
final class SampleScan {
    private SampleScan() {
    }

    /**
     * Whether every one of the first {@code n} samples is finite.
     *
     * @param v samples, volts
     * @param n how many to look at
     * @return false if any is NaN or infinite
     */
    static boolean allFinite(float[] v, int n) {
        float m = 0f;
        for (int i = 0; i < n; i++) {
            m = Math.max(m, Math.abs(v[i]));
        }
        return m <= Float.MAX_VALUE;
    }

    /**
     * Copies {@code n} samples from the start of {@code src} to {@code dst} at {@code at} and says
     * whether all of them were finite.
     *
     * @param src source samples, volts
     * @param dst destination
     * @param at  first destination index
     * @param n   how many to copy
     * @return false if any copied sample is NaN or infinite
     */
    static boolean copyAllFinite(float[] src, float[] dst, int at, int n) {
        System.arraycopy(src, 0, dst, at, n);
        return allFinite(src, n);
    }
}
