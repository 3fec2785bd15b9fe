package org.lanesift.viewer;

/**
 * Minimum and maximum of any sample range of one channel in O(log n) steps, so that drawing a
 * waveform costs a few steps per pixel column whatever the zoom. Built once per channel: level 0
 * holds the min and max of each bucket of {@link #BUCKET} samples, each further level the min and
 * max of two neighbours of the level below (the last one alone when the count is odd). A query
 * scans at most {@code 2 * BUCKET} samples at its ends and walks up the levels for the whole
 * buckets in between. At coarse zoom the painter uses {@link #column} instead: whole elements of
 * the one level that fits a pixel column, read in memory order, so neighbouring columns touch
 * neighbouring memory. Min and max of an element sit side by side. Extra memory: n/8 floats for
 * min and max together over all levels (an eighth of the samples' own size).
 *
 * <p>The values are volts; NaN samples are not expected (the capture readers mark bad samples
 * invalid rather than NaN) and would make the answer NaN.
 */
public final class MinMaxPyramid {
    /** Samples per level-0 bucket. */
    public static final int BUCKET = 16;

    private final float[] samples;
    private final int length;
    /** Per level, min and max interleaved ({@code [2j]} min, {@code [2j + 1]} max of element j), so one cache line holds both. */
    private final float[][] levels;

    private MinMaxPyramid(float[] samples, int length, float[][] levels) {
        this.samples = samples;
        this.length = length;
        this.levels = levels;
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
        float[][] mm = new float[levels][];
        if (levels > 0) {
            float[] l0 = new float[2 * buckets];
            for (int b = 0; b < buckets; b++) {
                int s = b * BUCKET;
                float lo = samples[s];
                float hi = lo;
                for (int i = s + 1; i < s + BUCKET; i++) {
                    float v = samples[i];
                    // plain comparisons: no NaN or signed-zero rules to honour in the hot loop
                    lo = v < lo ? v : lo;
                    hi = v > hi ? v : hi;
                }
                l0[2 * b] = lo;
                l0[2 * b + 1] = hi;
            }
            mm[0] = l0;
            for (int k = 1; k < levels; k++) {
                float[] p = mm[k - 1];
                int pn = p.length / 2;
                int n = (pn + 1) / 2;
                float[] x = new float[2 * n];
                for (int j = 0; j < n; j++) {
                    int a = 2 * j;
                    int b = Math.min(a + 1, pn - 1);
                    x[2 * j] = Math.min(p[2 * a], p[2 * b]);
                    x[2 * j + 1] = Math.max(p[2 * a + 1], p[2 * b + 1]);
                }
                mm[k] = x;
            }
        }
        return new MinMaxPyramid(samples, length, mm);
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
                float[] m = levels[k];
                if ((a & 1) != 0) {
                    lo = Math.min(lo, m[2 * a]);
                    hi = Math.max(hi, m[2 * a + 1]);
                    a++;
                }
                if ((b & 1) != 0) {
                    b--;
                    lo = Math.min(lo, m[2 * b]);
                    hi = Math.max(hi, m[2 * b + 1]);
                }
                a >>= 1;
                b >>= 1;
                k++;
            }
        }
        out[0] = lo;
        out[1] = hi;
    }

    /**
     * The coarsest level whose elements span at most half of {@code samplesPerColumn}, for
     * {@link #column}; -1 when a column is narrower than two buckets (then use {@link #range}).
     *
     * @param samplesPerColumn samples one pixel column covers
     * @return a level, or -1
     */
    public int levelFor(double samplesPerColumn) {
        int level = -1;
        while (level + 1 < levels.length && (double) (BUCKET << (level + 1)) * 2 <= samplesPerColumn) {
            level++;
        }
        return level;
    }

    /**
     * First sample a column's envelope covers at a level: {@code from} rounded down to the level's element.
     *
     * @param from  first sample of the column
     * @param level from {@link #levelFor}
     * @return the sample index
     */
    public int alignedFrom(int from, int level) {
        int size = BUCKET << level;
        return Math.min(from, covered()) / size * size;
    }

    /**
     * Sample just after a column's envelope at a level: {@code to} rounded up to the level's
     * element, but not beyond the last full bucket unless {@code to} is.
     *
     * @param to    sample after the column
     * @param level from {@link #levelFor}
     * @return the sample index
     */
    public int alignedTo(int to, int level) {
        int size = BUCKET << level;
        int c = covered();
        if (to >= c) {
            return to;
        }
        return (int) Math.min(c, ((long) to + size - 1) / size * size);
    }

    /**
     * Min and max of the samples {@code [alignedFrom(from), alignedTo(to))}: whole elements of one
     * level read in order (so neighbouring columns read neighbouring memory), plus the tail
     * samples past the last full bucket. A column's envelope at coarse zoom thus reaches less than
     * one element (at most half a column) beyond its own samples; it is exact for that range.
     *
     * @param from  first sample of the column, {@code 0 <= from < to <= length}
     * @param to    sample after the column
     * @param level from {@link #levelFor}, at least 0
     * @param out   receives {@code out[0] = min}, {@code out[1] = max}, volts
     */
    public void column(int from, int to, int level, float[] out) {
        if (from < 0 || to > length || from >= to || level < 0 || level >= levels.length) {
            throw new IllegalArgumentException("column [" + from + ", " + to + ") at level " + level + " outside the pyramid");
        }
        int size = BUCKET << level;
        int c = covered();
        float lo = Float.POSITIVE_INFINITY;
        float hi = Float.NEGATIVE_INFINITY;
        float[] m = levels[level];
        int e0 = alignedFrom(from, level) / size;
        int e1 = (alignedTo(Math.min(to, c), level) + size - 1) / size;
        for (int e = e0; e < e1; e++) {
            lo = Math.min(lo, m[2 * e]);
            hi = Math.max(hi, m[2 * e + 1]);
        }
        for (int i = Math.max(from, c); i < to; i++) {
            lo = Math.min(lo, samples[i]);
            hi = Math.max(hi, samples[i]);
        }
        out[0] = lo;
        out[1] = hi;
    }

    /** Samples inside full level-0 buckets. */
    private int covered() {
        return length / BUCKET * BUCKET;
    }
}
