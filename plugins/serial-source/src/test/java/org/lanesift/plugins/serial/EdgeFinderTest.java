package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;

/** The fast converter against host-api's {@link LogicEdges} (the reference, with its own tests): same edges, block for block. */
class EdgeFinderTest {
    // sample periods: whole femtoseconds even and odd (50 MHz, a made-up odd one), and fractional (3 MHz, 1/3 GHz)
    static final double[] PERIODS = {2e7, 20_000_001, 1e15 / 3e6, 1e15 / 3.3e8};

    @Property(tries = 300)
    void sameEdgesAsTheReferenceForAnyCutsPeriodsAndUnknownSamples(@ForAll long seed, @ForAll @IntRange(min = 0, max = 3) int periodChoice,
                                                                  @ForAll @IntRange(min = 0, max = 4) int unknownEvery) {
        Random r = new Random(seed);
        double p = PERIODS[periodChoice];
        int total = 1 + r.nextInt(3000);
        long startIndex = r.nextInt(1 << 20);
        EdgeFinder fast = new EdgeFinder();
        LogicEdges ref = new LogicEdges();
        int at = 0;
        boolean level = r.nextBoolean();
        int density = 1 + r.nextInt(40);
        while (at < total) {
            int n = Math.min(total - at, r.nextInt(4) == 0 ? r.nextInt(3) : 1 + r.nextInt(300));
            long[] bits = new long[(n + 63) / 64 + 1];
            long[] inv = null;
            for (int i = 0; i < n; i++) {
                if (r.nextInt(density) == 0) {
                    level = !level;
                }
                if (level) {
                    bits[i >>> 6] |= 1L << i;
                }
            }
            if (unknownEvery > 0 && r.nextInt(unknownEvery + 1) == 0 && n > 0) {
                inv = new long[bits.length];
                int from = r.nextInt(n);
                int to = Math.min(n, from + 1 + r.nextInt(n - from));
                for (int i = from; i < to; i++) {
                    inv[i >>> 6] |= 1L << i;
                }
            }
            if (n > 0 && r.nextInt(3) == 0) {
                bits[bits.length - 1] |= 1L << 63; // junk past the length must be ignored
            }
            long first = startIndex + at;
            LogicBlock b = new LogicBlock("d", first, Math.round(first * p), p, bits, n, inv);
            Edges want = ref.toEdges(b);
            Edges got = fast.toEdges(b);
            String where = "block at " + at + "+" + n + " period " + p;
            assertEquals(want.startFs(), got.startFs(), where);
            assertEquals(want.endFs(), got.endFs(), where);
            assertEquals(want.initialLevel(), got.initialLevel(), where);
            assertArrayEquals(Arrays.copyOf(want.timesFs(), want.count()), Arrays.copyOf(got.timesFs(), got.count()), where);
            assertArrayEquals(Arrays.copyOf(want.invalidSpans(), 2 * want.invalidCount()),
                    Arrays.copyOf(got.invalidSpans(), 2 * got.invalidCount()), where);
            at += n;
        }
    }
}
