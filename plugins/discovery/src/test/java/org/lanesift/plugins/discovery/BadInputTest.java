package org.lanesift.plugins.discovery;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.lanesift.plugin.InputFormatException;

/** Signals that cannot be a link: refused with a line that says what was expected (exit 2), never a guess. */
class BadInputTest {
    @Test
    void aDataLaneGivenAsTheClockIsRefused() {
        LinkEdgesInput in = DiscoveryReportTestLink.input();
        long[] d = in.laneEdgesFs()[0];
        int n = in.laneCounts()[0];
        long[] rise = new long[n / 2 + 1];
        long[] fall = new long[n / 2 + 1];
        int r = 0;
        int f = 0;
        boolean level = in.laneInitial()[0];
        for (int i = 0; i < n; i++) {
            level = !level;
            if (level) {
                rise[r++] = d[i];
            } else {
                fall[f++] = d[i];
            }
        }
        LinkEdgesInput wrong = new LinkEdgesInput("D0", rise, r, fall, f, new String[] {"D1"}, new boolean[] {in.laneInitial()[1]},
                new long[][] {in.laneEdgesFs()[1]}, new int[] {in.laneCounts()[1]});
        InputFormatException e = assertThrows(InputFormatException.class, () -> new DiscoveryEngine(1 << 20).discover(wrong));
        assertTrue(e.getMessage().startsWith("clock: only ") && e.getMessage().contains("is the signal given as the clock the link's clock?"),
                e.getMessage());
    }

    @Test
    void tooFewClockEdgesAreRefused() {
        LinkEdgesInput in = new LinkEdgesInput("CLK", new long[] {0, 10, 20}, 3, new long[] {5, 15, 25}, 3, new String[] {"D0"},
                new boolean[] {false}, new long[][] {{7}}, new int[] {1});
        InputFormatException e = assertThrows(InputFormatException.class, () -> new DiscoveryEngine(1 << 20).discover(in));
        assertTrue(e.getMessage().contains("at least 16 expected"), e.getMessage());
    }

    /** The hand-written link of {@link DiscoveryReportTest}. */
    static final class DiscoveryReportTestLink {
        static LinkEdgesInput input() {
            return new LinkFormatGenerator(77).fixed(8, false, "double-edge", 2, LaneDistribution.WORD, "00011101", true, null, false,
                    PixelFormat.RGB888, 48, 30).input;
        }
    }
}
