package org.lanesift.plugins.differential;

import java.util.Arrays;
import org.lanesift.data.EdgeListBuilder;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;

/**
 * Hysteresis comparator over a stream of difference samples (volts), the hot path of the plugin.
 *
 * <p>The difference is {@code a[i] - b[i]} (two legs) or {@code a[i]} (one channel). The output
 * goes high when the difference rises above {@code threshold + hysteresis/2} and low when it falls
 * below {@code threshold - hysteresis/2}. Each such confirmed transition is timed where the signal
 * last crossed the threshold itself before the trip point: the last sample on the old side of the
 * threshold and the one after it are interpolated (linear, or cubic over four samples). When that
 * sample is more than {@link #MAX_BACK} samples back, or the threshold changed in between, the
 * crossing of the trip level is used instead. Results do not depend on how the stream is cut into
 * chunks: everything looked at lies in the past, kept in a ring of recent samples, except the
 * fourth cubic sample, which is waited for when it is in the next chunk.
 *
 * <p>Invalid samples (masked or NaN) never produce transitions. After a run of them the level is
 * set afresh from the first valid sample (above the threshold means high); if it differs from the
 * level before the run, the one level-restoring transition is placed exactly at the end of the
 * unknown span, which runs from half a sample before the first invalid sample to half a sample
 * before the next valid one. Before the first valid sample the level is taken as low. Logic bits of
 * invalid samples hold the previous level.
 */
final class Comparator {
    /** Farthest look-back, in samples, from a trip point to the threshold crossing. */
    static final int MAX_BACK = 1024;
    private static final int RING = 2048;
    private static final int RING_MASK = RING - 1;

    /** Told about each run of invalid samples once it ends. */
    interface GapListener {
        /**
         * One run of invalid samples.
         *
         * @param startIndex   first invalid sample, index from the stream start
         * @param endIndex     first valid sample after the run (or the stream end)
         * @param startFs      start of the unknown span
         * @param endFs        end of the unknown span
         * @param levelChanged whether the level differs after the run
         */
        void gap(long startIndex, long endIndex, long startFs, long endFs, boolean levelChanged);
    }

    private final long originFs;
    private final double periodFs;
    private final boolean cubic;
    private final GapListener gaps;
    private final TimeBase time;

    private float thr;
    private float upper;
    private float lower;
    private long floorIndex;

    private boolean high;
    private boolean anyValid;
    private boolean inInvalid;
    private long invalidStart;
    private long validRunStart;
    private long next;

    private final float[] ring = new float[RING];

    private float[] ca;
    private float[] cb;
    private int cao;
    private int cbo;
    private int clen;
    private long cbase;
    private long[] cinv;
    private long[] cbits;
    private boolean chunkOpen;

    private boolean pending;
    private long pendJ;
    private float pendThr;
    private double pendY0;
    private double pendY1;
    private double pendY2;
    private boolean pendHaveY0;

    /** Transitions and unknown spans found but not yet handed on. */
    private final EdgeListBuilder held = new EdgeListBuilder(256);
    private boolean initialKnown;
    private boolean emittedLevel;
    private long emittedUntil;
    private boolean invert;
    private long transitionsTotal;

    Comparator(long originFs, double periodFs, boolean cubic, GapListener gaps) {
        this.originFs = originFs;
        this.periodFs = periodFs;
        this.cubic = cubic;
        this.gaps = gaps;
        this.time = new TimeBase(originFs, periodFs);
        this.emittedUntil = originFs;
    }

    void setInvert(boolean invert) {
        this.invert = invert;
    }

    boolean invert() {
        return invert;
    }

    /**
     * Sets the threshold and hysteresis from a sample on.
     *
     * @param thresholdVolts  threshold
     * @param hysteresisVolts total width of the hysteresis band
     * @param fromIndex       first sample it applies to
     * @throws IllegalStateException if the threshold or hysteresis is not a finite number (a bug)
     */
    void setThreshold(double thresholdVolts, double hysteresisVolts, long fromIndex) {
        if (!Double.isFinite(thresholdVolts) || !(hysteresisVolts >= 0) || !Double.isFinite(hysteresisVolts)) {
            // a NaN band trips on every sample without advancing: a bug upstream, never bad input
            throw new IllegalStateException("comparator threshold " + thresholdVolts + " V, hysteresis " + hysteresisVolts + " V");
        }
        thr = (float) thresholdVolts;
        float half = (float) (hysteresisVolts / 2);
        upper = thr + half;
        lower = thr - half;
        floorIndex = fromIndex;
    }

    float threshold() {
        return thr;
    }

    float hysteresis() {
        return upper - lower;
    }

    long nextIndex() {
        return next;
    }

    long transitionsTotal() {
        return transitionsTotal;
    }

    /** Time of a fractional sample position, exact to the femtosecond for any capture length. */
    long timeAt(long k, double frac) {
        return time.at(k, frac);
    }

    /**
     * Starts the next chunk of samples. {@code inv} becomes owned (NaN samples are added to it);
     * {@code bits} receives the comparator state of every sample.
     */
    void beginChunk(float[] a, int ao, float[] b, int bo, int len, long[] inv, long[] bits) {
        if (chunkOpen) {
            saveTail();
        }
        ca = a;
        cao = ao;
        cb = b;
        cbo = bo;
        clen = len;
        cinv = inv;
        cbits = bits;
        cbase = next;
        chunkOpen = true;
        if (pending && len > 0) {
            resolvePending(true);
        }
    }

    long[] chunkInvalid() {
        return cinv;
    }

    private void saveTail() {
        int from = Math.max(0, clen - RING);
        for (int i = from; i < clen; i++) {
            float d = cb == null ? ca[cao + i] : ca[cao + i] - cb[cbo + i];
            ring[(int) ((cbase + i) & RING_MASK)] = d;
        }
    }

    private float d(long k) {
        if (k >= cbase) {
            int i = (int) (k - cbase);
            return cb == null ? ca[cao + i] : ca[cao + i] - cb[cbo + i];
        }
        return ring[(int) (k & RING_MASK)];
    }

    private boolean invalidAt(int i) {
        return cinv != null && (cinv[i >>> 6] & (1L << i)) != 0;
    }

    /** Processes samples {@code [s0, s1)} of the current chunk (chunk-relative), in order. */
    void runSegment(int s0, int s1) {
        int i = s0;
        while (i < s1) {
            if (invalidAt(i)) {
                int r = nextValid(i, s1);
                if (!inInvalid) {
                    inInvalid = true;
                    invalidStart = cbase + i;
                }
                if (high) {
                    BitSets.setRange(cbits, i, r);
                }
                i = r;
                continue;
            }
            int r1 = nextInvalid(i, s1);
            if (inInvalid || !anyValid) {
                startValidRun(i);
            }
            int stop = cb == null ? fastRunSingle(i, r1) : fastRunPair(i, r1);
            if (stop < r1) {
                if (cinv == null) {
                    cinv = new long[BitSets.words(clen)];
                }
                cinv[stop >>> 6] |= 1L << stop;
                i = stop;
                continue;
            }
            i = r1;
        }
        next = cbase + s1;
    }

    private int nextValid(int i, int end) {
        while (i < end) {
            long w = ~cinv[i >>> 6] & (-1L << i);
            if (w != 0) {
                int j = ((i >>> 6) << 6) + Long.numberOfTrailingZeros(w);
                return Math.min(j, end);
            }
            i = ((i >>> 6) + 1) << 6;
        }
        return end;
    }

    private int nextInvalid(int i, int end) {
        if (cinv == null) {
            return end;
        }
        while (i < end) {
            long w = cinv[i >>> 6] & (-1L << i);
            if (w != 0) {
                int j = ((i >>> 6) << 6) + Long.numberOfTrailingZeros(w);
                return Math.min(j, end);
            }
            i = ((i >>> 6) + 1) << 6;
        }
        return end;
    }

    private void startValidRun(int i) {
        long k = cbase + i;
        boolean level = d(k) > thr;
        if (inInvalid) {
            long s = Math.max(originFs, timeAt(invalidStart, -0.5));
            long e = timeAt(k, -0.5);
            addSpan(s, e);
            boolean changed = level != high;
            if (changed) {
                addTime(e);
            }
            if (gaps != null) {
                gaps.gap(invalidStart, k, s, e, changed);
            }
            inInvalid = false;
        } else if (!anyValid) {
            // first sample of the stream
            high = level;
            initialKnown = true;
            emittedLevel = level;
        }
        high = level;
        anyValid = true;
        validRunStart = k;
    }

    private int fastRunPair(int r0, int r1) {
        final float[] a = ca;
        final float[] b = cb;
        final int ao = cao;
        final int bo = cbo;
        final long[] bits = cbits;
        final boolean lin = !cubic;
        // samples at or after this chunk index may be looked back at without checks
        final int back = (int) Math.max(3, Math.max(validRunStart, floorIndex) - cbase + 3);
        int i = r0;
        int runStart = r0;
        while (true) {
            if (!high) {
                i = firstAbove(a, ao, b, bo, i, r1, upper);
                if (i >= r1) {
                    return r1;
                }
                float v = a[ao + i] - b[bo + i];
                if (v != v) {
                    return i;
                }
                runStart = i;
                if (lin && i >= back) {
                    // the last sample at or below the threshold is usually one of the three before the trip
                    final float t = thr;
                    float d1 = a[ao + i - 1] - b[bo + i - 1];
                    float d2 = a[ao + i - 2] - b[bo + i - 2];
                    float d3 = a[ao + i - 3] - b[bo + i - 3];
                    int f = (d1 <= t ? 1 : 0) | (d2 <= t ? 2 : 0) | (d3 <= t ? 4 : 0);
                    if (f != 0) {
                        int s = Integer.numberOfTrailingZeros(f) + 1;
                        float y1 = a[ao + i - s] - b[bo + i - s];
                        float y2 = a[ao + i - s + 1] - b[bo + i - s + 1];
                        high = true;
                        addTime(timeAt(cbase + i - s, Crossing.linear(y1, y2, t)));
                        continue;
                    }
                }
                trip(i, true);
            } else {
                i = firstBelow(a, ao, b, bo, i, r1, lower);
                setBits(bits, runStart, i);
                if (i >= r1) {
                    return r1;
                }
                float v = a[ao + i] - b[bo + i];
                if (v != v) {
                    return i;
                }
                if (lin && i >= back) {
                    final float t = thr;
                    float d1 = a[ao + i - 1] - b[bo + i - 1];
                    float d2 = a[ao + i - 2] - b[bo + i - 2];
                    float d3 = a[ao + i - 3] - b[bo + i - 3];
                    int f = (d1 >= t ? 1 : 0) | (d2 >= t ? 2 : 0) | (d3 >= t ? 4 : 0);
                    if (f != 0) {
                        int s = Integer.numberOfTrailingZeros(f) + 1;
                        float y1 = a[ao + i - s] - b[bo + i - s];
                        float y2 = a[ao + i - s + 1] - b[bo + i - s + 1];
                        high = false;
                        addTime(timeAt(cbase + i - s, Crossing.linear(y1, y2, t)));
                        continue;
                    }
                }
                trip(i, false);
            }
        }
    }

    /*
     * The two scans below are methods of their own, not loops inside fastRunPair: called once per
     * transition, they are compiled early and once, and fastRunPair's own loop (one turn per
     * transition) is then compiled with them inlined. As loops inside fastRunPair, each of them ran
     * long enough to be compiled on its own while running (on-stack replacement), so the JIT
     * compiled fastRunPair three or four times on a cold pass (measured with -XX:+LogCompilation
     * on the 960 MB capture of bench/scripts/ddr-capture.py).
     */

    /**
     * The first index in {@code [i, r1)} whose difference is not at or below {@code up} (above it,
     * or NaN), or {@code r1}: four samples a test, and which of them tripped without a further loop.
     */
    private static int firstAbove(float[] a, int ao, float[] b, int bo, int i, int r1, float up) {
        while (i + 4 <= r1) {
            int m = (a[ao + i] - b[bo + i] <= up ? 0 : 1) | (a[ao + i + 1] - b[bo + i + 1] <= up ? 0 : 2)
                    | (a[ao + i + 2] - b[bo + i + 2] <= up ? 0 : 4) | (a[ao + i + 3] - b[bo + i + 3] <= up ? 0 : 8);
            if (m != 0) {
                return i + Integer.numberOfTrailingZeros(m);
            }
            i += 4;
        }
        while (i < r1 && a[ao + i] - b[bo + i] <= up) {
            i++;
        }
        return i;
    }

    /** The first index in {@code [i, r1)} whose difference is not at or above {@code lo} (below it, or NaN), or {@code r1}. */
    private static int firstBelow(float[] a, int ao, float[] b, int bo, int i, int r1, float lo) {
        while (i + 4 <= r1) {
            int m = (a[ao + i] - b[bo + i] >= lo ? 0 : 1) | (a[ao + i + 1] - b[bo + i + 1] >= lo ? 0 : 2)
                    | (a[ao + i + 2] - b[bo + i + 2] >= lo ? 0 : 4) | (a[ao + i + 3] - b[bo + i + 3] >= lo ? 0 : 8);
            if (m != 0) {
                return i + Integer.numberOfTrailingZeros(m);
            }
            i += 4;
        }
        while (i < r1 && a[ao + i] - b[bo + i] >= lo) {
            i++;
        }
        return i;
    }

    /** Sets bits {@code [from, to)}; runs are usually short, so the one-word case comes first. */
    private static void setBits(long[] bits, int from, int to) {
        if (from >= to) {
            return;
        }
        int fw = from >>> 6;
        int lw = (to - 1) >>> 6;
        if (fw == lw) {
            bits[fw] |= (-1L << from) & (-1L >>> -to);
        } else {
            BitSets.setRange(bits, from, to);
        }
    }

    /**
     * {@link #fastRunPair} for one channel (modes single and differential): the same scans and the
     * same short cut for a linear crossing among the three samples before the trip, on the
     * channel's own samples.
     */
    private int fastRunSingle(int r0, int r1) {
        final float[] a = ca;
        final int ao = cao;
        final long[] bits = cbits;
        final boolean lin = !cubic;
        final int back = (int) Math.max(3, Math.max(validRunStart, floorIndex) - cbase + 3);
        int i = r0;
        int runStart = r0;
        while (true) {
            if (!high) {
                i = firstAbove(a, ao, i, r1, upper);
                if (i >= r1) {
                    return r1;
                }
                if (a[ao + i] != a[ao + i]) {
                    return i;
                }
                runStart = i;
                if (lin && i >= back) {
                    final float t = thr;
                    int f = (a[ao + i - 1] <= t ? 1 : 0) | (a[ao + i - 2] <= t ? 2 : 0) | (a[ao + i - 3] <= t ? 4 : 0);
                    if (f != 0) {
                        int s = Integer.numberOfTrailingZeros(f) + 1;
                        high = true;
                        addTime(timeAt(cbase + i - s, Crossing.linear(a[ao + i - s], a[ao + i - s + 1], t)));
                        continue;
                    }
                }
                trip(i, true);
            } else {
                i = firstBelow(a, ao, i, r1, lower);
                setBits(bits, runStart, i);
                if (i >= r1) {
                    return r1;
                }
                if (a[ao + i] != a[ao + i]) {
                    return i;
                }
                if (lin && i >= back) {
                    final float t = thr;
                    int f = (a[ao + i - 1] >= t ? 1 : 0) | (a[ao + i - 2] >= t ? 2 : 0) | (a[ao + i - 3] >= t ? 4 : 0);
                    if (f != 0) {
                        int s = Integer.numberOfTrailingZeros(f) + 1;
                        high = false;
                        addTime(timeAt(cbase + i - s, Crossing.linear(a[ao + i - s], a[ao + i - s + 1], t)));
                        continue;
                    }
                }
                trip(i, false);
            }
        }
    }

    /** {@link #firstAbove(float[], int, float[], int, int, int, float)} of one channel's samples. */
    private static int firstAbove(float[] a, int ao, int i, int r1, float up) {
        while (i + 4 <= r1) {
            int m = (a[ao + i] <= up ? 0 : 1) | (a[ao + i + 1] <= up ? 0 : 2) | (a[ao + i + 2] <= up ? 0 : 4) | (a[ao + i + 3] <= up ? 0 : 8);
            if (m != 0) {
                return i + Integer.numberOfTrailingZeros(m);
            }
            i += 4;
        }
        while (i < r1 && a[ao + i] <= up) {
            i++;
        }
        return i;
    }

    /** {@link #firstBelow(float[], int, float[], int, int, int, float)} of one channel's samples. */
    private static int firstBelow(float[] a, int ao, int i, int r1, float lo) {
        while (i + 4 <= r1) {
            int m = (a[ao + i] >= lo ? 0 : 1) | (a[ao + i + 1] >= lo ? 0 : 2) | (a[ao + i + 2] >= lo ? 0 : 4) | (a[ao + i + 3] >= lo ? 0 : 8);
            if (m != 0) {
                return i + Integer.numberOfTrailingZeros(m);
            }
            i += 4;
        }
        while (i < r1 && a[ao + i] >= lo) {
            i++;
        }
        return i;
    }

    /** A confirmed transition at chunk-relative sample {@code i}. */
    private void trip(int i, boolean rising) {
        long k = cbase + i;
        high = rising;
        long floor = Math.max(Math.max(validRunStart, floorIndex), k - MAX_BACK);
        float t = thr;
        // common case first: the crossing is inside this chunk, read the arrays directly
        int lim = (int) Math.max(0, floor - cbase);
        int jj = i - 1;
        final float[] a = ca;
        final int ao = cao;
        if (cb != null) {
            final float[] b = cb;
            final int bo = cbo;
            if (rising) {
                while (jj >= lim && a[ao + jj] - b[bo + jj] > t) {
                    jj--;
                }
            } else {
                while (jj >= lim && a[ao + jj] - b[bo + jj] < t) {
                    jj--;
                }
            }
        } else {
            if (rising) {
                while (jj >= lim && a[ao + jj] > t) {
                    jj--;
                }
            } else {
                while (jj >= lim && a[ao + jj] < t) {
                    jj--;
                }
            }
        }
        long j;
        if (jj >= lim) {
            j = cbase + jj;
        } else if (lim > 0) {
            j = floor - 1;
        } else {
            // continue in the ring of earlier samples
            j = cbase + lim - 1;
            if (rising) {
                while (j >= floor && !(d(j) <= t)) {
                    j--;
                }
            } else {
                while (j >= floor && !(d(j) >= t)) {
                    j--;
                }
            }
        }
        crossing(i, k, rising, j, floor);
    }

    /** Times the transition tripped at chunk sample {@code i} (stream index {@code k}) whose last old-side sample is {@code j}. */
    private void crossing(int i, long k, boolean rising, long j, long floor) {
        float t = thr;
        if (j < floor) {
            // no threshold crossing within reach: time the crossing of the trip level
            if (k - 1 >= validRunStart) {
                double f = Crossing.linear(d(k - 1), d(k), rising ? upper : lower);
                addTime(timeAt(k - 1, f));
            } else {
                addTime(timeAt(k, 0));
            }
            return;
        }
        double y1 = d(j);
        double y2 = d(j + 1);
        if (!cubic) {
            addTime(timeAt(j, Crossing.linear(y1, y2, t)));
            return;
        }
        boolean haveY0 = j - 1 >= validRunStart && j - 1 >= k - MAX_BACK - 1;
        double y0 = haveY0 ? d(j - 1) : 0;
        if (j + 2 <= k) {
            finishCrossing(j, t, haveY0, y0, y1, y2, true, d(j + 2));
            return;
        }
        // j + 2 == k + 1: the sample after the trip point
        if (i + 1 < clen) {
            boolean ok = !invalidAt(i + 1);
            float y3 = ok ? d(k + 1) : Float.NaN;
            finishCrossing(j, t, haveY0, y0, y1, y2, ok && y3 == y3, y3);
            return;
        }
        pending = true;
        pendJ = j;
        pendThr = t;
        pendHaveY0 = haveY0;
        pendY0 = y0;
        pendY1 = y1;
        pendY2 = y2;
    }

    private void finishCrossing(long j, float t, boolean haveY0, double y0, double y1, double y2, boolean haveY3, double y3) {
        double f = haveY0 && haveY3 ? Crossing.cubic(y0, y1, y2, y3, t) : Crossing.linear(y1, y2, t);
        addTime(timeAt(j, f));
    }

    private void resolvePending(boolean haveNext) {
        pending = false;
        boolean ok = haveNext && !invalidAt(0);
        double y3 = ok ? d(cbase) : Double.NaN;
        finishCrossing(pendJ, pendThr, pendHaveY0, pendY0, pendY1, pendY2, ok && y3 == y3, y3);
    }

    private void addTime(long t) {
        held.addTime(t);
        transitionsTotal++;
    }

    private void addSpan(long s, long e) {
        held.addSpan(s, e);
    }

    /** The earliest time any transition not yet recorded can have. */
    private long safeTime() {
        if (pending) {
            return timeAt(pendJ, 0);
        }
        long e = next;
        if (!anyValid || inInvalid) {
            return Math.max(originFs, timeAt(e, -0.5));
        }
        long floor = Math.max(Math.max(validRunStart, floorIndex), e - MAX_BACK);
        float t = thr;
        for (long k = e - 1; k >= floor; k--) {
            float v = d(k);
            if (high ? v >= t : v <= t) {
                return timeAt(k, 0);
            }
        }
        return timeAt(e - 1, 0);
    }

    /**
     * Emits the edges known so far: a block from the end of the previous one to the earliest time
     * a later transition can have. At the end of the stream it covers up to the time after the
     * last sample.
     *
     * @param channel channel name
     * @param atEnd   the stream has ended
     * @return the block, or null when it would cover nothing
     */
    Edges takeEdges(String channel, boolean atEnd) {
        long safe;
        if (atEnd) {
            if (pending) {
                resolvePending(false);
            }
            if (inInvalid) {
                long s = Math.max(originFs, timeAt(invalidStart, -0.5));
                long e = Math.max(s, timeAt(next, 0));
                addSpan(s, e);
                if (gaps != null) {
                    gaps.gap(invalidStart, next, s, e, false);
                }
                inInvalid = false;
            }
            safe = Math.max(emittedUntil, timeAt(next, 0));
        } else {
            safe = Math.max(emittedUntil, safeTime());
        }
        int n = held.timesBefore(safe);
        if (atEnd && n < held.timeCount()) {
            safe = held.lastTime() + 1;
            n = held.timeCount();
        }
        long start = emittedUntil;
        if (safe <= start && n == 0) {
            return null;
        }
        long[] out = held.removeFirstTimes(n);
        // unknown spans overlapping [start, safe)
        long[] sp = null;
        int sc = 0;
        int spanCount = held.spanCount();
        for (int s = 0; s < spanCount; s++) {
            long a = Math.max(start, held.spanStart(s));
            long z = Math.min(safe, held.spanEnd(s));
            if (z > a) {
                if (sp == null) {
                    sp = new long[2 * spanCount + 2];
                }
                sp[2 * sc] = a;
                sp[2 * sc + 1] = z;
                sc++;
            }
        }
        held.keepSpansEndingAfter(safe);
        if (inInvalid) {
            long a = Math.max(start, Math.max(originFs, timeAt(invalidStart, -0.5)));
            if (safe > a) {
                if (sp == null) {
                    sp = new long[2];
                } else if (sp.length < 2 * sc + 2) {
                    sp = Arrays.copyOf(sp, 2 * sc + 2);
                }
                sp[2 * sc] = a;
                sp[2 * sc + 1] = safe;
                sc++;
            }
        }
        boolean initial = emittedLevel;
        if ((n & 1) != 0) {
            emittedLevel = !emittedLevel;
        }
        emittedUntil = safe;
        return new Edges(channel, start, safe, initial ^ invert, out, n, sp, sc);
    }

    boolean currentLevel() {
        return high;
    }

    boolean initialKnown() {
        return initialKnown;
    }
}
