package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** Every helper against a naive one-bit-at-a-time loop over a seeded corpus. */
class PackedBitsTest {
    private static boolean bit(long[] a, int i) {
        return i < a.length * 64 && ((a[i / 64] >>> (i % 64)) & 1) != 0;
    }

    private static long[] random(Random r, int words) {
        long[] a = new long[words];
        for (int i = 0; i < words; i++) {
            a[i] = r.nextInt(4) == 0 ? (r.nextBoolean() ? 0 : -1L) : r.nextLong();
        }
        return a;
    }

    @Test
    void get64ReadsTheNext64Bits() {
        Random r = new Random(1);
        for (int t = 0; t < 2000; t++) {
            long[] a = random(r, 1 + r.nextInt(5));
            int pos = r.nextInt(a.length * 64);
            long expected = 0;
            for (int k = 0; k < 64; k++) {
                if (bit(a, pos + k)) {
                    expected |= 1L << k;
                }
            }
            assertEquals(expected, PackedBits.get64(a, pos));
        }
    }

    @Test
    void appendCopiesARange() {
        Random r = new Random(2);
        for (int t = 0; t < 2000; t++) {
            long[] src = random(r, 1 + r.nextInt(6));
            int srcPos = r.nextInt(src.length * 64);
            int n = r.nextInt(src.length * 64 - srcPos + 1);
            int dstPos = r.nextInt(200);
            long[] dst = new long[(dstPos + n + 63) / 64 + 1];
            long[] expected = dst.clone();
            for (int i = 0; i < dstPos; i++) {
                if (r.nextBoolean()) {
                    dst[i / 64] |= 1L << i;
                    expected[i / 64] |= 1L << i;
                }
            }
            for (int i = 0; i < n; i++) {
                if (bit(src, srcPos + i)) {
                    expected[(dstPos + i) / 64] |= 1L << (dstPos + i);
                }
            }
            PackedBits.append(src, srcPos, dst, dstPos, n);
            assertArrayEquals(expected, dst);
        }
    }

    @Test
    void orShiftedMergesARangeAtZero() {
        Random r = new Random(3);
        for (int t = 0; t < 2000; t++) {
            long[] src = random(r, 1 + r.nextInt(6));
            int from = r.nextInt(src.length * 64);
            int len = 1 + r.nextInt(300);
            long[] dst = random(r, (len + 63) / 64);
            long[] expected = new long[dst.length];
            for (int i = 0; i < len; i++) {
                if (bit(dst, i) || bit(src, from + i)) {
                    expected[i / 64] |= 1L << i;
                }
            }
            PackedBits.orShifted(dst, src, from, len);
            assertArrayEquals(expected, dst);
        }
    }

    @Test
    void finalRunStartFindsTheLastChange() {
        Random r = new Random(4);
        for (int t = 0; t < 2000; t++) {
            long[] a = random(r, 1 + r.nextInt(4));
            int n = 1 + r.nextInt(a.length * 64);
            boolean last = bit(a, n - 1);
            int expected = n - 1;
            while (expected > 0 && bit(a, expected - 1) == last) {
                expected--;
            }
            assertEquals(expected, PackedBits.finalRunStart(a, n));
        }
    }
}
