package org.lanesift.plugins.packetlink;

import java.util.ArrayDeque;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.BitStream;
import org.lanesift.kit.LegPairs;

/**
 * One data lane inside the stage: pairs the samples of its two legs, runs the state tracker,
 * and routes the lane's sampled bits into one deserializer per high-speed interval. Bits are held
 * until the legs tell whether they fall inside a burst; bits outside bursts are dropped.
 */
final class Lane {
    /** A finished burst of one lane. */
    static final class Burst {
        final long startFs;
        final long endFs;
        final LaneDeserializer words;

        Burst(long startFs, long endFs, LaneDeserializer words) {
            this.startFs = startFs;
            this.endFs = endFs;
            this.words = words;
        }
    }

    /** Creates a fresh deserializer for a new burst. */
    interface DeserializerFactory {
        LaneDeserializer create(int lane);
    }

    final int index;
    final LaneStateTracker tracker;
    private final DeserializerFactory factory;
    private final MarginRuns margins;
    private final LegPairs legs;
    private final ArrayDeque<BitStream> bits = new ArrayDeque<>();
    private int bitPos;
    private long bitsDoneFs = Long.MIN_VALUE;
    private LaneDeserializer current;
    private LaneStateTracker.Interval currentInterval;
    final ArrayDeque<Burst> done = new ArrayDeque<>();

    Lane(int index, LaneStateTracker tracker, DeserializerFactory factory, MarginRuns margins) {
        this.index = index;
        this.tracker = tracker;
        this.factory = factory;
        this.margins = margins;
        this.legs = new LegPairs(tracker::accept);
    }

    void acceptLeg(boolean positive, AnalogBlock b) {
        legs.accept(positive, b);
    }

    void acceptBits(BitStream b) {
        bits.add(b);
    }

    /** Moves every bit whose state is settled into its burst (or drops it); finishes completed bursts. */
    void drainBits() {
        long known = tracker.knownUntilFs();
        while (!bits.isEmpty()) {
            BitStream b = bits.peek();
            int i = bitPos;
            long[] t = b.timesFs();
            int count = b.count();
            while (i < count) {
                long ti = t[i];
                if (ti >= known) {
                    bitPos = i;
                    bitsDoneFs = Math.max(bitsDoneFs, ti);
                    finishBursts();
                    return;
                }
                LaneStateTracker.Interval iv = tracker.intervals.peek();
                if (iv != null && iv.closed && ti >= iv.endFs) {
                    closeInterval();
                    continue;
                }
                if (iv == null || ti < iv.startFs) {
                    long until = iv == null ? known : Math.min(iv.startFs, known);
                    i = firstAtOrAfter(t, i, count, until);
                    continue;
                }
                if (currentInterval != iv) {
                    currentInterval = iv;
                    current = factory.create(index);
                }
                int j = firstAtOrAfter(t, i, count, Math.min(iv.endFs, known));
                current.feed(b, i, j);
                margins.feed(b, i, j);
                i = j;
            }
            bitsDoneFs = Math.max(bitsDoneFs, b.endFs());
            bits.poll();
            bitPos = 0;
        }
        finishBursts();
    }

    private void finishBursts() {
        LaneStateTracker.Interval iv;
        while ((iv = tracker.intervals.peek()) != null && iv.closed && iv.endFs <= bitsDoneFs) {
            closeInterval();
        }
    }

    private void closeInterval() {
        LaneStateTracker.Interval iv = tracker.intervals.poll();
        LaneDeserializer d = currentInterval == iv ? current : factory.create(index);
        margins.close();
        done.add(new Burst(iv.startFs, iv.endFs, d));
        currentInterval = null;
        current = null;
    }

    /** End of input: settle all state and close every burst. */
    void finish() {
        tracker.finish();
        bitsDoneFs = Long.MAX_VALUE;
        // everything is known now
        while (!bits.isEmpty()) {
            BitStream b = bits.poll();
            int i = bitPos;
            bitPos = 0;
            long[] t = b.timesFs();
            while (i < b.count()) {
                LaneStateTracker.Interval iv = tracker.intervals.peek();
                if (iv == null) {
                    break;
                }
                if (t[i] >= iv.endFs) {
                    closeInterval();
                    continue;
                }
                if (t[i] < iv.startFs) {
                    i = firstAtOrAfter(t, i, b.count(), iv.startFs);
                    continue;
                }
                if (currentInterval != iv) {
                    currentInterval = iv;
                    current = factory.create(index);
                }
                int j = firstAtOrAfter(t, i, b.count(), iv.endFs);
                current.feed(b, i, j);
                margins.feed(b, i, j);
                i = j;
            }
        }
        while (!tracker.intervals.isEmpty()) {
            closeInterval();
        }
    }

    /** First index in {@code [from, to)} whose time is at least {@code limit}, or {@code to}. */
    static int firstAtOrAfter(long[] t, int from, int to, long limit) {
        if (from >= to || t[from] >= limit) {
            return from;
        }
        int lo = from;
        int hi = to;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (t[mid] < limit) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    // ------------------------------------------------------------------ bursts from pauses and idle runs

    private long gapLastFs = Long.MIN_VALUE;
    private long gapBurstStartFs;
    private long burstBits;
    private long runStartFs;
    private boolean runLevel;
    private int runLength;
    /** Level of the idle run that ended the last burst; bits at this level are dropped until another comes. */
    private boolean idle;
    private boolean idleLevel;

    /**
     * Framed links without line states whose bursts are marked by the bits themselves: a pause
     * between two sampled bits longer than {@code gapFs} (the clock stopped) or a run of at least
     * {@code idleBits} equal bits (the line idling) ends the burst; each burst gets a fresh
     * deserializer, so the sync is sought again at every burst and bursts may differ in length.
     * With {@code syncRestart} a sync on a word boundary inside a burst also starts a new burst
     * ({@link #feedBurst}); with neither pauses nor idle runs that alone cuts a streaming link.
     *
     * @param gapFs    longest pause inside a burst, femtoseconds (0: pauses do not cut)
     * @param idleBits shortest idle run (0: runs do not cut)
     */
    void drainGapped(long gapFs, int idleBits) {
        while (!bits.isEmpty()) {
            BitStream b = bits.poll();
            long[] t = b.timesFs();
            long[] v = b.values();
            int from = 0;
            int n = b.count();
            double ui = b.unitIntervalFs();
            for (int i = 0; i < n; i++) {
                long ti = t[i];
                boolean bit = ((v[i >>> 6] >>> i) & 1L) != 0;
                if (gapFs > 0 && gapLastFs != Long.MIN_VALUE && ti - gapLastFs > gapFs) {
                    if (current != null) {
                        feedBurst(b, from, i);
                        closeGapped(gapLastFs + Math.round(ui > 0 ? ui : 0), 0);
                    }
                    idle = false;
                    runLength = 0;
                    from = i;
                }
                gapLastFs = ti;
                if (runLength > 0 && bit == runLevel) {
                    runLength++;
                } else {
                    runLevel = bit;
                    runLength = 1;
                    runStartFs = ti;
                }
                boolean afterIdle = false;
                if (idle) {
                    if (bit == idleLevel) {
                        from = i + 1;
                        continue;
                    }
                    idle = false;
                    afterIdle = true;
                }
                if (current == null) {
                    current = factory.create(index);
                    if (afterIdle) {
                        current.preload(idleLevel);
                    }
                    gapBurstStartFs = ti;
                    burstBits = 0;
                    from = i;
                }
                burstBits++;
                if (idleBits > 0 && runLength >= idleBits) {
                    feedBurst(b, from, i + 1);
                    if (burstBits > runLength) {
                        closeGapped(runStartFs, runLength);
                    } else {
                        current = null; // only idle bits so far: the line was idle from the start
                    }
                    idle = true;
                    idleLevel = bit;
                    from = i + 1;
                }
            }
            if (current != null && from < n) {
                feedBurst(b, from, n);
            }
        }
    }

    /**
     * Feeds bits {@code [from, to)} to the open burst; where its deserializer finds the next
     * burst's sync (restart mode), closes the burst just before that sync and goes on with a
     * fresh deserializer that starts synced.
     */
    private void feedBurst(BitStream b, int from, int to) {
        int i = from;
        while (i < to) {
            i = current.feed(b, i, to);
            if (!current.restartPending) {
                return;
            }
            LaneDeserializer next = factory.create(index);
            next.startSynced(current.restartSyncFs, current.uiFs);
            long cut = current.restartStartFs;
            done.add(new Burst(gapBurstStartFs, Math.max(gapBurstStartFs, cut), current));
            gapBurstStartFs = cut;
            current = next;
        }
    }

    private void closeGapped(long endFs, int idleRun) {
        if (idleRun > 0) {
            current.dropLastBits(idleRun);
        }
        done.add(new Burst(gapBurstStartFs, Math.max(gapBurstStartFs, endFs), current));
        current = null;
    }

    /** End of input in the gapped mode: the open burst ends at the last bit. */
    void finishGapped() {
        if (current != null) {
            closeGapped(gapLastFs + 1, 0);
        }
    }

    /** Framed links without line states: every bit goes to one endless deserializer. */
    void drainContinuous() {
        if (current == null) {
            current = factory.create(index);
        }
        while (!bits.isEmpty()) {
            BitStream b = bits.poll();
            current.feed(b, 0, b.count()); // no margin check here: every bit is data, the sampler's own check covers them
        }
    }

    LaneDeserializer continuous() {
        if (current == null) {
            current = factory.create(index);
        }
        return current;
    }
}
