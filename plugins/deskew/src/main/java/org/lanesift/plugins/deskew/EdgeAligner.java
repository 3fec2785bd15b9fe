package org.lanesift.plugins.deskew;

import java.util.Arrays;
import org.lanesift.data.Edges;

/**
 * Streams data-lane transitions against a reference edge stream and histograms their phase.
 *
 * <ul>
 * <li>{@link Mode#CLOCK}: the reference is a clock; its rising edges (or, with {@code ddr}, every
 * edge) bound the intervals. A data transition at {@code t} between reference edges {@code a} and
 * {@code b} has phase {@code (t - a) / (b - a)}. Intervals outside 0.6 to 1.4 times the nominal
 * interval (the median of the first 255) are taken for clock gaps and skipped.</li>
 * <li>{@link Mode#LANES}: the reference is lane 0's transitions; a transition at {@code t} on
 * another lane is compared with the nearer lane-0 transition {@code r}: phase
 * {@code (t - r) / UI} folded into one unit interval. Pairs further apart than 4 UI are skipped.
 * The unit interval is given, or estimated from lane 0's first 4000 transition intervals (all
 * are whole multiples of the UI).</li>
 * </ul>
 * Data transitions wait until the reference has passed them, so the inputs may arrive in any
 * interleaving; memory holds only what one input is ahead of another.
 */
final class EdgeAligner {
    enum Mode { CLOCK, LANES }

    static final int NOMINAL_INTERVALS = 255;
    static final int UI_INTERVALS = 4000;
    static final double MAX_PAIR_UI = 4;
    /** Most reference edges kept for lanes that lag behind. */
    static final int MAX_REFERENCE = 1 << 22;

    private final Mode mode;
    private final boolean ddr;
    private final int lanes;
    private double periodFs;      // nominal clock interval (CLOCK) or UI (LANES); NaN until known
    private final boolean givenPeriod;
    private final int bitsPerClock; // LANES: bits per clock period when lane 0 is a clock, 0 unknown
    private UnitIntervalSource.Finding uiFinding; // LANES with the UI estimated: how it was found, null until known

    private long[] ref = new long[1024];
    private long refBase;         // global index of ref[0]
    private int refLen;
    private boolean referenceSeen;      // a reference block arrived

    private final long[][] pend;
    private final int[] pendHead;
    private final int[] pendLen;
    private final long[] cursor;  // global index of the first reference edge after the lane's last processed transition
    private final PhaseHistogram[] hist;
    private final double[] intervalSum;
    private final long[] rejected;
    private final long[] outside;
    private boolean finished;

    /**
     * Creates an aligner.
     *
     * @param mode     clock or lanes
     * @param lanes    number of data lanes compared with the reference
     * @param ddr      CLOCK: both clock edges bound intervals
     * @param periodFs LANES: the unit interval, or 0 to estimate it
     */
    EdgeAligner(Mode mode, int lanes, boolean ddr, double periodFs) {
        this(mode, lanes, ddr, periodFs, 0);
    }

    /**
     * Creates an aligner.
     *
     * @param mode         clock or lanes
     * @param lanes        number of data lanes compared with the reference
     * @param ddr          CLOCK: both clock edges bound intervals
     * @param periodFs     LANES: the unit interval, or 0 to estimate it
     * @param bitsPerClock LANES with the unit interval estimated: bits per clock period when lane 0
     *                     turns out to be a clock, 0 to derive them from the clock's shape
     */
    EdgeAligner(Mode mode, int lanes, boolean ddr, double periodFs, int bitsPerClock) {
        this.mode = mode;
        this.bitsPerClock = bitsPerClock;
        this.lanes = lanes;
        this.ddr = ddr;
        this.givenPeriod = periodFs > 0;
        this.periodFs = periodFs > 0 ? periodFs : Double.NaN;
        pend = new long[lanes][16];
        pendHead = new int[lanes];
        pendLen = new int[lanes];
        cursor = new long[lanes];
        hist = new PhaseHistogram[lanes];
        for (int i = 0; i < lanes; i++) {
            hist[i] = new PhaseHistogram();
        }
        intervalSum = new double[lanes];
        rejected = new long[lanes];
        outside = new long[lanes];
    }

    /**
     * The next block of the reference (clock, or lane 0).
     *
     * @param e edges
     */
    void reference(Edges e) {
        final int n = e.count();
        final long[] t = e.timesFs();
        ensureRef(refLen + n);
        if (mode == Mode.CLOCK && !ddr) {
            // rising edges: transition i is rising when the level after it is high
            int first = e.initialLevel() ? 1 : 0;
            for (int i = first; i < n; i += 2) {
                ref[refLen++] = t[i];
            }
        } else {
            System.arraycopy(t, 0, ref, refLen, n);
            refLen += n;
        }
        referenceSeen = true;
        if (Double.isNaN(periodFs)) {
            tryNominal(false);
        }
        for (int l = 0; l < lanes; l++) {
            drain(l);
        }
        compact();
    }

    /**
     * The next block of a data lane.
     *
     * @param lane lane index 0..lanes-1
     * @param e    edges
     */
    void data(int lane, Edges e) {
        final int n = e.count();
        int from = 0;
        if (pendHead[lane] == pendLen[lane]) {
            // nothing waiting: work straight from the block, keep only what the reference has not passed yet
            pendHead[lane] = 0;
            pendLen[lane] = 0;
            from = drain(lane, e.timesFs(), 0, n);
            if (from == n) {
                compact();
                return;
            }
        }
        int len = pendLen[lane];
        int head = pendHead[lane];
        long[] p = pend[lane];
        int add = n - from;
        if (len + add > p.length) {
            long[] q = new long[Math.max(p.length * 2, len - head + add)];
            System.arraycopy(p, head, q, 0, len - head);
            p = q;
            pend[lane] = q;
            len -= head;
            head = 0;
            pendHead[lane] = 0;
        }
        System.arraycopy(e.timesFs(), from, p, len, add);
        pendLen[lane] = len + add;
        drain(lane);
        compact();
    }

    /** Processes what is left; transitions after the last reference edge are handled as far as possible. */
    void finish() {
        finished = true;
        if (Double.isNaN(periodFs)) {
            tryNominal(true);
        }
        for (int l = 0; l < lanes; l++) {
            drain(l);
        }
    }

    private void ensureRef(int cap) {
        if (cap > ref.length) {
            ref = Arrays.copyOf(ref, Math.max(cap, ref.length * 2));
        }
    }

    private void tryNominal(boolean atEnd) {
        int need = mode == Mode.CLOCK ? NOMINAL_INTERVALS : UI_INTERVALS;
        int have = refLen - 1;
        if (have < need && !atEnd) {
            return;
        }
        int m = Math.min(have, need);
        if (m < (mode == Mode.CLOCK ? 3 : 20)) {
            return; // not enough to know; results stay empty
        }
        long[] d = new long[m];
        for (int i = 0; i < m; i++) {
            d[i] = ref[i + 1] - ref[i];
        }
        Arrays.sort(d);
        if (mode == Mode.CLOCK) {
            periodFs = d[m / 2];
            return;
        }
        long[] seq = new long[m];
        for (int i = 0; i < m; i++) {
            seq[i] = ref[i + 1] - ref[i]; // d is sorted; the clock test needs the order
        }
        UnitIntervalSource.Finding f = UnitIntervalSource.fromReference(seq, bitsPerClock);
        if (f != null) {
            uiFinding = f;
            periodFs = f.unitIntervalFs() > 0 ? f.unitIntervalFs() : Double.NaN;
            return;
        }
        double u = d[m / 20];
        if (!(u > 0)) {
            u = d[m / 2];
        }
        for (int it = 0; it < 4 && u > 0; it++) {
            int maxMult = it == 0 ? 4 : 16;
            double sd = 0;
            long sn = 0;
            for (long x : d) {
                long k = Math.round(x / u);
                if (k >= 1 && k <= maxMult) {
                    sd += x;
                    sn += k;
                }
            }
            if (sn == 0) {
                break;
            }
            u = sd / sn;
        }
        periodFs = u > 0 ? u : Double.NaN;
        uiFinding = new UnitIntervalSource.Finding(periodFs, 0, 0, "estimated from the intervals between lane0 transitions");
    }

    /**
     * How the unit interval was found when it was not given (LANES only).
     *
     * @return the finding, or null while unknown or when the interval was given
     */
    UnitIntervalSource.Finding unitIntervalFinding() {
        return uiFinding;
    }

    private void drain(int lane) {
        int i = drain(lane, pend[lane], pendHead[lane], pendLen[lane]);
        if (i >= pendLen[lane]) {
            pendHead[lane] = 0;
            pendLen[lane] = 0;
        } else {
            pendHead[lane] = i;
        }
    }

    /** Processes transitions {@code p[from, len)} of a lane as far as the reference allows; returns the index reached. */
    private int drain(int lane, final long[] p, int from, final int len) {
        if (Double.isNaN(periodFs)) {
            return from;
        }
        final long[] r = ref;
        final long base = refBase;
        final long end = refBase + refLen;
        final PhaseHistogram h = hist[lane];
        final double per = periodFs;
        long cur = cursor[lane];
        if (cur < base) {
            cur = base;
        }
        int i = from;
        double ivSum = intervalSum[lane];
        long rej = rejected[lane];
        long out = outside[lane];
        if (mode == Mode.CLOCK) {
            final double lo = 0.6 * per;
            final double hi = 1.4 * per;
            for (; i < len; i++) {
                long t = p[i];
                while (cur < end && r[(int) (cur - base)] <= t) {
                    cur++;
                }
                if (cur == end) {
                    if (!finished) {
                        break;
                    }
                    out++;
                    continue;
                }
                if (cur - 1 < base) {
                    out++;
                    continue;
                }
                long a = r[(int) (cur - 1 - base)];
                long b = r[(int) (cur - base)];
                long iv = b - a;
                if (iv < lo || iv > hi) {
                    rej++;
                    continue;
                }
                h.add((t - a) / (double) iv);
                ivSum += iv;
            }
        } else {
            final double far = MAX_PAIR_UI * per;
            final double inv = 1.0 / per;
            for (; i < len; i++) {
                long t = p[i];
                while (cur < end && r[(int) (cur - base)] <= t) {
                    cur++;
                }
                if (cur == end && !finished) {
                    break;
                }
                boolean hasPrev = cur - 1 >= base;
                boolean hasNext = cur < end;
                if (!hasPrev && !hasNext) {
                    out++;
                    continue;
                }
                long dPrev = hasPrev ? t - r[(int) (cur - 1 - base)] : Long.MAX_VALUE;
                long dNext = hasNext ? r[(int) (cur - base)] - t : Long.MAX_VALUE;
                double d = dPrev <= dNext ? dPrev : -(double) dNext;
                if (Math.abs(d) > far) {
                    rej++;
                    continue;
                }
                h.add(d * inv);
                ivSum += per;
            }
        }
        cursor[lane] = cur;
        intervalSum[lane] = ivSum;
        rejected[lane] = rej;
        outside[lane] = out;
        return i;
    }

    /** Drops reference edges no lane needs any more (keeps one before each lane's cursor). */
    private void compact() {
        if (Double.isNaN(periodFs)) {
            return; // keep everything until the nominal interval is known
        }
        long keep = Long.MAX_VALUE;
        for (int l = 0; l < lanes; l++) {
            keep = Math.min(keep, Math.max(refBase, cursor[l] - 1));
        }
        if (refLen - (keep - refBase) > MAX_REFERENCE) {
            // a lane has fallen far behind (or carries no data): bound the memory, that lane loses its oldest pairs
            keep = refBase + refLen - MAX_REFERENCE / 2;
        }
        int drop = (int) Math.min(refLen, keep - refBase);
        if (drop > 0 && drop >= refLen / 2) {
            System.arraycopy(ref, drop, ref, 0, refLen - drop);
            refLen -= drop;
            refBase += drop;
        }
    }

    /** What one lane's histogram says. */
    record Result(long count, double centre, double concentration, int clusters, double intervalFs, long rejected,
                  long outside) {
    }

    Result result(int lane) {
        PhaseHistogram h = hist[lane];
        long n = h.total();
        double iv = n == 0 ? periodFs : intervalSum[lane] / n;
        return new Result(n, h.centre(), h.concentration(), h.clusters(), iv, rejected[lane], outside[lane]);
    }

    /** The nominal clock interval or unit interval in use, NaN if unknown. */
    double periodFs() {
        return periodFs;
    }

    boolean periodGiven() {
        return givenPeriod;
    }

    boolean referenceSeen() {
        return this.referenceSeen;
    }
}
