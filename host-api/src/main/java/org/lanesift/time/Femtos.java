package org.lanesift.time;

import java.util.Locale;

/**
 * Time arithmetic on the project's one time representation: a {@code long} count of femtoseconds.
 *
 * <p>A femtosecond (1e-15 s) is a thousand times finer than the picosecond resolution the timing
 * plugins need. A signed 64-bit count reaches +/-9,223 s, about 2 h 33 min, either side of the
 * capture origin, so a capture of an hour keeps exact 1 fs resolution everywhere. Absolute times
 * ({@code startFs}, edge times) are always {@code long} femtoseconds from the capture origin;
 * sample periods are {@code double} femtoseconds ({@code periodFs}) so that rates such as 3 GS/s
 * (333,333.33 fs) are represented without rounding; the time of a sample inside a block is the
 * block's exact {@code startFs} plus {@code index * periodFs}, which keeps sub-femtosecond error
 * for any block shorter than 2^30 samples.
 */
public final class Femtos {
    /** Femtoseconds per picosecond. */
    public static final long PER_PS = 1_000L;
    /** Femtoseconds per nanosecond. */
    public static final long PER_NS = 1_000_000L;
    /** Femtoseconds per microsecond. */
    public static final long PER_US = 1_000_000_000L;
    /** Femtoseconds per millisecond. */
    public static final long PER_MS = 1_000_000_000_000L;
    /** Femtoseconds per second. */
    public static final long PER_S = 1_000_000_000_000_000L;
    /** The largest time the representation holds, in seconds (about 9,223 s). */
    public static final double MAX_SECONDS = Long.MAX_VALUE / (double) PER_S;

    /**
     * The highest sample rate a capture may have: one sample per femtosecond, the time base's step
     * (a faster rate would put several samples on one instant).
     */
    public static final double MAX_RATE_HZ = 1e15;

    private Femtos() {
    }

    /**
     * Whether {@code samples} samples of period {@code periodFs} from {@code startFs} end within the
     * time base ({@link #MAX_SECONDS} either side of the origin).
     *
     * @param startFs  time of the first sample
     * @param periodFs sample period in femtoseconds, positive
     * @param samples  number of samples, at least 0
     * @return true when the last sample's time is representable
     */
    public static boolean spanFits(long startFs, double periodFs, long samples) {
        double end = startFs + (double) Math.max(0, samples - 1) * periodFs;
        return Double.isFinite(end) && end < Long.MAX_VALUE && end > Long.MIN_VALUE;
    }

    /**
     * Converts seconds to femtoseconds, rounding to the nearest femtosecond.
     *
     * @param seconds time in seconds; must be finite and within +/-{@link #MAX_SECONDS}
     * @return the time in femtoseconds
     * @throws IllegalArgumentException if the value is not finite or out of range
     */
    public static long fromSeconds(double seconds) {
        if (!Double.isFinite(seconds) || Math.abs(seconds) > MAX_SECONDS) {
            throw new IllegalArgumentException("time " + seconds + " s is outside +/-" + MAX_SECONDS + " s");
        }
        return Math.round(seconds * PER_S);
    }

    /**
     * Converts femtoseconds to seconds.
     *
     * @param fs time in femtoseconds
     * @return the time in seconds
     */
    public static double toSeconds(long fs) {
        return fs / (double) PER_S;
    }

    /**
     * Sample period in femtoseconds for a sample rate.
     *
     * @param rateHz samples per second, positive and finite
     * @return the period in femtoseconds
     */
    public static double periodFs(double rateHz) {
        if (!(rateHz > 0) || !Double.isFinite(rateHz)) {
            throw new IllegalArgumentException("sample rate must be a positive number of Hz, got " + rateHz);
        }
        return PER_S / rateHz;
    }

    /**
     * Sample rate in Hz for a period in femtoseconds.
     *
     * @param periodFs sample period in femtoseconds
     * @return samples per second
     */
    public static double rateHz(double periodFs) {
        return PER_S / periodFs;
    }

    /**
     * Formats a duration with an engineering unit (fs, ps, ns, us, ms, s) and four significant digits.
     *
     * @param fs duration in femtoseconds
     * @return for example {@code "1.250 ns"}
     */
    public static String format(double fs) {
        double a = Math.abs(fs);
        if (a < PER_PS) {
            return String.format(Locale.ROOT, "%.0f fs", fs);
        } else if (a < PER_NS) {
            return String.format(Locale.ROOT, "%.4g ps", fs / PER_PS);
        } else if (a < PER_US) {
            return String.format(Locale.ROOT, "%.4g ns", fs / PER_NS);
        } else if (a < PER_MS) {
            return String.format(Locale.ROOT, "%.4g us", fs / PER_US);
        } else if (a < PER_S) {
            return String.format(Locale.ROOT, "%.4g ms", fs / PER_MS);
        }
        return String.format(Locale.ROOT, "%.4g s", fs / PER_S);
    }
}
