package org.lanesift.plugins.serial;

import static org.junit.jupiter.api.Assertions.assertEquals;

import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;

class Logic8Test {
    @Property(tries = 200)
    void splitEqualsBitByBitReading(@ForAll byte[] b) {
        long[][] out = new long[8][(b.length + 63) / 64 + 1];
        Logic8.split(b, b.length, 8, out);
        for (int i = 0; i < b.length; i++) {
            for (int c = 0; c < 8; c++) {
                boolean want = (b[i] >> c & 1) != 0;
                assertEquals(want, (out[c][i >>> 6] >>> (i & 63) & 1) != 0, "sample " + i + " channel " + c);
            }
        }
    }

    @Property(tries = 200)
    void fewerChannelsFillOnlyThoseAndOverwriteOldContent(@ForAll byte[] b, @ForAll @IntRange(min = 1, max = 8) int channels) {
        int words = (b.length + 63) / 64;
        long[][] out = new long[8][words];
        for (long[] o : out) {
            java.util.Arrays.fill(o, -1L); // stale content from an earlier block
        }
        Logic8.split(b, b.length, channels, out);
        for (int c = 0; c < 8; c++) {
            for (int i = 0; i < words * 64; i++) {
                boolean got = (out[c][i >>> 6] >>> (i & 63) & 1) != 0;
                if (c >= channels) {
                    assertEquals(true, got, "channel " + c + " is not asked for and stays untouched");
                } else if (i < b.length) {
                    assertEquals((b[i] >> c & 1) != 0, got, "sample " + i + " channel " + c);
                } else {
                    assertEquals(false, got, "bit " + i + " past the end of channel " + c + " is cleared");
                }
            }
        }
    }
}
