package org.lanesift.plugins.discovery;

import java.util.Arrays;
import org.lanesift.data.Edges;

/** Keeps the transition times of one signal, up to a limit, as a growing primitive array. */
final class EdgeCollector {
    private final int limit;
    long[] times = new long[1024];
    int count;
    boolean initialLevel;
    private boolean started;
    private boolean level;
    /** With {@code rising} set, the subset of transitions that go high (the clock). */
    long[] rising = new long[512];
    int nRising;
    long[] falling = new long[512];
    int nFalling;

    EdgeCollector(int limit) {
        this.limit = limit;
    }

    void accept(Edges e, boolean splitClock) {
        if (!started) {
            started = true;
            initialLevel = e.initialLevel();
            level = initialLevel;
        }
        for (int i = 0; i < e.count() && count < limit; i++) {
            long t = e.timesFs()[i];
            level = !level;
            if (splitClock) {
                if (level) {
                    if (nRising == rising.length) {
                        rising = Arrays.copyOf(rising, nRising * 2);
                    }
                    rising[nRising++] = t;
                } else {
                    if (nFalling == falling.length) {
                        falling = Arrays.copyOf(falling, nFalling * 2);
                    }
                    falling[nFalling++] = t;
                }
            }
            if (count == times.length) {
                times = Arrays.copyOf(times, count * 2);
            }
            times[count++] = t;
        }
    }

    boolean full() {
        return count >= limit;
    }
}
