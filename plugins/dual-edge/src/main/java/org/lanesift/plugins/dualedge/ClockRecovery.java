package org.lanesift.plugins.dualedge;

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

    private static final byte RISING = AcceptedEdges.RISING;
    private static final byte RESTART = AcceptedEdges.RESTART;
    private static final byte SUSPECT = AcceptedEdges.SUSPECT;
    private static final byte REFERENCE = AcceptedEdges.REFERENCE;

    /** Where the recovery stands; see {@link #phase()}. */
    enum Phase {
        /** No clock transition seen yet. */
        WAITING,
        /** Measuring the period from the first transitions. */
        ACQUIRING,
        /** A dropout was found: measuring the period again from the edge after it. */
        REACQUIRING,
        /** Accepting edges and tracking the period. */
        TRACKING,
        /** The clock never had a measurable period; the rest of the input is ignored. */
        GAVE_UP,
        /** The input ended and the end was checked. */
        FINISHED
    }

    /** Whether a dropout follows the last accepted edge ({@link #gapAfterLast}). */
    enum Gap {
        /** A dropout (or the clock stopping before the end of the capture) follows it. */
        YES,
        /** The capture ended first. */
        NO,
        /** Not known until more clock transitions arrive. */
        UNKNOWN
    }

    /** Outcome of one acquisition attempt. */
    private enum Acquire {
        /** Too few transitions yet. */
        WAIT,
        /** The period is known; tracking starts. */
        ACQUIRED,
        /** The transitions looked at were no clock; try again from after them. */
        RETRY
    }

    /** Outcome of one tracking pass. */
    private enum Track {
        /** Every known transition was used (or the next one is still needed). */
        DONE,
        /** Stopped at the time limit or with the accepted-edge buffer full. */
        PAUSED,
        /** A dropout: acquire again. */
        REACQUIRE
    }

    private final SamplerConfig cfg;
    private final EdgeQueue q;
    private final AnnotationQueue notes;
    private final AcceptedEdges edges = new AcceptedEdges();
    private final ClockStats stats = new ClockStats();
    private final ClockPattern pattern;

    // state
    private boolean acquiring = true;
    private boolean afterDropout;
    private long pos;
    private boolean pending;
    private long pendingT;
    private long pendingRaw;
    private boolean pendingRising;
    private boolean haveP;
    private double periodFs = Double.NaN;
    private boolean haveLast;
    private long lastFinalT;
    private boolean lastFinalRising;
    private final long[] lastSame = new long[2];
    private final boolean[] haveSame = new boolean[2];
    private boolean finished;
    private boolean pausedFull;
    private long timeLimit = Long.MAX_VALUE;
    private int maxAccepted = Integer.MAX_VALUE;
    private boolean stoppedAtEnd;
    private boolean gaveUp;

    // counts
    private long accepted;
    private long referenceEdges;
    private long glitches;
    private long dropouts;
    private long restarts;
    private double acquiredDuty = Double.NaN;

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
        this.pattern = new ClockPattern(cfg, notes);
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
                Acquire r = acquire(finishing);
                if (r == Acquire.WAIT) {
                    break;
                }
                if (r == Acquire.RETRY) {
                    continue;
                }
            }
            Track t = track(horizon, finishing);
            if (t == Track.PAUSED) {
                paused = true;
                break;
            }
            if (t == Track.DONE) {
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

    private Acquire acquire(boolean finishing) {
        long end = q.globalEnd();
        // a transition that ends an unknown span is no clock edge: the clock starts at the first true one
        while (pos < end && q.levelOnly(q.time(pos))) {
            pos++;
        }
        long avail = end - pos;
        if (avail == 0 || (avail < ACQUIRE_EDGES && !finishing)) {
            return Acquire.WAIT;
        }
        int w = (int) Math.min(avail, ACQUIRE_EDGES);
        double duty = Double.NaN;
        if (w >= 3) {
            double p = AcquisitionWindow.medianPeriodFs(q, pos, w);
            if (!(p > 0)) {
                if (!haveP) {
                    // all same-direction intervals are zero: not a clock
                    pos += w;
                    return Acquire.RETRY;
                }
            } else {
                periodFs = p;
                haveP = true;
            }
            duty = AcquisitionWindow.medianHighFs(q, pos, w) / periodFs;
        } else if (!haveP) {
            gaveUp = true;
            pos = end;
            return Acquire.WAIT;
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
            pattern.decide(duty, at);
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
        return Acquire.ACQUIRED;
    }

    private Track track(long horizon, boolean finishing) {
        final long end = q.globalEnd();
        final long[] tt = q.t;
        final long base = q.base;
        while (pos < end) {
            if (pending && haveLast && !afterDropout && haveSame[0] && haveSame[1] && stats.intervals() > 0 && !q.hasSpans()) {
                steady(tt, base, end);
                if (pos >= end) {
                    break;
                }
            }
            final long t = tt[(int) (pos - base)];
            final double minW = glitchFraction * periodFs;
            if (edges.count() >= maxAccepted) {
                pausedFull = true;
                return Track.PAUSED;
            }
            if (t > timeLimit) {
                return Track.PAUSED;
            }
            if (q.levelOnly(t)) {
                // the transition ending an unknown span tells the level after it, not an edge time:
                // it takes no part in the period, the dropout check or the glitch check, and it
                // does not make the edge before it a runt
                if (pending && !finalizePending()) {
                    return Track.REACQUIRE;
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
                        return Track.DONE; // the next transition decides; wait for it
                    }
                    glitch(pendingT, t);
                    pending = false;
                    pos++;
                    continue;
                }
                if (!finalizePending()) {
                    return Track.REACQUIRE;
                }
            }
            pending = true;
            pendingT = t;
            pendingRaw = pos;
            pendingRising = q.rising(pos);
            pos++;
        }
        if (pending && (finishing || horizon > pendingT + glitchFraction * periodFs)) {
            return finalizePending() ? Track.DONE : Track.REACQUIRE;
        }
        return Track.DONE;
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
        final boolean inv = pattern.inverted();
        final boolean init = q.initialLevel;
        final AcceptedEdges out = edges;
        final long[] aT = out.timesFs();
        final double[] aP = out.periodsFs();
        final byte[] aF = out.flags();
        final long[] aI = out.indices();
        final int lim = Math.min(maxAccepted, out.capacity());
        final ClockStats st = stats;
        double period = periodFs;
        long pT = pendingT;
        boolean pR = pendingRising;
        long pRaw = pendingRaw;
        long lastT = lastFinalT;
        boolean lastR = lastFinalRising;
        long lsR = lastSame[1];
        long lsF = lastSame[0];
        int ac = out.count();
        long acc = accepted;
        long refs = referenceEdges;
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
            st.addPeriod(iv);
            if (!pR && lastR) {
                st.addDuty((pT - lastT) / period);
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
        out.appended(ac);
        accepted = acc;
        referenceEdges = refs;
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
            stats.addPeriod(iv);
        }
        if (!rising && haveLast && lastFinalRising && !restart) {
            stats.addDuty((t - lastFinalT) / periodFs);
        }
        boolean reference = multiplied ? rising != pattern.inverted() : rising;
        edges.add(t, periodFs, (byte) ((rising ? RISING : 0) | (restart ? RESTART : 0) | (suspect ? SUSPECT : 0)
                | (reference ? REFERENCE : 0)), multiplied ? (reference ? referenceEdges : -1) : accepted);
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
     * @return whether a dropout follows, or that it is not known yet
     */
    Gap gapAfterLast(long horizon) {
        if (afterDropout || stoppedAtEnd) {
            return Gap.YES;
        }
        if (finished) {
            return Gap.NO;
        }
        if (haveP && haveLast) {
            double limit = cfg.dropoutPeriods() * periodFs;
            if (pending ? pendingT - lastFinalT > limit : (pos >= q.globalEnd() && horizon > lastFinalT + limit)) {
                return Gap.YES;
            }
        }
        return Gap.UNKNOWN;
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

    /** Accepted edges waiting for the planner; it removes what it took with {@link AcceptedEdges#consumed}. */
    AcceptedEdges edges() {
        return edges;
    }

    /** Period and duty-cycle statistics over every accepted edge. */
    ClockStats stats() {
        return stats;
    }

    /** Where the recovery stands now. */
    Phase phase() {
        if (finished) {
            return Phase.FINISHED;
        }
        if (gaveUp) {
            return Phase.GAVE_UP;
        }
        if (!q.started) {
            return Phase.WAITING;
        }
        if (acquiring) {
            return afterDropout ? Phase.REACQUIRING : Phase.ACQUIRING;
        }
        return Phase.TRACKING;
    }

    /** Whether a period has been measured. */
    boolean hasPeriod() {
        return haveP;
    }

    /** The tracked period, fs; NaN before the first acquisition. */
    double periodFs() {
        return periodFs;
    }

    /** Mean of the measured intervals, fs, or the tracked period when none was measured. */
    double periodMean() {
        return stats.periodMeanFs(periodFs);
    }

    /** Standard deviation of the measured intervals, fs. */
    double periodStd() {
        return stats.periodStdFs();
    }

    /** Clock frequency from the mean interval, or from the tracked period; NaN without either. */
    double frequencyHz() {
        return stats.intervals() > 0 ? 1e15 / periodMean() : (haveP ? 1e15 / periodFs : Double.NaN);
    }

    long acceptedEdges() {
        return accepted;
    }

    long glitches() {
        return glitches;
    }

    long dropouts() {
        return dropouts;
    }

    long restarts() {
        return restarts;
    }

    /** Duty cycle measured at the first acquisition, NaN if none. */
    double acquiredDuty() {
        return acquiredDuty;
    }

    /** The multiplied-clock pattern decision. */
    ClockPattern pattern() {
        return pattern;
    }

    boolean finished() {
        return finished;
    }

    private static String fmt(double fs) {
        return String.format(Locale.ROOT, "%.0f", fs);
    }
}
