package org.lanesift.plugins.dualedge;

import java.util.Arrays;
import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Severity;

/**
 * Turns the raw transitions of the clock lane into accepted clock edges with a tracked period.
 *
 * <p>Acquisition: the period is the median of the same-direction intervals among the next
 * {@link #ACQUIRE_EDGES} transitions (median: a few glitches or a gap do not move it), and the duty
 * cycle the median high time over it. Tracking: a pulse shorter than {@code glitchFraction} periods
 * is a runt and both its edges are removed; of two such pulses in a row the narrower goes first, so
 * a runt just after a true edge does not take that edge with it. An edge is final once the next
 * transition is at least that far away. A final edge whose same-direction interval or edge-to-edge gap exceeds
 * {@code dropoutPeriods} periods is a dropout: the clock is acquired again from that edge. The
 * period is then tracked as an exponential average of same-direction intervals with weight
 * {@link #ALPHA}. A transition in an unknown span or at its end ({@link EdgeQueue#levelOnly}) only
 * tells the level and is skipped: acquisition starts at the first true edge, and tracking compares
 * the true edges either side of it.
 *
 * <p>Every decision depends only on transitions, never on where the blocks were cut.
 */
final class ClockRecovery {
    static final int ACQUIRE_EDGES = 33;
    static final double ALPHA = 1.0 / 16;
    static final String TRACK = "clock";

    static final byte RISING = 1;
    static final byte RESTART = 2;
    static final byte SUSPECT = 4;
    static final byte REFERENCE = 8;

    private final SamplerConfig cfg;
    private final EdgeQueue q;
    private final AnnotationQueue notes;

    // accepted edges not yet taken by the planner
    long[] accT = new long[1024];
    double[] accP = new double[1024];
    byte[] accFlags = new byte[1024];
    long[] accIndex = new long[1024];
    int accCount;

    // state
    private boolean acquiring = true;
    private boolean afterDropout;
    private long pos;
    private boolean pending;
    private long pendingT;
    private long pendingRaw;
    private boolean pendingRising;
    boolean haveP;
    double periodFs = Double.NaN;
    private boolean haveLast;
    private long lastFinalT;
    private boolean lastFinalRising;
    private final long[] lastSame = new long[2];
    private final boolean[] haveSame = new boolean[2];
    boolean inverted;
    private boolean dutyDecided;
    private boolean finished;
    private boolean pausedFull;
    private long timeLimit = Long.MAX_VALUE;
    private int maxAccepted = Integer.MAX_VALUE;
    private static final int TRACK_DONE = 0;
    private static final int TRACK_PAUSED = 1;
    private static final int TRACK_REACQUIRE = 2;
    private boolean stoppedAtEnd;
    private boolean gaveUp;

    // statistics
    long accepted;
    long referenceEdges;
    long glitches;
    long dropouts;
    long restarts;
    long periodCount;
    private double periodRef;
    private double periodSum;
    private double periodSumSq;
    double periodMin = Double.POSITIVE_INFINITY;
    double periodMax = Double.NEGATIVE_INFINITY;
    long dutyCount;
    double dutySum;
    double dutyMin = Double.POSITIVE_INFINITY;
    double dutyMax = Double.NEGATIVE_INFINITY;
    double acquiredDuty = Double.NaN;
    long firstEdgeFs = Long.MIN_VALUE;
    String patternVerdict = "";

    private final double glitchFraction;
    private final double dropoutPeriods;
    private final boolean multiplied;

    ClockRecovery(SamplerConfig cfg, EdgeQueue q, AnnotationQueue notes) {
        this.cfg = cfg;
        this.glitchFraction = cfg.glitchFraction();
        this.dropoutPeriods = cfg.dropoutPeriods();
        this.multiplied = cfg.mode() == SamplerConfig.Mode.MULTIPLIED;
        this.q = q;
        this.notes = notes;
    }

    /**
     * Advances as far as the known transitions allow.
     *
     * @param horizon   every clock transition before this time is known
     * @param finishing true when no more input will come
     */
    boolean run(long horizon, boolean finishing) {
        return run(horizon, finishing, Long.MAX_VALUE, Integer.MAX_VALUE);
    }

    /**
     * Advances as far as the known transitions allow, pausing early to keep the working set small.
     *
     * @param horizon     every clock transition before this time is known
     * @param finishing   true when no more input will come
     * @param timeLimit   do not look at transitions later than this (ignored when finishing)
     * @param maxAccepted pause once this many accepted edges wait for the planner
     * @return true if it paused because {@code maxAccepted} edges are waiting (call again)
     */
    boolean run(long horizon, boolean finishing, long timeLimit, int maxAccepted) {
        pausedFull = false;
        this.timeLimit = finishing ? Long.MAX_VALUE : timeLimit;
        this.maxAccepted = maxAccepted;
        if (!q.started || gaveUp) {
            if (finishing) {
                finish(horizon);
            }
            return false;
        }
        boolean paused = false;
        while (true) {
            if (acquiring) {
                int r = acquire(finishing);
                if (r == WAIT) {
                    break;
                }
                if (r == RETRY) {
                    continue;
                }
            }
            int t = track(horizon, finishing);
            if (t == TRACK_PAUSED) {
                paused = true;
                break;
            }
            if (t == TRACK_DONE) {
                break;
            }
            // a dropout sent the tracker back to acquisition
        }
        if (finishing && !paused) {
            finish(horizon);
        }
        q.discardBefore(pending ? pendingRaw : pos);
        if (haveLast) {
            q.discardSpansBefore(lastFinalT - (haveP ? (long) (2 * periodFs) : 0));
        }
        return pausedFull;
    }

    private void finish(long horizon) {
        if (finished) {
            return;
        }
        finished = true;
        if (!q.started || (accepted == 0 && !haveP)) {
            long at = q.started ? q.startFs : 0;
            String what = !q.started || q.globalEnd() == 0 ? "no clock edges in the capture"
                    : "only " + q.globalEnd() + " clock edges: too few to find the period";
            notes.add(Annotation.on(TRACK, "clock-absent").span(at, Math.max(at, q.started ? q.endFs : at)).label(what)
                    .severity(Severity.ERROR).build());
            return;
        }
        if (haveLast && !pending && !afterDropout && q.endFs > lastFinalT + cfg.dropoutPeriods() * periodFs) {
            stoppedAtEnd = true;
            dropouts++;
            notes.add(Annotation.on(TRACK, "clock-dropout").span(lastFinalT, q.endFs).label("clock stopped")
                    .severity(Severity.ERROR).number("gapFs", q.endFs - lastFinalT, "fs")
                    .number("periods", (q.endFs - lastFinalT) / periodFs, "").build());
        }
    }

    private static final int WAIT = 0;
    private static final int ACQUIRED = 1;
    private static final int RETRY = 2;

    private int acquire(boolean finishing) {
        long end = q.globalEnd();
        // a transition that ends an unknown span is no clock edge: the clock starts at the first true one
        while (pos < end && q.levelOnly(q.time(pos))) {
            pos++;
        }
        long avail = end - pos;
        if (avail == 0 || (avail < ACQUIRE_EDGES && !finishing)) {
            return WAIT;
        }
        int w = (int) Math.min(avail, ACQUIRE_EDGES);
        double duty = Double.NaN;
        if (w >= 3) {
            double[] iv = new double[w - 2];
            for (int i = 0; i < w - 2; i++) {
                iv[i] = q.time(pos + i + 2) - q.time(pos + i);
            }
            double p = median(iv, iv.length);
            if (!(p > 0)) {
                if (!haveP) {
                    // all same-direction intervals are zero: not a clock
                    pos += w;
                    return RETRY;
                }
            } else {
                periodFs = p;
                haveP = true;
            }
            double[] hi = new double[w];
            int nh = 0;
            for (int i = 0; i < w - 1; i++) {
                if (q.rising(pos + i)) {
                    hi[nh++] = q.time(pos + i + 1) - q.time(pos + i);
                }
            }
            if (nh > 0) {
                duty = median(hi, nh) / periodFs;
            }
        } else if (!haveP) {
            gaveUp = true;
            pos = end;
            return WAIT;
        }
        if (cfg.phaseIsUi() || Math.abs(cfg.phaseFs()) <= periodFs / cfg.uiPerPeriod()) {
            // fine
        } else {
            throw new org.lanesift.plugin.OptionException("phase", "option 'phase' of plugin '" + DualEdgePlugin.ID + "': " + fmt(cfg.phaseFs())
                    + " fs is more than one unit interval (" + fmt(periodFs / cfg.uiPerPeriod()) + " fs) of the recovered clock");
        }
        long at = q.time(pos);
        boolean first = accepted == 0 && restarts == 0 && !afterDropout;
        if (first) {
            acquiredDuty = duty;
        }
        if (cfg.mode() == SamplerConfig.Mode.MULTIPLIED) {
            decidePattern(duty, at);
        }
        Annotation.Builder b = Annotation.on(TRACK, first ? "clock-acquired" : "clock-restart")
                .span(at, at).severity(Severity.INFO)
                .label(String.format(Locale.ROOT, "%s clock %.6g MHz", first ? "acquired" : "restarted", 1e9 / periodFs))
                .number("periodFs", periodFs, "fs").number("frequencyHz", 1e15 / periodFs, "Hz");
        if (!Double.isNaN(duty)) {
            b.number("duty", duty, "");
        }
        notes.add(b.build());
        if (!first) {
            restarts++;
        }
        acquiring = false;
        return ACQUIRED;
    }

    private void decidePattern(double duty, long at) {
        int n = cfg.slots();
        double expect = cfg.highSlots() / (double) n;
        double inv = 1 - expect;
        boolean wasInverted = inverted;
        boolean firstDecision = !dutyDecided;
        String ratio = cfg.highSlots() + "/" + n;
        String invRatio = (n - cfg.highSlots()) + "/" + n;
        if (Double.isNaN(duty)) {
            if (firstDecision) {
                patternVerdict = "duty cycle not measurable: clock taken as not inverted";
                notes.add(Annotation.on(TRACK, "clock-duty-unexpected").span(at, at).severity(Severity.WARNING)
                        .label("duty cycle not measurable; clock taken as not inverted").build());
            }
            dutyDecided = true;
            return;
        }
        boolean nearInv = cfg.highSlots() * 2 != n && Math.abs(duty - inv) < Math.abs(duty - expect);
        double off = Math.min(Math.abs(duty - expect), Math.abs(duty - inv));
        inverted = nearInv;
        dutyDecided = true;
        String slot0 = cfg.slot0AfterRef() + "/" + n + " period after each " + (inverted ? "falling" : "rising") + " edge";
        if (off > 0.3 / n) {
            patternVerdict = String.format(Locale.ROOT, "duty %.4f matches neither %s nor %s; taken as %s, slot 0 starts %s",
                    duty, ratio, invRatio, inverted ? "inverted" : "not inverted", slot0);
            notes.add(Annotation.on(TRACK, "clock-duty-unexpected").span(at, at).severity(Severity.WARNING)
                    .label(String.format(Locale.ROOT, "duty %.3f, expected %s", duty, ratio)).number("duty", duty, "")
                    .build());
        } else if (inverted) {
            patternVerdict = String.format(Locale.ROOT, "duty %.4f matches %s: clock lane inverted, slot 0 starts %s",
                    duty, invRatio, slot0);
            if (firstDecision || !wasInverted) {
                notes.add(Annotation.on(TRACK, "clock-inverted").span(at, at).severity(Severity.WARNING)
                        .label(String.format(Locale.ROOT, "clock inverted (duty %.3f = %s high)", duty, invRatio))
                        .number("duty", duty, "").build());
            }
        } else {
            patternVerdict = String.format(Locale.ROOT, "duty %.4f matches %s (pattern %s): slot 0 starts %s",
                    duty, ratio, cfg.pattern(), slot0);
            if (firstDecision || wasInverted) {
                notes.add(Annotation.on(TRACK, "clock-pattern").span(at, at).severity(Severity.INFO)
                        .label(String.format(Locale.ROOT, "duty %.3f = %s high: slot 0 found", duty, ratio))
                        .number("duty", duty, "").text("pattern", cfg.pattern()).build());
            }
        }
    }

    /** @return {@link #TRACK_DONE}, {@link #TRACK_PAUSED}, or {@link #TRACK_REACQUIRE} after a dropout */
    private int track(long horizon, boolean finishing) {
        final long end = q.globalEnd();
        final long[] tt = q.t;
        final long base = q.base;
        while (pos < end) {
            if (pending && haveLast && !afterDropout && haveSame[0] && haveSame[1] && periodCount > 0 && !q.hasSpans()) {
                steady(tt, base, end);
                if (pos >= end) {
                    break;
                }
            }
            final long t = tt[(int) (pos - base)];
            final double minW = glitchFraction * periodFs;
            if (accCount >= maxAccepted) {
                pausedFull = true;
                return TRACK_PAUSED;
            }
            if (t > timeLimit) {
                return TRACK_PAUSED;
            }
            if (q.levelOnly(t)) {
                // the transition ending an unknown span tells the level after it, not an edge time:
                // it takes no part in the period, the dropout check or the glitch check, and it
                // does not make the edge before it a runt
                if (pending && !finalizePending()) {
                    return TRACK_REACQUIRE;
                }
                pos++;
                continue;
            }
            if (pending) {
                long w = t - pendingT;
                if (w < minW) {
                    // (pending, t) is a runt unless (t, next) is narrower still: remove the narrower pulse
                    if (pos + 1 < end) {
                        long t2 = tt[(int) (pos + 1 - base)];
                        if (t2 - t <= w && !q.levelOnly(t2)) {
                            glitch(t, t2);
                            pos += 2;
                            continue;
                        }
                    } else if (!finishing && horizon <= t + w) {
                        return TRACK_DONE; // the next transition decides; wait for it
                    }
                    glitch(pendingT, t);
                    pending = false;
                    pos++;
                    continue;
                }
                if (!finalizePending()) {
                    return TRACK_REACQUIRE;
                }
            }
            pending = true;
            pendingT = t;
            pendingRaw = pos;
            pendingRising = q.rising(pos);
            pos++;
        }
        if (pending && (finishing || horizon > pendingT + glitchFraction * periodFs)) {
            return finalizePending() ? TRACK_DONE : TRACK_REACQUIRE;
        }
        return TRACK_DONE;
    }

    /**
     * The steady state of {@link #track}: the same decisions as the general loop for edges that are
     * neither glitch candidates nor dropouts, with the state held in locals. Stops (leaving the rest
     * to the general loop) at the first edge that needs anything else.
     */
    private void steady(long[] tt, long base, long end) {
        final double alpha = ALPHA;
        final double gf = glitchFraction;
        final double dp = dropoutPeriods;
        final long tl = timeLimit;
        final boolean mult = multiplied;
        final boolean inv = inverted;
        final boolean init = q.initialLevel;
        final long[] aT = accT;
        final double[] aP = accP;
        final byte[] aF = accFlags;
        final long[] aI = accIndex;
        final int lim = Math.min(maxAccepted, aT.length);
        final double ref = periodRef;
        double period = periodFs;
        long pT = pendingT;
        boolean pR = pendingRising;
        long pRaw = pendingRaw;
        long lastT = lastFinalT;
        boolean lastR = lastFinalRising;
        long lsR = lastSame[1];
        long lsF = lastSame[0];
        int ac = accCount;
        long acc = accepted;
        long refs = referenceEdges;
        long pc = periodCount;
        double pSum = periodSum;
        double pSq = periodSumSq;
        double pMin = periodMin;
        double pMax = periodMax;
        long dc = dutyCount;
        double dSum = dutySum;
        double dMin = dutyMin;
        double dMax = dutyMax;
        long p = pos;
        while (p < end && ac < lim) {
            final long t = tt[(int) (p - base)];
            if (t > tl || t - pT < gf * period) {
                break;
            }
            final double dl = dp * period;
            final long same = pR ? lsR : lsF;
            if (pT - lastT > dl || pT - same > dl) {
                break;
            }
            final double iv = pT - same;
            period += (iv - period) * alpha;
            pc++;
            final double dv = iv - ref;
            pSum += dv;
            pSq += dv * dv;
            pMin = iv < pMin ? iv : pMin;
            pMax = iv > pMax ? iv : pMax;
            if (!pR && lastR) {
                double duty = (pT - lastT) / period;
                dc++;
                dSum += duty;
                dMin = duty < dMin ? duty : dMin;
                dMax = duty > dMax ? duty : dMax;
            }
            final boolean reference = mult ? pR != inv : pR;
            aT[ac] = pT;
            aP[ac] = period;
            aF[ac] = (byte) ((pR ? RISING : 0) | (reference ? REFERENCE : 0));
            aI[ac] = mult ? (reference ? refs : -1) : acc;
            ac++;
            acc++;
            if (reference) {
                refs++;
            }
            if (pR) {
                lsR = pT;
            } else {
                lsF = pT;
            }
            lastT = pT;
            lastR = pR;
            pT = t;
            pR = init ^ ((p & 1) == 0);
            pRaw = p;
            p++;
        }
        periodFs = period;
        pendingT = pT;
        pendingRising = pR;
        pendingRaw = pRaw;
        lastFinalT = lastT;
        lastFinalRising = lastR;
        lastSame[1] = lsR;
        lastSame[0] = lsF;
        accCount = ac;
        accepted = acc;
        referenceEdges = refs;
        periodCount = pc;
        periodSum = pSum;
        periodSumSq = pSq;
        periodMin = pMin;
        periodMax = pMax;
        dutyCount = dc;
        dutySum = dSum;
        dutyMin = dMin;
        dutyMax = dMax;
        pos = p;
    }

    private void glitch(long a, long b) {
        glitches++;
        notes.add(Annotation.on(TRACK, "clock-glitch").span(a, b).severity(Severity.WARNING)
                .label("clock glitch ignored").number("widthFs", b - a, "fs").build());
    }

    private boolean finalizePending() {
        final long t = pendingT;
        final boolean rising = pendingRising;
        final int d = rising ? 1 : 0;
        boolean restart = false;
        if (afterDropout) {
            restart = true;
        } else if (haveLast) {
            double limit = dropoutPeriods * periodFs;
            if (t - lastFinalT > limit || (haveSame[d] && t - lastSame[d] > limit)) {
                dropouts++;
                notes.add(Annotation.on(TRACK, "clock-dropout").span(lastFinalT, t).severity(Severity.ERROR)
                        .label("clock dropout").number("gapFs", t - lastFinalT, "fs")
                        .number("periods", (t - lastFinalT) / periodFs, "").build());
                afterDropout = true;
                acquiring = true;
                pos = pendingRaw;
                pending = false;
                haveSame[0] = false;
                haveSame[1] = false;
                return false;
            }
        }
        boolean suspect = q.hasSpans() && q.spanOverlaps(haveLast ? lastFinalT : t - (long) periodFs, t);
        if (haveSame[d]) {
            double iv = t - lastSame[d];
            periodFs += (iv - periodFs) * ALPHA;
            if (periodCount == 0) {
                periodRef = iv;
            }
            periodCount++;
            double dv = iv - periodRef;
            periodSum += dv;
            periodSumSq += dv * dv;
            if (iv < periodMin) {
                periodMin = iv;
            }
            if (iv > periodMax) {
                periodMax = iv;
            }
        }
        if (!rising && haveLast && lastFinalRising && !restart) {
            double duty = (t - lastFinalT) / periodFs;
            dutyCount++;
            dutySum += duty;
            if (duty < dutyMin) {
                dutyMin = duty;
            }
            if (duty > dutyMax) {
                dutyMax = duty;
            }
        }
        boolean reference = multiplied ? rising != inverted : rising;
        if (accCount == accT.length) {
            int n = accT.length * 2;
            accT = Arrays.copyOf(accT, n);
            accP = Arrays.copyOf(accP, n);
            accFlags = Arrays.copyOf(accFlags, n);
            accIndex = Arrays.copyOf(accIndex, n);
        }
        accT[accCount] = t;
        accP[accCount] = periodFs;
        accFlags[accCount] = (byte) ((rising ? RISING : 0) | (restart ? RESTART : 0) | (suspect ? SUSPECT : 0)
                | (reference ? REFERENCE : 0));
        accIndex[accCount] = multiplied ? (reference ? referenceEdges : -1) : accepted;
        accCount++;
        if (firstEdgeFs == Long.MIN_VALUE) {
            firstEdgeFs = t;
        }
        accepted++;
        if (reference) {
            referenceEdges++;
        }
        lastSame[d] = t;
        haveSame[d] = true;
        lastFinalT = t;
        lastFinalRising = rising;
        haveLast = true;
        afterDropout = false;
        pending = false;
        return true;
    }

    /**
     * Whether a dropout follows the last accepted edge.
     *
     * @param horizon every clock transition before this time is known
     * @return 1 yes, 0 no (the capture ended first), -1 not known yet
     */
    int gapAfterLast(long horizon) {
        if (afterDropout || stoppedAtEnd) {
            return 1;
        }
        if (finished) {
            return 0;
        }
        if (haveP && haveLast) {
            double limit = cfg.dropoutPeriods() * periodFs;
            if (pending ? pendingT - lastFinalT > limit : (pos >= q.globalEnd() && horizon > lastFinalT + limit)) {
                return 1;
            }
        }
        return -1;
    }

    /**
     * The earliest time an edge not yet accepted can have.
     *
     * @param horizon clock horizon
     * @return femtoseconds
     */
    long frontierFs(long horizon) {
        if (pending) {
            return pendingT;
        }
        if (pos < q.globalEnd()) {
            return q.time(pos);
        }
        return horizon;
    }

    long lastAcceptedFs() {
        return haveLast ? lastFinalT : Long.MIN_VALUE;
    }

    /** Drops the first {@code n} accepted edges (the planner took them). */
    void consumed(int n) {
        System.arraycopy(accT, n, accT, 0, accCount - n);
        System.arraycopy(accP, n, accP, 0, accCount - n);
        System.arraycopy(accFlags, n, accFlags, 0, accCount - n);
        System.arraycopy(accIndex, n, accIndex, 0, accCount - n);
        accCount -= n;
    }

    double periodMean() {
        return periodCount > 0 ? periodRef + periodSum / periodCount : periodFs;
    }

    double periodStd() {
        if (periodCount < 2) {
            return 0;
        }
        double v = (periodSumSq - periodSum * periodSum / periodCount) / (periodCount - 1);
        return Math.sqrt(Math.max(0, v));
    }

    boolean finished() {
        return finished;
    }

    static double median(double[] v, int n) {
        double[] c = Arrays.copyOf(v, n);
        Arrays.sort(c);
        return (n & 1) == 1 ? c[n / 2] : 0.5 * (c[n / 2 - 1] + c[n / 2]);
    }

    private static String fmt(double fs) {
        return String.format(Locale.ROOT, "%.0f", fs);
    }
}
