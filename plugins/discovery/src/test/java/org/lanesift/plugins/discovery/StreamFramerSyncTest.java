package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * A streaming link whose picture repeats a bit pattern: every data burst carries a flat run of
 * loosely packed 18-bit pixels (each 6-bit component at the top of a byte, so the run repeats
 * {@code 00111111} byte after byte), far more often than bursts start. Cut at that pattern the
 * stream falls into many short pieces of whole bytes; the sync, which starts every burst, must
 * still win ({@link StreamFramer}: the cut is scored by its burst-length distribution, the share
 * of the stream in pieces of a recurring length, not by the number of pieces). Hand-made bursts
 * of one lane, back to back (invented test data).
 */
class StreamFramerSyncTest {
    static final String SYNC = "11010010111000110101";
    static final int WORD = 8;

    @Test
    void aPatternThatRepeatsInThePictureDoesNotWinOverTheSync() {
        int[] starts = new int[64];
        SampledLink link = link(new Random(20), starts);
        SampledLink framed = StreamFramer.frame(link);
        int bursts = starts[starts.length - 1];
        assertEquals(bursts, framed.bursts(), () -> "cuts at " + Arrays.toString(Arrays.copyOf(framed.start(), Math.min(12, framed.bursts()))));
        assertArrayEquals(Arrays.copyOf(starts, bursts), Arrays.copyOf(framed.start(), framed.bursts()));
    }

    @Test
    void theRepeatingPatternOutnumbersTheSync() {
        int[] starts = new int[64];
        SampledLink link = link(new Random(20), starts);
        int bursts = starts[starts.length - 1];
        int flat = 0; // starts of 24 bits of the flat pixel, overlapping
        for (int i = 0; i + 24 <= link.bits(); i++) {
            boolean all = true;
            for (int j = 0; j < 24 && all; j++) {
                all = link.bit(0, i + j) == (j % 8 >= 2);
            }
            flat += all ? 1 : 0;
        }
        // the case this class is about: frequency alone would pick the picture's pattern
        int seen = flat;
        assertTrue(seen > 4 * bursts, () -> seen + " flat pixels for " + bursts + " bursts");
    }

    /**
     * 40 bursts: the sync, a leading byte (0xA5 for data, one of three command bytes otherwise),
     * then 0 to 5 parameter bytes (a command) or 20 pixels of three bytes (data) with a flat run of
     * 6 to 14 pixels at a random place and smooth varying pixels around it. {@code starts} receives
     * the burst starts, and their count in its last element.
     */
    private static SampledLink link(Random r, int[] starts) {
        int bursts = 40;
        long[] lane = new long[(bursts * (SYNC.length() + 8 + 60 * 8) + 63) / 64 + 1];
        int n = 0;
        int shade = 10;
        for (int b = 0; b < bursts; b++) {
            starts[b] = n;
            for (int j = 0; j < SYNC.length(); j++) {
                n = put(lane, n, SYNC.charAt(j) == '1' ? 1 : 0, 1);
            }
            if (b % 3 == 2) {
                n = put(lane, n, new int[] {0x3C, 0x5A, 0xC3}[r.nextInt(3)], WORD);
                for (int q = r.nextInt(6); q > 0; q--) {
                    n = put(lane, n, r.nextInt(256), WORD);
                }
                continue;
            }
            n = put(lane, n, 0xA5, WORD);
            int runAt = r.nextInt(6);
            int runLength = 6 + r.nextInt(9);
            for (int p = 0; p < 20; p++) {
                boolean inRun = p >= runAt && p < runAt + runLength;
                shade = Math.max(0, Math.min(62, shade + r.nextInt(5) - 2));
                for (int c = 0; c < 3; c++) {
                    int component = inRun ? 63 : Math.max(0, Math.min(62, shade + 9 * c + r.nextInt(3)));
                    n = put(lane, n, component << 2, WORD);
                }
            }
        }
        starts[starts.length - 1] = bursts;
        return new SampledLink(new long[][] {lane}, n, new int[] {0}, new int[] {n}, 1, new boolean[] {false}, "streaming", 0);
    }

    /** Writes {@code bits} bits of {@code value}, most significant first, at {@code n}; returns the next position. */
    private static int put(long[] lane, int n, int value, int bits) {
        for (int j = bits - 1; j >= 0; j--) {
            if ((value >>> j & 1) != 0) {
                lane[n >>> 6] |= 1L << n;
            }
            n++;
        }
        return n;
    }
}
