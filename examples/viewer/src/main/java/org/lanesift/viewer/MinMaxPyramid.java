package org.lanesift.viewer;

/**
 * Minimum and maximum of any sample range of one channel in O(log n) steps, so that drawing a
 * waveform costs a few steps per pixel column whatever the zoom. Built once per channel: level 0
 * holds the min and max of each bucket of {@link #BUCKET} samples, each further level the min and
 * max of two neighbours of the level below (the last one alone when the count is odd). A query
 * scans at most {@code 2 * BUCKET} samples at its ends and walks up the levels for the whole
 * buckets in between. Extra memory: about {@code n / 16} floats per level sum, that is n/8 floats
 * (a quarter of the samples' own 4 bytes) for min and max together.
 *
 * <p>The values are volts; NaN samples are not expected (the capture readers mark bad samples
 * invalid rather than NaN) and would make the answer NaN.
 */
public final class MinMaxPyramid {
    /** Samples per level-0 bucket. */
    public static final int BUCKET = 16;

    private final float[] samples;
    private final int length;
    private final float[][] mins;
    private final float[][] maxs;

    private MinMaxPyramid(float[] samples, int length, float[][] mins, float[][] maxs) {
        this.samples = samples;
        this.length = length;
        this.mins = mins;
        this.maxs = maxs;
    }

    /**
     * Builds the pyramid over the first {@code length} samples (the array is kept, not copied).
     *
     * @param samples the channel's samples, volts
     * @param length  how many are used
     * @return the pyramid
     */
    public static MinMaxPyramid build(float[] samples, int length) {
        if (length < 0 || length > samples.length) {
            throw new IllegalArgumentException("length " + length + " outside 0.." + samples.length);
        }
        int buckets = length / BUCKET;
        int levels = 0;
        for (int n = buckets; n > 0; n = n == 1 ? 0 : (n + 1) / 2) {
            levels++;
        }
        float[][] mins = new float[levels][];
        float[][] maxs = new float[levels][];
        if (levels > 0) {
            float[] mn = new float[buckets];
            float[] mx = new float[buckets];
            for (int b = 0; b < buckets; b++) {
                int s = b * BUCKET;
                float lo = samples[s];
                float hi = lo;
                for (int i = s + 1; i < s + BUCKET; i++) {
                    float v = samples[i];
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
                mn[b] = lo;
                mx[b] = hi;
            }
            mins[0] = mn;
            maxs[0] = mx;
            for (int k = 1; k < levels; k++) {
                float[] pm = mins[k - 1];
                float[] px = maxs[k - 1];
                int n = (pm.length + 1) / 2;
                float[] m = new float[n];
                float[] x = new float[n];
                for (int j = 0; j < n; j++) {
                    int a = 2 * j;
                    int b = Math.min(a + 1, pm.length - 1);
                    m[j] = Math.min(pm[a], pm[b]);
                    x[j] = Math.max(px[a], px[b]);
                }
                mins[k] = m;
                maxs[k] = x;
            }
        }
        return new MinMaxPyramid(samples, length, mins, maxs);
    }

    /**
     * Number of samples covered.
     *
     * @return the length
     */
    public int length() {
        return length;
    }

    /**
     * Minimum and maximum of samples {@code [from, to)}.
     *
     * @param from first sample, inclusive, {@code 0 <= from < to <= length}
     * @param to   last sample, exclusive
     * @param out  receives {@code out[0] = min}, {@code out[1] = max}, volts
     */
    public void range(int from, int to, float[] out) {
        if (from < 0 || to > length || from >= to) {
            throw new IllegalArgumentException("sample range [" + from + ", " + to + ") outside [0, " + length + ")");
        }
        float lo = Float.POSITIVE_INFINITY;
        float hi = Float.NEGATIVE_INFINITY;
        int a = (from + BUCKET - 1) / BUCKET;
        int b = to / BUCKET;
        if (a >= b) {
            for (int i = from; i < to; i++) {
                lo = Math.min(lo, samples[i]);
                hi = Math.max(hi, samples[i]);
            }
        } else {
            for (int i = from; i < a * BUCKET; i++) {
                lo = Math.min(lo, samples[i]);
                hi = Math.max(hi, samples[i]);
            }
            for (int i = b * BUCKET; i < to; i++) {
                lo = Math.min(lo, samples[i]);
                hi = Math.max(hi, samples[i]);
            }
            int k = 0;
            while (a < b) {
                float[] m = mins[k];
                float[] x = maxs[k];
                if ((a & 1) != 0) {
                    lo = Math.min(lo, m[a]);
                    hi = Math.max(hi, x[a]);
                    a++;
                }
                if ((b & 1) != 0) {
                    b--;
                    lo = Math.min(lo, m[b]);
                    hi = Math.max(hi, x[b]);
                }
                a >>= 1;
                b >>= 1;
                k++;
            }
        }
        out[0] = lo;
        out[1] = hi;
    }
}
