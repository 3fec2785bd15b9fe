package org.lanesift.plugins.dualedge;

import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;

/**
 * Samples one data lane at the planned sample points: value, setup and hold margins, flags,
 * statistics and runs of flagged bits. The hot loop runs over primitive arrays only.
 */
final class LaneSampler {
    static final long UNKNOWN = BitStream.UNKNOWN_MARGIN;

    final int lane;
    final EdgeQueue q;
    final String track;
    final MarginStats stats = new MarginStats();
    /** Global index of the first transition after the last sample. */
    private long cursor;
    // the open run of flagged bits
    private boolean inRun;
    private long runStart;
    private long runEnd;
    private long runBits;
    private long runMinSetup = UNKNOWN;
    private long runMinHold = UNKNOWN;
    private long runUnknown;

    // outputs of the last call
    long[] values;
    long[] setup;
    long[] hold;
    long[] flagged;
    /**
     * Whether the margins of each call go out with its bits: then {@link #setup} and {@link #hold}
     * are new arrays every call. Otherwise nobody downstream reads them, and the two arrays are
     * this sampler's own, reused from call to call: only the stage's skew judgement reads them,
     * before the next call.
     */
    boolean keepMargins = true;
    /** The lane is already named for a graver reason (its slot is ambiguous): runs of flagged bits are counted, not annotated. */
    boolean quiet;

    private final double threshold;
    /** Runs of flagged bits are annotated here (false: the decoder reports them where the lane carries data). */
    private final boolean annotate;

    LaneSampler(int lane, EdgeQueue q, double threshold, boolean annotate) {
        this.lane = lane;
        this.annotate = annotate;
        this.q = q;
        this.threshold = threshold;
        this.track = "lane" + lane;
    }

    /**
     * Samples the first {@code n} planned points; results in {@link #values} .. {@link #flagged}
     * (the first {@code n} entries of {@link #setup} and {@link #hold}).
     *
     * @param sb        sample points
     * @param n         how many
     * @param fast      true when no unknown span or coverage edge is within reach of any of them
     * @param finishing true when the lane has ended
     * @param notes     annotation queue
     */
    void sample(SampleBuf sb, int n, boolean fast, boolean finishing, AnnotationQueue notes) {
        int w = BitSets.words(n);
        values = new long[w];
        flagged = new long[w];
        if (keepMargins || setup == null || setup.length < n) {
            // every entry below n is written by either loop, so a reused array needs no clearing; the
            // stage hands at most 2 * CHUNK bits a call, so the reused pair is allocated once
            int size = keepMargins ? n : Math.max(n, 2 * DualEdgeStage.CHUNK);
            setup = new long[size];
            hold = new long[size];
        }
        if (fast) {
            sampleFast(sb, n, notes);
        } else {
            sampleSlow(sb, n, finishing, notes);
        }
        stats.bits += n;
        stats.flagged += BitSets.count(flagged, n);
    }

    private void sampleFast(SampleBuf sb, int n, AnnotationQueue notes) {
        final long[] tt = q.t; // tt[tail] is a Long.MAX_VALUE sentinel
        final int head = q.head;
        final long base = q.base;
        final long initBit = q.initialLevel ? 1 : 0;
        final long[] ss = sb.s;
        final long[] rs = sb.reach;
        final long[] ths = sb.thr;
        final long[] sc = sb.scale;
        final byte[] fl = sb.flags;
        final long[] vals = values;
        final long[] flg = flagged;
        final long[] su = setup;
        final long[] ho = hold;
        final long[] sh = stats.setupHist4;
        final long[] hh = stats.holdHist4;
        final long maxBin = MarginStats.BINS;
        final int unknownBin = MarginStats.BINS + 1;
        long minS = stats.minSetupFs;
        long minH = stats.minHoldFs;
        int j = (int) Math.max(head, Math.min(q.tail, cursor - base));
        long vWord = 0;
        long fWord = 0;
        for (int i = 0; i < n; i++) {
            final long s = ss[i];
            // usually at most one transition between two sample points: step without a branch
            // (s >= 0 here, so s - tt[j] does not overflow for the Long.MAX_VALUE sentinel)
            j += 1 - (int) ((s - tt[j]) >>> 63);
            while (tt[j] <= s) {
                j++;
            }
            while (j > head && tt[j - 1] > s) {
                j--;
            }
            final long reach = rs[i];
            long a = j > head ? s - tt[j - 1] : UNKNOWN;
            final long ma = (reach - a) >> 63; // all ones when a > reach (no transition within reach)
            a = (a & ~ma) | (UNKNOWN & ma);
            long b = tt[j] - s; // the sentinel gives a huge value
            final long mb = ((reach - b) | b) >> 63;
            b = (b & ~mb) | (UNKNOWN & mb);
            su[i] = a;
            ho[i] = b;
            final long k = sc[i];
            final int lane4 = i & 3;
            sh[(((int) ((Math.min(maxBin, (a * k) >>> 40) & ~ma) | (unknownBin & ma))) << 2) | lane4]++;
            hh[(((int) ((Math.min(maxBin, (b * k) >>> 40) & ~mb) | (unknownBin & mb))) << 2) | lane4]++;
            if (a < minS) {
                minS = a;
                stats.minSetupUi = a / sb.ui[i];
            }
            if (b < minH) {
                minH = b;
                stats.minHoldUi = b / sb.ui[i];
            }
            final long thr = ths[i];
            vWord |= (((base + j) ^ initBit) & 1L) << i;
            final boolean f = a < thr | b < thr | (fl[i] & SampleBuf.SUSPECT) != 0;
            if (f) {
                fWord |= 1L << i;
                flaggedBit(s, a, b, false);
            } else if (inRun) {
                closeRun(notes);
            }
            if ((i & 63) == 63) {
                vals[i >>> 6] = vWord;
                flg[i >>> 6] = fWord;
                vWord = 0;
                fWord = 0;
            }
        }
        if ((n & 63) != 0) {
            vals[n >>> 6] = vWord;
            flg[n >>> 6] = fWord;
        }
        cursor = base + j;
        stats.minSetupFs = minS;
        stats.minHoldFs = minH;
    }

    private void sampleSlow(SampleBuf sb, int n, boolean finishing, AnnotationQueue notes) {
        final long[] tt = q.t;
        final int head = q.head;
        final int tail = q.tail;
        final long[] sp = q.spans;
        final int spEnd = q.spanTail;
        int k0 = q.spanHead;
        int j = (int) Math.max(head, Math.min(tail, cursor - q.base));
        for (int i = 0; i < n; i++) {
            final long s = sb.s[i];
            while (j < tail && tt[j] <= s) {
                j++;
            }
            while (j > head && tt[j - 1] > s) {
                j--;
            }
            final double ui = sb.ui[i];
            final long reach = sb.reach[i];
            long prevT = j > head ? tt[j - 1] : Long.MIN_VALUE;
            long nextT = j < tail ? tt[j] : Long.MAX_VALUE;
            boolean unknown = !q.started || s < q.startFs || (finishing && s >= q.endFs);
            while (k0 > q.spanHead && sp[k0 - 1] > s - 2 * reach) {
                k0 -= 2;
            }
            while (k0 < spEnd && sp[k0 + 1] <= s - 2 * reach) {
                k0 += 2;
            }
            for (int k = k0; k < spEnd; k += 2) {
                long a = sp[k];
                long b = sp[k + 1];
                if (a > s + reach) {
                    break;
                }
                if (a <= s && s < b) {
                    unknown = true;
                } else if (b <= s) {
                    prevT = Math.max(prevT, b);
                } else {
                    nextT = Math.min(nextT, a);
                }
            }
            long a;
            long b;
            boolean f;
            if (unknown) {
                a = UNKNOWN;
                b = UNKNOWN;
                f = true;
                stats.unknown++;
                stats.setupHist[MarginStats.BINS + 1]++;
                stats.holdHist[MarginStats.BINS + 1]++;
            } else {
                a = prevT == Long.MIN_VALUE || s - prevT > reach ? UNKNOWN : s - prevT;
                b = nextT == Long.MAX_VALUE || nextT - s > reach ? UNKNOWN : nextT - s;
                long thr = sb.thr[i];
                f = a < thr || b < thr || (sb.flags[i] & SampleBuf.SUSPECT) != 0;
                if (a == UNKNOWN) {
                    stats.setupHist[MarginStats.BINS + 1]++;
                } else {
                    double r = a / ui;
                    stats.setupHist[(int) Math.min(MarginStats.BINS, (a * sb.scale[i]) >>> 40)]++;
                    if (a < stats.minSetupFs) {
                        stats.minSetupFs = a;
                        stats.minSetupUi = r;
                    }
                }
                if (b == UNKNOWN) {
                    stats.holdHist[MarginStats.BINS + 1]++;
                } else {
                    double r = b / ui;
                    stats.holdHist[(int) Math.min(MarginStats.BINS, (b * sb.scale[i]) >>> 40)]++;
                    if (b < stats.minHoldFs) {
                        stats.minHoldFs = b;
                        stats.minHoldUi = r;
                    }
                }
            }
            setup[i] = a;
            hold[i] = b;
            if ((((q.base + j) & 1) != 0) != q.initialLevel) {
                values[i >>> 6] |= 1L << i;
            }
            if (f) {
                flagged[i >>> 6] |= 1L << i;
                flaggedBit(s, a, b, unknown);
            } else if (inRun) {
                closeRun(notes);
            }
        }
        cursor = q.base + j;
    }

    private void flaggedBit(long s, long a, long b, boolean unknown) {
        if (!inRun) {
            inRun = true;
            runStart = s;
            runBits = 0;
            runMinSetup = UNKNOWN;
            runMinHold = UNKNOWN;
            runUnknown = 0;
        }
        runBits++;
        runEnd = s;
        if (a < runMinSetup) {
            runMinSetup = a;
        }
        if (b < runMinHold) {
            runMinHold = b;
        }
        if (unknown) {
            runUnknown++;
        }
    }

    void closeRun(AnnotationQueue notes) {
        if (!inRun) {
            return;
        }
        inRun = false;
        stats.lowRuns++;
        if (quiet || !annotate) {
            return;
        }
        String lane = q.channel != null ? q.channel : track;
        Annotation.Builder b = Annotation.on(track, "margin-low").span(runStart, runEnd).severity(Severity.WARNING)
                .label(lane + ": " + (runBits == 1 ? "1 flagged bit" : runBits + " flagged bits")).text("lane", lane)
                .field("bits", Field.integer(runBits, ""));
        if (runMinSetup != UNKNOWN) {
            b.number("minSetupFs", runMinSetup, "fs");
        }
        if (runMinHold != UNKNOWN) {
            b.number("minHoldFs", runMinHold, "fs");
        }
        if (runUnknown > 0) {
            b.field("unknownBits", Field.integer(runUnknown, ""));
        }
        notes.add(b.build());
    }

    /**
     * Start of the open run of flagged bits.
     *
     * @return femtoseconds, or {@code Long.MAX_VALUE} when none is open
     */
    long openRunStart() {
        return inRun ? runStart : Long.MAX_VALUE;
    }
}
