package org.lanesift.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class PackedLogicTest {
    /** Every channel of every sample equals the bit read one at a time, whatever the length. */
    @ParameterizedTest
    @ValueSource(ints = {0, 1, 7, 63, 64, 65, 128, 1000, 4099})
    void splitEqualsBitByBitReading(int n) {
        byte[] b = new byte[n];
        new Random(n).nextBytes(b);
        long[][] out = new long[8][(n + 63) / 64 + 1];
        PackedLogic.split(b, n, out);
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < 8; c++) {
                boolean want = (b[i] >> c & 1) != 0;
                assertEquals(want, (out[c][i >>> 6] >>> (i & 63) & 1) != 0, "sample " + i + " channel " + c);
            }
        }
    }

    /** A subset (null entries, fewer than eight) fills only those and overwrites stale content. */
    @ParameterizedTest
    @ValueSource(ints = {1, 3, 5, 8})
    void aSubsetFillsOnlyThoseAndOverwritesOldContent(int channels) {
        Random r = new Random(channels);
        int n = 777;
        byte[] b = new byte[n];
        r.nextBytes(b);
        int words = (n + 63) / 64;
        long[][] out = new long[channels][];
        long[] untouched = new long[words];
        Arrays.fill(untouched, -1L);
        for (int c = 0; c < channels; c++) {
            out[c] = new long[words];
            Arrays.fill(out[c], -1L); // stale content from an earlier block
        }
        out[0] = null; // channel 0 not asked for
        PackedLogic.split(b, n, out);
        for (int c = 1; c < channels; c++) {
            for (int i = 0; i < words * 64; i++) {
                boolean got = (out[c][i >>> 6] >>> (i & 63) & 1) != 0;
                if (i < n) {
                    assertEquals((b[i] >> c & 1) != 0, got, "sample " + i + " channel " + c);
                } else {
                    assertEquals(false, got, "bit " + i + " past the end of channel " + c + " is cleared");
                }
            }
        }
    }

    /** 16-bit words in either byte order: channel k is bit k of the word's value. */
    @ParameterizedTest
    @ValueSource(booleans = {true, false})
    void sixteenBitWordsInEitherByteOrder(boolean littleEndian) {
        Random r = new Random(littleEndian ? 1 : 2);
        int n = 300;
        int[] word = new int[n];
        byte[] b = new byte[2 * n];
        for (int i = 0; i < n; i++) {
            word[i] = r.nextInt(1 << 16);
            int lo = word[i] & 0xFF;
            int hi = word[i] >>> 8;
            b[2 * i] = (byte) (littleEndian ? lo : hi);
            b[2 * i + 1] = (byte) (littleEndian ? hi : lo);
        }
        byte[] low = new byte[n];
        byte[] high = new byte[n];
        PackedLogic.deinterleave(b, n, littleEndian, low, high);
        long[][] a = new long[8][5];
        long[][] c = new long[8][5];
        PackedLogic.split(low, n, a);
        PackedLogic.split(high, n, c);
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < 16; k++) {
                long[] ch = k < 8 ? a[k] : c[k - 8];
                assertEquals((word[i] >>> k & 1) != 0, (ch[i >>> 6] >>> (i & 63) & 1) != 0, "word " + i + " bit " + k);
            }
        }
    }
}
