package org.lanesift.plugins.serial;

import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;

/**
 * One channel's logic-to-edges converter with the results of {@link LogicEdges} (same times, same
 * spans, same level carried across blocks), faster for blocks without unknown samples: the
 * transitions of a block are counted first (one {@code Long.bitCount} per word) so the time
 * array is allocated once at its exact length, and when the sample period is a whole number of
 * femtoseconds each time is {@code origin + j * period - floor(period / 2)} in integer arithmetic,
 * which is what {@code Math.round((j - 0.5) * period)} gives whenever the product is exact in a
 * double (checked per block). Blocks with unknown samples go to {@link LogicEdges}.
 */
final class EdgeFinder {
    private static final double EXACT = 0x1p52;
    private boolean havePrevious;
    private boolean previousLevel;
    private final LogicEdges slow = new LogicEdges();

    /** Forgets the level, as after a gap. */
    void reset() {
        havePrevious = false;
    }

    Edges toEdges(LogicBlock b) {
        final int n = b.length();
        final long[] inv = b.invalid();
        if (n == 0) {
            long start = b.startFs() - Math.round(b.periodFs() * 0.5);
            return new Edges(b.channel(), start, Math.max(start, b.startFs() + Math.round(-0.5 * b.periodFs())), previousLevel,
                    new long[0], 0, null, 0);
        }
        if (inv != null && BitSets.count(inv, n) > 0) {
            return viaLogicEdges(b);
        }
        final long[] bits = b.bits();
        final double p = b.periodFs();
        final long origin = b.startFs();
        final long spanStart = origin - Math.round(p * 0.5);
        final long spanEnd = origin + Math.round((n - 0.5) * p);
        final int words = BitSets.words(n);
        final boolean initial = havePrevious ? previousLevel : (bits[0] & 1L) != 0;
        // pass 1: count
        int count = 0;
        long carry = initial ? 1L : 0L;
        for (int w = 0; w < words; w++) {
            long x = bits[w];
            long mask = w == words - 1 && (n & 63) != 0 ? (1L << (n & 63)) - 1 : -1L;
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
            long mask = w == words - 1 && (n & 63) != 0 ? (1L << (n & 63)) - 1 : -1L;
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

    /** Unknown samples: {@link LogicEdges}, told the level carried from the previous block. */
    private Edges viaLogicEdges(LogicBlock b) {
        slow.reset();
        if (havePrevious) {
            // a one-sample block just before this one hands the carried level over
            long[] one = {previousLevel ? 1L : 0L};
            slow.toEdges(new LogicBlock(b.channel(), b.firstIndex() - 1, b.startFs() - Math.round(b.periodFs()),
                    b.periodFs(), one, 1, null));
        }
        Edges e = slow.toEdges(b);
        if (BitSets.count(b.invalid(), b.length()) < b.length()) {
            havePrevious = true;
            previousLevel = e.initialLevel() ^ ((e.count() & 1) != 0);
        }
        return e;
    }
}
