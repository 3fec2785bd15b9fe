package org.lanesift.plugins.si;

import java.util.Arrays;

/**
 * Finds the transitions of an analog signal between two known levels, one sample at a time, and
 * measures each: the interpolated times at which it crosses 10, 20, 50, 80 and 90 % of the swing,
 * the overshoot beyond the level it arrives at, and the settling time into a band around that
 * level. A transition counts once the signal has gone from beyond 10 % on one side to beyond 90 %
 * on the other (hysteresis); of repeated crossings of a threshold the last one before the far
 * threshold is used. An edge is complete (and reported) when the next transition starts, or at
 * {@link #finish()}. Optionally keeps the samples after each edge (its "tail") for a ringing fit.
 *
 * <p>Times are femtoseconds (double), voltages volts. Per sample the work is a handful of
 * comparisons; nothing is allocated except when an edge completes.
 */
final class EdgeTracker {
    /** Fractions of the swing at which crossings are timed. */
    static final double[] FRACTIONS = {0.1, 0.2, 0.5, 0.8, 0.9};

    /**
     * One completed transition.
     *
     * @param rising       true for low to high
     * @param cross        crossing times of the 10/20/50/80/90 % levels in the direction of travel (for a
     *                     falling edge: 90 % first, then 80 %, ..., 10 %), femtoseconds
     * @param extremeVolts highest (rising) or lowest (falling) voltage before the next transition leaves
     * @param overshootPct how far the extreme goes beyond the arrival level, percent of the swing, at least 0
     * @param settlingFs   time from the 50 % crossing to the last entry into the settling band, or NaN if it never settled
     * @param truncated    the capture ended before the next transition
     * @param departFs     when the next transition left (crossed 90 % of the way back), or the last sample time
     * @param tail         samples from the far crossing on (may be empty)
     * @param tailCount    valid entries of {@code tail}
     * @param tailStartFs  time of {@code tail[0]}
     */
    record Edge(boolean rising, double[] cross, double extremeVolts, double overshootPct, double settlingFs,
                boolean truncated, double departFs, float[] tail, int tailCount, double tailStartFs) {
        double transitionFs() {
            return cross[4] - cross[0];
        }

        double transition2080Fs() {
            return cross[3] - cross[1];
        }

        double t50() {
            return cross[2];
        }
    }

    /** Receives completed edges. */
    interface Listener {
        void edge(Edge e);
    }

    private final Levels levels;
    private final double band;
    private final int tailCap;
    private final Listener listener;
    private final double[] up = new double[5];
    private final double[] down = new double[5];

    /** 0 unknown, +1 at the high level (searching for a fall), -1 at the low level (searching for a rise). */
    private int state;
    private final double[] cross = new double[5];
    private double prevT = Double.NaN;
    private float prevV;
    private boolean past50;
    private long incomplete;

    // the level the last edge arrived at
    private boolean inBand;
    private double entryT = Double.NaN;
    private double lastEntryAtExit = Double.NaN;
    private double extreme;
    private double snapSettle = Double.NaN;
    private double snapExtreme = Double.NaN;
    private double snapDepart = Double.NaN;
    private boolean departed;

    // the edge waiting for completion
    private boolean pending;
    private boolean pendingRising;
    private final double[] pendingCross = new double[5];
    private float[] tail;
    private int tailCount;
    private double tailStart;

    EdgeTracker(Levels levels, double settleBandFraction, int tailCap, Listener listener) {
        this.levels = levels;
        this.band = settleBandFraction * levels.swing();
        this.tailCap = tailCap;
        this.listener = listener;
        for (int k = 0; k < 5; k++) {
            up[k] = levels.at(FRACTIONS[k]);
            down[k] = levels.at(1 - FRACTIONS[k]);
        }
        tail = new float[Math.min(tailCap, 1024)];
        Arrays.fill(cross, Double.NaN);
    }

    /** Transitions that reached 50 % and turned back without reaching 90 % (runts or deep ring-back). */
    long incomplete() {
        return incomplete;
    }

    /**
     * Forgets the previous sample, so that no crossing is interpolated across a gap, and drops the
     * transition in progress: a transition that runs into or out of unknown samples has no
     * trustworthy timing, so it is no edge (the rule of {@code Edges.levelOnly} for analog input).
     */
    void gap() {
        prevT = Double.NaN;
        Arrays.fill(cross, Double.NaN);
        past50 = false;
    }

    void step(double t, float v) {
        if (Double.isNaN(prevT)) {
            prevT = t;
            prevV = v;
            if (state == 0) {
                if (v <= up[0]) {
                    state = -1;
                } else if (v >= down[0]) {
                    state = 1;
                }
            }
            track(t, v);
            return;
        }
        if (state == 0) {
            if (v <= up[0]) {
                state = -1;
            } else if (v >= down[0]) {
                state = 1;
            }
            prevT = t;
            prevV = v;
            return;
        }
        double[] th = state < 0 ? up : down;
        double s = -state; // direction of travel of the transition we wait for
        double sp = s * prevV;
        double sv = s * v;
        for (int k = 0; k < 5; k++) {
            double x = s * th[k];
            if (sp < x && sv >= x) {
                double tc = prevT + (th[k] - prevV) / (v - prevV) * (t - prevT);
                cross[k] = tc;
                if (k == 0) {
                    // leaving the level we sit at: snapshot what happened there
                    snapSettle = inBand ? entryT : lastEntryAtExit;
                    snapExtreme = extreme;
                    snapDepart = tc;
                    departed = true;
                } else if (k == 2) {
                    past50 = true;
                }
            } else if (k == 0 && sp >= x && sv < x) {
                if (past50) {
                    incomplete++;
                }
                past50 = false;
            }
        }
        if (sv >= s * th[4]) {
            arrive(t, v, s > 0);
        } else {
            track(t, v);
        }
        prevT = t;
        prevV = v;
    }

    private void arrive(double t, float v, boolean rising) {
        if (!Double.isNaN(cross[0])) {
            if (pending) {
                complete(false, t);
            }
            pending = true;
            pendingRising = rising;
            System.arraycopy(cross, 0, pendingCross, 0, 5);
            tailCount = 0;
            tailStart = t;
        } else if (pending) {
            complete(false, t);
            pending = false;
        }
        state = rising ? 1 : -1;
        Arrays.fill(cross, Double.NaN);
        past50 = false;
        inBand = false;
        entryT = Double.NaN;
        lastEntryAtExit = Double.NaN;
        extreme = v;
        departed = false;
        track(t, v);
    }

    private void track(double t, float v) {
        if (state == 0) {
            return;
        }
        double target = state > 0 ? levels.highVolts : levels.lowVolts;
        boolean nowIn = Math.abs(v - target) <= band;
        if (nowIn && !inBand) {
            entryT = t;
        } else if (!nowIn && inBand) {
            lastEntryAtExit = entryT;
        }
        inBand = nowIn;
        if (!departed) {
            extreme = state > 0 ? Math.max(extreme, v) : Math.min(extreme, v);
        }
        if (pending && tailCount < tailCap) {
            if (tailCount == tail.length) {
                tail = Arrays.copyOf(tail, Math.min(tailCap, tail.length * 2));
            }
            tail[tailCount++] = v;
        }
    }

    /** Reports the edge still waiting for its successor, marked truncated. */
    void finish() {
        if (pending) {
            complete(true, prevT);
            pending = false;
        }
    }

    private void complete(boolean truncated, double now) {
        double settleAt;
        double ext;
        double depart;
        if (truncated || !departed) {
            settleAt = inBand ? entryT : Double.NaN;
            ext = extreme;
            depart = now;
            truncated = true;
        } else {
            settleAt = snapSettle;
            ext = snapExtreme;
            depart = snapDepart;
        }
        double arrival = pendingRising ? levels.highVolts : levels.lowVolts;
        double over = (pendingRising ? ext - arrival : arrival - ext) / levels.swing() * 100;
        double settling = settleAt - pendingCross[2];
        listener.edge(new Edge(pendingRising, pendingCross.clone(), ext, Math.max(0, over), settling, truncated, depart,
                Arrays.copyOf(tail, tailCount), tailCount, tailStart));
    }
}
