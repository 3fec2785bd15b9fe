package org.lanesift.plugins.discovery;

import java.util.ArrayList;
import java.util.List;
import org.lanesift.data.BitSets;
import org.lanesift.kit.PackedBits;

/**
 * Merges the lanes of every burst into {@link MergedBurst}s for one framing hypothesis: the sync
 * ({@code syncBits} on every lane) is dropped, and with idle runs between bursts each lane's
 * payload is extended with idle-level bits to a whole number of words (the end of a burst whose
 * last bits equal the idle level cannot be seen otherwise).
 */
final class LaneMerger {
    private LaneMerger() {
    }

    static List<MergedBurst> merge(SampledLink link, int syncBits, int wordBits, LaneDistribution dist, int maxBursts) {
        int n = link.lanes().length;
        List<MergedBurst> out = new ArrayList<>();
        boolean idleRuns = link.burstMode().equals("idle-runs");
        for (int b = 0; b < link.bursts() && out.size() < maxBursts; b++) {
            int from = link.start()[b] + syncBits;
            int len = link.end()[b] - from;
            if (len <= 0) {
                continue;
            }
            if (idleRuns) {
                int unit = dist == LaneDistribution.BIT ? wordBits / gcd(wordBits, n) : wordBits;
                int padded = (len + unit - 1) / unit * unit;
                int room = (b + 1 < link.bursts() ? link.start()[b + 1] : link.bits()) - from;
                len = Math.min(padded, room);
            }
            if (dist == LaneDistribution.INDEPENDENT) {
                for (int k = 0; k < n; k++) {
                    long[] w = new long[BitSets.words(len)];
                    copy(link.lanes()[k], from, w, 0, len);
                    out.add(new MergedBurst(w, len, b));
                }
                continue;
            }
            int total = len * n;
            long[] w = new long[BitSets.words(total)];
            if (n == 1) {
                copy(link.lanes()[0], from, w, 0, len);
            } else if (dist == LaneDistribution.BIT) {
                for (int i = 0; i < total; i++) {
                    if (link.bit(i % n, from + i / n)) {
                        w[i >>> 6] |= 1L << i;
                    }
                }
            } else {
                int words = len / wordBits;
                total = words * wordBits * n;
                for (int q = 0; q < words * n; q++) {
                    int k = q % n;
                    copy(link.lanes()[k], from + (q / n) * wordBits, w, q * wordBits, wordBits);
                }
            }
            out.add(new MergedBurst(w, total, b));
        }
        return out;
    }

    private static void copy(long[] src, int from, long[] dst, int at, int n) {
        PackedBits.append(src, from, dst, at, n);
    }

    static int gcd(int a, int b) {
        return b == 0 ? a : gcd(b, a % b);
    }
}
