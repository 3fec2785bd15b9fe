package org.lanesift.plugins.pixellink;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.util.Arrays;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.FindingRef;

/**
 * The pixels of one data lane waiting to be merged with the other lanes: per clock period one
 * entry with the seven slot bits (bit s = slot s), their seven flags, a completeness bit, the
 * clock period index and the time of slot 0. A pixel whose slots arrive across two blocks is
 * carried over. Flags that a finding of the sampler accounts for ({@link BitStream#causes()}) are
 * not kept as flags: the entry carries {@link #EXPLAINED} instead, so the decoder states them as
 * that finding's consequence.
 */
final class LaneBuffer {
    /** Entry bit: all seven slots were present exactly once. */
    static final int COMPLETE = 1 << 14;
    /** Entry bits 7..13: the slot flags. */
    static final int FLAGS = 0x7F << 7;
    /** Entry bit: some slot was flagged by the sampler because of a finding it made and named. */
    static final int EXPLAINED = 1 << 15;

    private static final VarHandle LONGS = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);
    /** Slots 0..6 in bytes 0..6. */
    private static final long SLOT_PATTERN = 0x0006050403020100L;
    private static final long SEVEN_BYTES = 0x00FFFFFFFFFFFFFFL;

    final String name;
    /** Only the first lane's slot-0 times are kept; the lanes share one clock. */
    final boolean keepTimes;
    int[] word = new int[1024];
    long[] edge = new long[1024];
    long[] timeFs = new long[1024];
    /** First live entry. */
    int head;
    /** End of live entries. */
    int tail;
    long bitsSeen;
    /** The channel of the first bit stream received, or null before any. */
    private String channel;
    long badSlots;

    private int pMask;
    private int pWord;
    private int pFlags;
    private boolean pExplained;
    /** The sampler's findings behind this lane's flagged bits. */
    private final UpstreamFindings flagCauses = new UpstreamFindings();
    private long pEdge;
    private long pTime;

    LaneBuffer(String name, boolean keepTimes) {
        this.name = name;
        this.keepTimes = keepTimes;
    }

    /** The lane's channel and input, e.g. {@code "d0 (lane0)"}, for findings. */
    String label() {
        return channel == null || channel.equals(name) ? name : channel + " (" + name + ")";
    }

    int size() {
        return tail - head;
    }

    private void ensure(int extra) {
        if (tail + extra <= word.length) {
            return;
        }
        int live = tail - head;
        if (head > 0 && live + extra <= word.length) {
            System.arraycopy(word, head, word, 0, live);
            System.arraycopy(edge, head, edge, 0, live);
            System.arraycopy(timeFs, head, timeFs, 0, live);
        } else {
            int cap = Math.max(word.length * 2, live + extra + 16);
            int[] w = new int[cap];
            long[] e = new long[cap];
            long[] t = new long[cap];
            System.arraycopy(word, head, w, 0, live);
            System.arraycopy(edge, head, e, 0, live);
            System.arraycopy(timeFs, head, t, 0, live);
            word = w;
            edge = e;
            timeFs = t;
        }
        head = 0;
        tail = live;
    }

    /** Drops everything before {@code newHead}. */
    void consumeTo(int newHead) {
        head = newHead;
        if (head == tail) {
            head = 0;
            tail = 0;
        }
    }

    private static int seven(long[] a, int i) {
        int w = i >>> 6;
        int b = i & 63;
        long v = a[w] >>> b;
        if (b > 57) {
            v |= a[w + 1] << (64 - b);
        }
        return (int) v & 0x7F;
    }

    /**
     * Appends a block's bits.
     *
     * @param b the bits, which must carry slot numbers
     */
    void add(BitStream b) {
        byte[] slot = b.slot();
        if (slot == null) {
            throw new org.lanesift.plugin.InputFormatException("lane '" + name + "': bit stream '" + b.channel()
                    + "' has no slot numbers; a 7:1 pixel link needs bits sampled with 7 slots per clock period");
        }
        int n = b.count();
        bitsSeen += n;
        if (channel == null) {
            channel = b.channel();
        }
        ensure(n + 2); // worst case: every bit closes a pixel
        long[] ce = b.clockEdge();
        long[] vals = b.values();
        long[] fl = b.flagged();
        long[] ts = b.timesFs();
        long[] ex = null;
        flagCauses.add(b.causes());
        flagCauses.dropBefore(b.startFs());
        if (n > 0) {
            long[][] split = explain(fl, ts, n);
            if (split != null) {
                fl = split[0];
                ex = split[1];
            }
        }
        double ui = b.unitIntervalFs();
        int[] wArr = word;
        long[] eArr = edge;
        long[] tArr = timeFs;
        int t = tail;
        int i = 0;
        int fastEnd = Math.min(n - 6, slot.length - 7);
        int runEnd = Math.min(n - 55, slot.length - 56);
        boolean keep = keepTimes;
        while (i < n) {
            if (pMask == 0) {
                // runs of 8 pixels: slot pattern checked on every pixel, clock index at both ends only
                // (the indices of one pixel are equal and never decrease, by the sampler's contract)
                while (i < runEnd && ce[i + 55] == ce[i] + 7 && run8(slot, i)) {
                    long e0 = ce[i];
                    long v56 = window56(vals, i);
                    long f56 = window56(fl, i);
                    long x56 = ex == null ? 0 : window56(ex, i);
                    if (x56 != 0) {
                        for (int r = 0; r < 8; r++) {
                            wArr[t + r] = ((int) (v56 >>> (7 * r)) & 0x7F) | (((int) (f56 >>> (7 * r)) & 0x7F) << 7) | COMPLETE
                                    | (((int) (x56 >>> (7 * r)) & 0x7F) != 0 ? EXPLAINED : 0);
                            eArr[t + r] = e0 + r;
                        }
                    } else if (f56 == 0) {
                        for (int r = 0; r < 8; r++) {
                            wArr[t + r] = ((int) (v56 >>> (7 * r)) & 0x7F) | COMPLETE;
                            eArr[t + r] = e0 + r;
                        }
                    } else {
                        for (int r = 0; r < 8; r++) {
                            wArr[t + r] = ((int) (v56 >>> (7 * r)) & 0x7F) | (((int) (f56 >>> (7 * r)) & 0x7F) << 7) | COMPLETE;
                            eArr[t + r] = e0 + r;
                        }
                    }
                    if (keep) {
                        for (int r = 0; r < 8; r++) {
                            tArr[t + r] = ts[i + 7 * r];
                        }
                    }
                    t += 8;
                    i += 56;
                }
                while (i < fastEnd && (((long) LONGS.get(slot, i)) & SEVEN_BYTES) == SLOT_PATTERN && ce[i] == ce[i + 6]) {
                    wArr[t] = seven(vals, i) | (seven(fl, i) << 7) | COMPLETE | (ex != null && seven(ex, i) != 0 ? EXPLAINED : 0);
                    eArr[t] = ce[i];
                    tArr[t] = ts[i];
                    t++;
                    i += 7;
                }
                if (i >= n) {
                    break;
                }
            }
            // slow path: one bit
            int s = slot[i];
            long e = ce[i];
            if (s < 0 || s > 6) {
                badSlots++;
                i++;
                continue;
            }
            if (pMask != 0 && (e != pEdge || (pMask & (1 << s)) != 0)) {
                t = close(t);
            }
            if (pMask == 0) {
                pEdge = e;
                pTime = ts[i] - Math.round(s * ui);
            }
            pMask |= 1 << s;
            if (bit(vals, i)) {
                pWord |= 1 << s;
            }
            if (bit(fl, i)) {
                pFlags |= 1 << s;
            }
            if (ex != null && bit(ex, i)) {
                pExplained = true;
            }
            if (pMask == 0x7F) {
                t = close(t);
            }
            i++;
        }
        tail = t;
    }

    /**
     * Splits a block's flags into those no named finding accounts for and those one does.
     *
     * @return {own flags, explained flags}, or null when no flagged bit is explained
     */
    private long[][] explain(long[] fl, long[] ts, int n) {
        long[] ex = null;
        int words = BitSets.words(n);
        for (int w = 0; w < words; w++) {
            long f = fl[w];
            if (w == words - 1 && (n & 63) != 0) {
                f &= (1L << (n & 63)) - 1;
            }
            while (f != 0) {
                int i = (w << 6) + Long.numberOfTrailingZeros(f);
                f &= f - 1;
                if (flagCauses.flagsAt(ts[i]) != null) {
                    if (ex == null) {
                        ex = new long[words];
                    }
                    ex[w] |= 1L << i;
                }
            }
        }
        if (ex == null) {
            return null;
        }
        long[] own = new long[Math.max(fl.length, words + 1)];
        long[] exPadded = new long[own.length];
        for (int w = 0; w < words; w++) {
            own[w] = fl[w] & ~ex[w];
            exPadded[w] = ex[w];
        }
        return new long[][] {own, exPadded};
    }

    /** Bits i..i+55 (the caller guarantees they exist). */
    private static long window56(long[] a, int i) {
        int w = i >>> 6;
        int b = i & 63;
        long v = a[w] >>> b;
        if (b > 8) {
            v |= a[w + 1] << (64 - b);
        }
        return v;
    }

    private static boolean run8(byte[] slot, int i) {
        return ((((long) LONGS.get(slot, i)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 7)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 14)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 21)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 28)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 35)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 42)) & SEVEN_BYTES) == SLOT_PATTERN)
                & ((((long) LONGS.get(slot, i + 49)) & SEVEN_BYTES) == SLOT_PATTERN);
    }

    private static boolean bit(long[] a, int i) {
        return (a[i >>> 6] & (1L << i)) != 0;
    }

    private int close(int t) {
        word[t] = pWord | (pFlags << 7) | (pMask == 0x7F ? COMPLETE : 0) | (pExplained ? EXPLAINED : 0);
        edge[t] = pEdge;
        timeFs[t] = pTime;
        pMask = 0;
        pWord = 0;
        pFlags = 0;
        pExplained = false;
        return t + 1;
    }

    /** At the end of the capture: a pixel still missing slots goes out as incomplete. */
    void flushPending() {
        if (pMask != 0) {
            ensure(1);
            tail = close(tail);
        }
    }

    @Override
    public String toString() {
        return "LaneBuffer[" + name + ", " + size() + " pixels, entries " + Arrays.toString(Arrays.copyOfRange(word, head, Math.min(tail, head + 4))) + "]";
    }
}
