package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link PackedLogic#split} against {@link OldByteShiftPackedLogic}, the code it replaced, word for
 * word: seeded random lengths (whole and partial words), bytes random, all zeros, all ones or one
 * channel toggling, any subset of the eight outputs, output arrays holding stale content.
 */
class PackedLogicSplitOracleTest {
    @Test
    void sameWordsAsTheOldSplit() {
        long ones = 0;
        for (int seed = 0; seed < 2000; seed++) {
            Random r = new Random(seed);
            int n = seed < 130 ? seed : r.nextInt(5000);
            byte[] b = new byte[n + r.nextInt(9)];
            for (int i = 0; i < b.length; ) {
                int run = 1 + r.nextInt(100);
                int kind = r.nextInt(4);
                for (int j = 0; j < run && i < b.length; j++, i++) {
                    b[i] = switch (kind) {
                        case 0 -> 0;
                        case 1 -> (byte) 0xFF;
                        case 2 -> (byte) (((i / 7) & 1) << (seed & 7));
                        default -> (byte) r.nextInt(256);
                    };
                }
            }
            int channels = 1 + r.nextInt(8);
            int words = (n + 63) / 64 + 1;
            long[][] got = new long[channels][];
            long[][] want = new long[channels][];
            for (int c = 0; c < channels; c++) {
                if (r.nextInt(5) != 0) {
                    got[c] = new long[words];
                    Arrays.fill(got[c], 0x5A5A5A5A5A5A5A5AL);
                    want[c] = got[c].clone();
                }
            }
            PackedLogic.split(b, n, got);
            OldByteShiftPackedLogic.split(b, n, want);
            for (int c = 0; c < channels; c++) {
                assertArrayEquals(want[c], got[c], "seed " + seed + " n " + n + " channel " + c);
                if (got[c] != null) {
                    ones += BitCount.of(got[c], n);
                }
            }
        }
        assertEquals(true, ones > 1_000_000, "the corpus has set bits: " + ones);
    }

    /** Set bits among the first n. */
    private static final class BitCount {
        static long of(long[] w, int n) {
            long s = 0;
            for (int i = 0; i < n; i++) {
                s += w[i >>> 6] >>> (i & 63) & 1;
            }
            return s;
        }
    }
}
