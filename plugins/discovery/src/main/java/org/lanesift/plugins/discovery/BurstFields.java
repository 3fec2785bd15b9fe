package org.lanesift.plugins.discovery;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Fields of the bursts under one framing hypothesis: the leading word (an opcode when it takes
 * few values), a length field (a word whose value plus a constant is the burst's word count), and
 * which leading word marks the data (pixel) bursts: the one whose bursts carry the most bits.
 */
final class BurstFields {
    /** Share of bursts that must agree for a length field to count. */
    static final double LENGTH_AGREEMENT = 0.9;

    /** Opcode statistics: value to {burst count, total bits}. */
    final Map<Long, long[]> opcodes = new HashMap<>();
    /** Word index of the length field, or -1. */
    int lengthWord = -1;
    /** Words in the burst minus the field's value. */
    int lengthOffset;
    double lengthShare;
    /** Leading word of the data bursts, or -1 when there are none. */
    long dataOpcode = -1;
    /** Share of bursts whose leading word is one of the eight most common. */
    double opcodeShare;

    static BurstFields find(List<MergedBurst> bursts, int wordBits, boolean msbFirst) {
        BurstFields f = new BurstFields();
        for (MergedBurst b : bursts) {
            if (b.words(wordBits) == 0) {
                continue;
            }
            long[] s = f.opcodes.computeIfAbsent(b.word(0, wordBits, msbFirst), k -> new long[2]);
            s[0]++;
            s[1] += b.length();
        }
        long bestBits = 0;
        long[] counts = f.opcodes.values().stream().mapToLong(v -> v[0]).sorted().toArray();
        long top = 0;
        for (int i = counts.length - 1; i >= 0 && i >= counts.length - 8; i--) {
            top += counts[i];
        }
        f.opcodeShare = bursts.isEmpty() ? 0 : top / (double) bursts.size();
        for (Map.Entry<Long, long[]> e : f.opcodes.entrySet()) {
            if (e.getValue()[0] >= 2 && e.getValue()[1] > bestBits) {
                bestBits = e.getValue()[1];
                f.dataOpcode = e.getKey();
            }
        }
        for (int q = 1; q <= 2 && f.lengthWord < 0; q++) {
            Map<Integer, Integer> offsets = new HashMap<>();
            int seen = 0;
            for (MergedBurst b : bursts) {
                int words = b.words(wordBits);
                if (words <= q) {
                    continue;
                }
                seen++;
                long v = b.word(q, wordBits, msbFirst);
                long off = words - v;
                if (off >= 0 && off <= 8) {
                    offsets.merge((int) off, 1, Integer::sum);
                }
            }
            for (Map.Entry<Integer, Integer> e : offsets.entrySet()) {
                double share = seen == 0 ? 0 : e.getValue() / (double) seen;
                if (seen >= 4 && share >= LENGTH_AGREEMENT && share > f.lengthShare) {
                    f.lengthWord = q;
                    f.lengthOffset = e.getKey();
                    f.lengthShare = share;
                }
            }
        }
        return f;
    }
}
