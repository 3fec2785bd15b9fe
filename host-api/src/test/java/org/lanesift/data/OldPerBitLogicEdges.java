package org.lanesift.data;

/**
 * The logic-to-edges conversion as it was before the word-at-a-time rewrite of the words with
 * unknown samples (per-bit loop there, per-bit scan of the unknown runs, a new builder per block),
 * kept verbatim as the oracle of {@link LogicEdgesWordScanOracleTest}. Test code only.
 */
final class OldPerBitLogicEdges {
    /** Products below this are exact in a double. */
    private static final double EXACT = 0x1p52;
    private boolean havePrevious;
    private boolean previousLevel;

    /** Creates a converter with no history. */
    OldPerBitLogicEdges() {
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
        // the level before sample 0: the previous block's, else the first known sample's
        boolean level;
        boolean known = havePrevious;
        if (havePrevious) {
            level = previousLevel;
        } else {
            int first = 0;
            while (first < n && inv != null && BitSets.get(inv, first)) {
                first++;
            }
            level = first < n && b.get(first);
            known = first < n;
        }
        final boolean initial = level;
        EdgeListBuilder out = new EdgeListBuilder(16 + (n >>> 5));
        for (int w = 0; w < words; w++) {
            final long x = bits[w];
            final long iv = inv == null ? 0 : inv[w];
            final int inWord = (w == words - 1 && (n & 63) != 0) ? n & 63 : 64;
            final long lastMask = inWord == 64 ? -1L : (1L << inWord) - 1;
            final double base = ((long) w << 6) - 0.5;
            if ((iv & lastMask) == 0) {
                // fast path: every sample of this word is known
                long diff = (x ^ ((x << 1) | (level ? 1L : 0L))) & lastMask;
                out.reserve(Long.bitCount(diff));
                while (diff != 0) {
                    int j = Long.numberOfTrailingZeros(diff);
                    out.addTime(origin + Math.round((base + j) * p));
                    diff &= diff - 1;
                }
                level = ((x >>> (inWord - 1)) & 1L) != 0;
            } else {
                // unknown samples hold the last known level, so a change hidden in an unknown run
                // appears at the end of the run (the first known sample with the new level)
                for (int j = 0; j < inWord; j++) {
                    if (((iv >>> j) & 1L) != 0) {
                        continue;
                    }
                    boolean v = ((x >>> j) & 1L) != 0;
                    if (v != level) {
                        out.addTime(origin + Math.round((base + j) * p));
                        level = v;
                    }
                }
            }
        }
        if (inv != null && BitSets.count(inv, n) > 0) {
            int i = 0;
            while (i < n) {
                if (!BitSets.get(inv, i)) {
                    i++;
                    continue;
                }
                int s = i;
                while (i < n && BitSets.get(inv, i)) {
                    i++;
                }
                out.addSpan(Math.max(spanStart, origin + Math.round((s - 0.5) * p)),
                        Math.min(spanEnd, origin + Math.round((i - 0.5) * p)));
            }
        }
        if (known) {
            // a block of nothing but unknown samples leaves no level behind
            havePrevious = true;
            previousLevel = level;
        }
        return out.build(b.channel(), spanStart, spanEnd, initial); // exact-length arrays: callers may rely on it
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
        int k = 0;
        carry = initial ? 1L : 0L;
        boolean integral = p == Math.rint(p) && 2.0 * n * p < EXACT;
        long period = (long) p;
        long offset = origin - (period >> 1);
        for (int w = 0; w < words; w++) {
            long x = bits[w];
            long mask = w == words - 1 ? lastMask : -1L;
            long diff = (x ^ (x << 1 | carry)) & mask;
            carry = x >>> 63;
            int base = w << 6;
            if (integral) {
                while (diff != 0) {
                    times[k++] = offset + (base + Long.numberOfTrailingZeros(diff)) * period;
                    diff &= diff - 1;
                }
            } else {
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

}
