package org.lanesift.plugins.pixellink;

import java.util.HashMap;
import java.util.Map;

/**
 * Integer measurements of one timing quantity over every line or frame: count, min, max and the
 * most frequent value (tracked for up to 256 distinct values; later new values still count in
 * min/max).
 */
final class Stat {
    private long count;
    private long min = Long.MAX_VALUE;
    private long max = Long.MIN_VALUE;
    private final Map<Long, long[]> hist = new HashMap<>();
    private long last;

    void add(long v) {
        count++;
        if (v < min) {
            min = v;
        }
        if (v > max) {
            max = v;
        }
        last = v;
        long[] c = hist.get(v);
        if (c != null) {
            c[0]++;
        } else if (hist.size() < 256) {
            hist.put(v, new long[] {1});
        }
    }

    long count() {
        return count;
    }

    long min() {
        return min;
    }

    long max() {
        return max;
    }

    long last() {
        return last;
    }

    boolean varying() {
        return count > 0 && min != max;
    }

    /** Most frequent value (smallest on a tie), or the last when the histogram is empty. */
    long typical() {
        long best = last;
        long bestN = -1;
        for (Map.Entry<Long, long[]> e : hist.entrySet()) {
            long n = e.getValue()[0];
            if (n > bestN || (n == bestN && e.getKey() < best)) {
                best = e.getKey();
                bestN = n;
            }
        }
        return best;
    }
}
