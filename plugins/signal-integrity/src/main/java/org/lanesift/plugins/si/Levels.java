package org.lanesift.plugins.si;

import java.util.Arrays;
import org.lanesift.kit.TwoLevelFinder;
import org.lanesift.kit.TwoLevels;

/**
 * The two logic levels of a signal (volts), found by the shared {@link TwoLevelFinder} from the first
 * samples of a capture. A fixed count of first samples is used, so the result does not depend on
 * how the capture is cut into blocks.
 */
final class Levels {
    /** Low level, volts. */
    final double lowVolts;
    /** High level, volts. */
    final double highVolts;

    Levels(double lowVolts, double highVolts) {
        this.lowVolts = lowVolts;
        this.highVolts = highVolts;
    }

    double swing() {
        return highVolts - lowVolts;
    }

    /** Voltage at a fraction of the swing (0 = low, 1 = high). */
    double at(double fraction) {
        return lowVolts + fraction * (highVolts - lowVolts);
    }

    /**
     * Estimates the levels with the shared {@link TwoLevelFinder}.
     *
     * @param v samples
     * @param n how many to use
     * @return the levels, or null when the samples do not show two distinct levels
     */
    static Levels estimate(float[] v, int n) {
        TwoLevels lv = TwoLevelFinder.find(v, n);
        return lv.twoLevels() ? new Levels(lv.low(), lv.high()) : null;
    }

    @Override
    public String toString() {
        return "Levels[" + lowVolts + " V, " + highVolts + " V]";
    }

    /** Collects the first {@code limit} valid samples of a capture for {@link #estimate}. */
    static final class Collector {
        private final int limit;
        private float[] buf = new float[1024];
        private int n;

        Collector(int limit) {
            this.limit = limit;
        }

        boolean full() {
            return n >= limit;
        }

        int count() {
            return n;
        }

        /** Takes samples from a block until full; returns how many of the block's samples it took. */
        int take(float[] v, int from, int to, long[] invalid) {
            int i = from;
            while (i < to && n < limit) {
                if (invalid == null || (invalid[i >>> 6] & (1L << i)) == 0) {
                    if (n == buf.length) {
                        buf = Arrays.copyOf(buf, Math.min(limit, buf.length * 2));
                    }
                    buf[n++] = v[i];
                }
                i++;
            }
            return i - from;
        }

        Levels levels() {
            return estimate(buf, n);
        }

        float[] samples() {
            return buf;
        }
    }
}
