package org.lanesift.data;

/**
 * Conversions between bit-packed logic samples and edge lists, a 64-bit word at a time.
 *
 * <p><b>Time convention.</b> A logic analyser only knows that a signal changed somewhere between
 * two samples, so the transition between sample {@code j-1} and sample {@code j} is placed at
 * their midpoint, {@code startFs + (j - 0.5) * periodFs}, the unbiased estimate. The edge list
 * made from a logic block therefore covers {@code [startFs - periodFs/2, endFs - periodFs/2)},
 * and consecutive blocks give contiguous edge spans. Turning the edges back into samples at the
 * same times ({@link #toLogic}) gives exactly the original bits.
 *
 * <p>Unknown samples (the block's {@code invalid} mask) produce no transitions of their own: each
 * run of them becomes an unknown span from half a sample before its first to half a sample after
 * its last sample, and holds the last known level. If the signal came out of the run at another
 * level, the transition is placed at the end of the span, so the known samples after it keep
 * their true level (and sampling the edges back gives every known sample exactly).
 *
 * <p><b>Speed.</b> A 64-bit word at a time: transitions are the set bits of {@code x ^ (x << 1 | carry)},
 * taken in order with {@code Long.numberOfTrailingZeros}; a block without unknown samples is
 * counted first so its time array is allocated once, at its exact length. With a whole number of
 * femtoseconds per sample, a word with many transitions (a clock near the sample rate) is written
 * a byte at a time from a table of the set bits' time offsets, eight slots per byte whatever its
 * bits, with no branch on the data (on a channel toggling at nearly every sample, 0.33 against
 * 0.86 ns per sample in a CPU-time harness; docs/spool.md, "Speed"). In a word with unknown
 * samples each unknown bit is first filled with the level of the known sample below it (a
 * segmented prefix copy in six shift steps), then the same XOR finds the transitions; the unknown
 * runs are found a word at a time too. Such blocks collect their times in one builder reused from
 * block to block.
 *
 * <p>Use one instance per channel: it carries the last level across block boundaries, so a
 * transition between two blocks is not lost. Instances are not thread-safe.
 */
public final class LogicEdges {
    /** Products below this are exact in a double. */
    private static final double EXACT = 0x1p52;
    /** Words with at least this many transitions go through {@link #denseWord}. */
    static final int DENSE_WORD = 24;
    /** The last table made by {@link #slotOffsets}, shared by all instances and threads. */
    private static volatile SlotTable lastSlotTable;
    private boolean havePrevious;
    private boolean previousLevel;
    /** Reused for blocks with unknown samples: grows to the largest block, never shrinks. */
    private final EdgeListBuilder builder = new EdgeListBuilder(64);

    /** Creates a converter with no history. */
    public LogicEdges() {
    }

    /** Forgets the previous block, as after a gap in the capture. */
    public void reset() {
        havePrevious = false;
    }

    /**
     * Converts the next block of a channel to an edge list.
     *
     * @param b the block; must follow the previous one of this converter in time
     * @return the transitions of this block, including one between the previous block and this one
     */
    public Edges toEdges(LogicBlock b) {
        final int n = b.length();
        final long[] bits = b.bits();
        final long[] inv = b.invalid();
        final double p = b.periodFs();
        final long origin = b.startFs();
        final long spanStart = origin - Math.round(p * 0.5);
        final long spanEnd = origin + Math.round((n - 0.5) * p);
        if (n == 0) {
            return new Edges(b.channel(), spanStart, Math.max(spanStart, spanEnd), previousLevel, new long[0], 0, null, 0);
        }
        if (inv == null || BitSets.count(inv, n) == 0) {
            return allKnown(b, spanStart, spanEnd);
        }
        final int words = BitSets.words(n);
        final long lastMask = (n & 63) != 0 ? (1L << (n & 63)) - 1 : -1L;
        // the level before sample 0: the previous block's, else the first known sample's
        boolean level;
        boolean known = havePrevious;
        if (havePrevious) {
            level = previousLevel;
        } else {
            int first = nextClear(inv, 0, n);
            level = first < n && b.get(first);
            known = first < n;
        }
        final boolean initial = level;
        EdgeListBuilder out = builder;
        out.clear();
        for (int w = 0; w < words; w++) {
            final long x = bits[w];
            final long mask = w == words - 1 ? lastMask : -1L;
            final long unknown = inv[w] & mask;
            final long carry = level ? 1L : 0L;
            long diff;
            if (unknown == 0) {
                diff = (x ^ (x << 1 | carry)) & mask;
                level = ((x & mask) >>> (63 - Long.numberOfLeadingZeros(mask))) != 0;
            } else {
                // unknown samples hold the last known level: fill them with the level of the known
                // sample below (segmented prefix copy, six doubling steps), so a change hidden in an
                // unknown run shows at the first known sample after it
                long filled = fillUnknown(x & ~unknown, unknown) | (level ? unknown & ~(unknown + 1) : 0L);
                diff = (x ^ (filled << 1 | carry)) & ~unknown & mask;
                level = (filled >>> (63 - Long.numberOfLeadingZeros(mask)) & 1L) != 0;
            }
            if (diff != 0) {
                out.reserve(Long.bitCount(diff));
                final double base = ((long) w << 6) - 0.5;
                while (diff != 0) {
                    out.addTime(origin + Math.round((base + Long.numberOfTrailingZeros(diff)) * p));
                    diff &= diff - 1;
                }
            }
        }
        // the unknown runs, a word at a time
        int i = nextSet(inv, 0, n);
        while (i < n) {
            int s = i;
            i = nextClear(inv, s, n);
            out.addSpan(Math.max(spanStart, origin + Math.round((s - 0.5) * p)),
                    Math.min(spanEnd, origin + Math.round((i - 0.5) * p)));
            i = nextSet(inv, i, n);
        }
        if (known) {
            // a block of nothing but unknown samples leaves no level behind
            havePrevious = true;
            previousLevel = level;
        }
        return out.build(b.channel(), spanStart, spanEnd, initial); // exact-length arrays: callers may rely on it
    }

    /**
     * Copies each known bit up through the run of unknown bits above it: bit j of the result is
     * {@code v}'s bit at the nearest position {@code <= j} that is not in {@code unknown} (0 when
     * there is none in this word). {@code v} must be 0 at unknown positions.
     */
    static long fillUnknown(long v, long unknown) {
        long f = v;
        long pass = unknown;
        f |= (f << 1) & pass;
        pass &= pass << 1;
        f |= (f << 2) & pass;
        pass &= pass << 2;
        f |= (f << 4) & pass;
        pass &= pass << 4;
        f |= (f << 8) & pass;
        pass &= pass << 8;
        f |= (f << 16) & pass;
        pass &= pass << 16;
        f |= (f << 32) & pass;
        return f;
    }

    /** The first set bit at or after {@code from}, or {@code n}. */
    private static int nextSet(long[] words, int from, int n) {
        if (from >= n) {
            return n;
        }
        int w = from >>> 6;
        long x = words[w] & (-1L << from);
        while (x == 0) {
            if (++w << 6 >= n) {
                return n;
            }
            x = words[w];
        }
        return Math.min(n, (w << 6) + Long.numberOfTrailingZeros(x));
    }

    /** The first clear bit at or after {@code from}, or {@code n}. */
    private static int nextClear(long[] words, int from, int n) {
        if (from >= n) {
            return n;
        }
        int w = from >>> 6;
        long x = ~words[w] & (-1L << from);
        while (x == 0) {
            if (++w << 6 >= n) {
                return n;
            }
            x = ~words[w];
        }
        return Math.min(n, (w << 6) + Long.numberOfTrailingZeros(x));
    }

    /**
     * A block without unknown samples: the transitions are counted first (one {@code Long.bitCount}
     * per word) so the time array is allocated once at its exact length; when the sample period is a
     * whole number of femtoseconds each time is {@code origin + j * period - floor(period / 2)} in
     * integer arithmetic, which is what {@code Math.round((j - 0.5) * period)} gives whenever the
     * product is exact in a double (checked per block).
     */
    private Edges allKnown(LogicBlock b, long spanStart, long spanEnd) {
        final int n = b.length();
        final long[] bits = b.bits();
        final double p = b.periodFs();
        final long origin = b.startFs();
        final int words = BitSets.words(n);
        final boolean initial = havePrevious ? previousLevel : (bits[0] & 1L) != 0;
        final long lastMask = (n & 63) != 0 ? (1L << (n & 63)) - 1 : -1L;
        // pass 1: count
        int count = 0;
        long carry = initial ? 1L : 0L;
        for (int w = 0; w < words; w++) {
            long x = bits[w];
            long mask = w == words - 1 ? lastMask : -1L;
            count += Long.bitCount((x ^ (x << 1 | carry)) & mask);
            carry = x >>> 63;
        }
        long[] times = new long[count];
        // pass 2: times
        if (p == Math.rint(p) && 2.0 * n * p < EXACT) {
            integralTimes(bits, words, lastMask, initial, times, origin - ((long) p >> 1), (long) p, slotOffsets((long) p));
        } else {
            int k = 0;
            carry = initial ? 1L : 0L;
            for (int w = 0; w < words; w++) {
                long x = bits[w];
                long mask = w == words - 1 ? lastMask : -1L;
                long diff = (x ^ (x << 1 | carry)) & mask;
                carry = x >>> 63;
                int base = w << 6;
                while (diff != 0) {
                    times[k++] = origin + Math.round((base + Long.numberOfTrailingZeros(diff) - 0.5) * p);
                    diff &= diff - 1;
                }
            }
        }
        havePrevious = true;
        previousLevel = b.get(n - 1);
        return new Edges(b.channel(), spanStart, spanEnd, initial, times, count, null, 0);
    }

    /**
     * Pass 2 of {@link #allKnown} for a whole number of femtoseconds per sample: fills
     * {@code times} (exactly as long as the block has transitions) with
     * {@code offset + j * period} for every sample j that differs from the one before it. Words
     * with many transitions go through {@link #denseWord} while 64 slots remain; the rest, and
     * the last words, take the set bits one by one.
     */
    private static void integralTimes(long[] bits, int words, long lastMask, boolean initial, long[] times,
                                      long offset, long period, long[] slotFs) {
        final int denseLimit = times.length - 64;
        final long wordStepFs = period << 6;
        long carry = initial ? 1L : 0L;
        long wordFs = offset;
        int k = 0;
        for (int w = 0; w < words; w++, wordFs += wordStepFs) {
            final long x = bits[w];
            long diff = x ^ (x << 1 | carry);
            carry = x >>> 63;
            if (w == words - 1) {
                diff &= lastMask;
            }
            if (k <= denseLimit && Long.bitCount(diff) >= DENSE_WORD) {
                k = denseWord(times, k, diff, wordFs, period, slotFs);
            } else {
                while (diff != 0) {
                    times[k++] = wordFs + Long.numberOfTrailingZeros(diff) * period;
                    diff &= diff - 1;
                }
            }
        }
    }

    /**
     * Writes the times of the transitions {@code diff} marks in one word, eight sample positions
     * at a time: for each byte of {@code diff}, all eight slots {@code times[k..k+7]} get
     * {@code byteFs} plus the offsets of the byte's set bits from {@code slotFs} (see
     * {@link #slotOffsets}), then {@code k} moves on by the byte's bit count. The slots past a
     * byte's transitions hold junk until later transitions overwrite them, so the caller leaves
     * room for 64 slots after {@code k}. No branch depends on the data.
     *
     * @return the slot after the word's last transition
     */
    private static int denseWord(long[] times, int k, long diff, long wordFs, long period, long[] slotFs) {
        for (int q = 0; q < 64; q += 8) {
            final int bits = (int) (diff >>> q) & 0xFF;
            final int at = bits << 3;
            final long byteFs = wordFs + q * period;
            times[k] = byteFs + slotFs[at];
            times[k + 1] = byteFs + slotFs[at + 1];
            times[k + 2] = byteFs + slotFs[at + 2];
            times[k + 3] = byteFs + slotFs[at + 3];
            times[k + 4] = byteFs + slotFs[at + 4];
            times[k + 5] = byteFs + slotFs[at + 5];
            times[k + 6] = byteFs + slotFs[at + 6];
            times[k + 7] = byteFs + slotFs[at + 7];
            k += Integer.bitCount(bits);
        }
        return k;
    }

    /**
     * For each byte value b, the times of its set bits' sample positions after the byte's first
     * sample, {@code position * period}, ascending at {@code [8b, 8b + bitCount(b))}; the rest of its
     * eight entries are 0. One table (16 KiB) is shared by all converters while the period stays,
     * so the eight channels of a capture keep one copy in the cache.
     */
    private static long[] slotOffsets(long period) {
        SlotTable t = lastSlotTable;
        if (t == null || t.periodFs() != period) {
            long[] offsets = new long[256 * 8];
            for (int b = 0; b < 256; b++) {
                int i = 0;
                for (int j = 0; j < 8; j++) {
                    if ((b >>> j & 1) != 0) {
                        offsets[(b << 3) + i++] = j * period;
                    }
                }
            }
            t = new SlotTable(period, offsets);
            lastSlotTable = t; // published whole: the array is filled before the volatile write
        }
        return t.offsetsFs();
    }

    /** A {@link #slotOffsets} table and its period; never changed once made. */
    private record SlotTable(long periodFs, long[] offsetsFs) {
    }

    /**
     * Converts one logic block on its own (no history).
     *
     * @param b the block
     * @return its edges
     */
    public static Edges edgesOf(LogicBlock b) {
        return new LogicEdges().toEdges(b);
    }

    /**
     * Samples an edge list at uniformly spaced times: sample {@code i} is taken at
     * {@code startFs + i * periodFs} and has the level after every transition at or before that
     * time. Samples inside an unknown span are marked invalid. Samples outside the edge list's span
     * take the nearest known level (the initial level before it, the final level after it).
     *
     * @param e        the edges
     * @param startFs  time of sample 0
     * @param periodFs sample period
     * @param length   number of samples
     * @return the sampled block, capture index 0
     */
    public static LogicBlock toLogic(Edges e, long startFs, double periodFs, int length) {
        long[] bits = new long[BitSets.words(length)];
        boolean level = e.initialLevel();
        int cur = 0;
        long[] t = e.timesFs();
        for (int k = 0; k < e.count() && cur < length; k++) {
            double rel = (t[k] - startFs) / periodFs;
            int idx = rel <= 0 ? 0 : (int) Math.min(length, Math.ceil(rel));
            // guard against rounding: the sample time must be >= the edge time
            while (idx < length && startFs + Math.round(idx * periodFs) < t[k]) {
                idx++;
            }
            while (idx > cur && idx > 0 && startFs + Math.round((idx - 1) * periodFs) >= t[k]) {
                idx--;
            }
            if (level) {
                BitSets.setRange(bits, cur, idx);
            }
            cur = Math.max(cur, idx);
            level = !level;
        }
        if (level) {
            BitSets.setRange(bits, cur, length);
        }
        long[] inv = null;
        for (int s = 0; s < e.invalidCount(); s++) {
            long a = e.invalidSpans()[2 * s];
            long z = e.invalidSpans()[2 * s + 1];
            int from = (int) Math.max(0, Math.min(length, Math.ceil((a - startFs) / periodFs)));
            int to = (int) Math.max(0, Math.min(length, Math.ceil((z - startFs) / periodFs)));
            if (to > from) {
                if (inv == null) {
                    inv = new long[BitSets.words(length)];
                }
                BitSets.setRange(inv, from, to);
            }
        }
        return new LogicBlock(e.channel(), 0, startFs, periodFs, bits, length, inv);
    }
}
