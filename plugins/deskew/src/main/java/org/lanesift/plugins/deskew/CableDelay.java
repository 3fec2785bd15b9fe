package org.lanesift.plugins.deskew;

/**
 * Cable and fixture delay arithmetic: the time a length difference between two signal paths adds,
 * and what fraction of a unit interval that is at a given bit rate.
 *
 * <p>A signal travels along a cable at {@code v = c * VF}, with {@code c} = 299 792 458 m/s (exact
 * by the SI definition of the metre) and {@code VF} the cable's velocity factor. Solid
 * polyethylene-dielectric coax has a velocity factor of about 0.66 (common practice), about
 * 5.05 ns per metre. Foamed dielectrics and PCB traces differ (FR-4 microstrip is commonly quoted
 * near 0.5 to 0.6; common practice): use the figure of the cable's data sheet when you have it.
 *
 * <p>Units: lengths in metres, times in seconds or picoseconds as named, bit rates in bits per
 * second; one unit interval is {@code 1 / bitRate}. A positive length difference gives a positive
 * delay (the longer path arrives later); to correct it, apply the negative of the delay to the
 * longer path, or the delay itself to the shorter one.
 */
public final class CableDelay {
    /** Speed of light in vacuum, m/s (exact, SI). */
    public static final double SPEED_OF_LIGHT = 299_792_458.0;
    /** Velocity factor of solid polyethylene coax (common practice). */
    public static final double SOLID_PE_VELOCITY_FACTOR = 0.66;

    private CableDelay() {
    }

    /**
     * Propagation delay per metre.
     *
     * @param velocityFactor fraction of c, greater than 0 and at most 1
     * @return seconds per metre
     */
    public static double secondsPerMetre(double velocityFactor) {
        checkVf(velocityFactor);
        return 1.0 / (SPEED_OF_LIGHT * velocityFactor);
    }

    /**
     * Delay caused by a length difference.
     *
     * @param lengthDifferenceMetres extra length of one path, metres (negative when shorter)
     * @param velocityFactor         fraction of c, greater than 0 and at most 1
     * @return seconds
     */
    public static double delaySeconds(double lengthDifferenceMetres, double velocityFactor) {
        if (!Double.isFinite(lengthDifferenceMetres)) {
            throw new IllegalArgumentException("length difference must be a finite number of metres, got " + lengthDifferenceMetres);
        }
        return lengthDifferenceMetres * secondsPerMetre(velocityFactor);
    }

    /**
     * Delay caused by a length difference of solid-PE coax (velocity factor 0.66).
     *
     * @param lengthDifferenceMetres extra length, metres
     * @return seconds
     */
    public static double delaySeconds(double lengthDifferenceMetres) {
        return delaySeconds(lengthDifferenceMetres, SOLID_PE_VELOCITY_FACTOR);
    }

    /**
     * Delay caused by a length difference, in picoseconds, ready for a skew table.
     *
     * @param lengthDifferenceMetres extra length, metres
     * @param velocityFactor         fraction of c
     * @return picoseconds
     */
    public static double delayPs(double lengthDifferenceMetres, double velocityFactor) {
        return delaySeconds(lengthDifferenceMetres, velocityFactor) * 1e12;
    }

    /**
     * The fraction of a unit interval a delay represents.
     *
     * @param delaySeconds  the delay, seconds
     * @param bitRateBps    bits per second on one lane (a 100 MHz double-data-rate clock carries 200 Mbit/s)
     * @return delay / UI, for example 0.2 for a fifth of a bit
     */
    public static double fractionOfUnitInterval(double delaySeconds, double bitRateBps) {
        if (!(bitRateBps > 0) || !Double.isFinite(bitRateBps)) {
            throw new IllegalArgumentException("bit rate must be a positive number of bit/s, got " + bitRateBps);
        }
        return delaySeconds * bitRateBps;
    }

    /**
     * The fraction of a unit interval a length difference represents.
     *
     * @param lengthDifferenceMetres extra length, metres
     * @param velocityFactor         fraction of c
     * @param bitRateBps             bits per second on one lane
     * @return delay / UI
     */
    public static double fractionOfUnitInterval(double lengthDifferenceMetres, double velocityFactor, double bitRateBps) {
        return fractionOfUnitInterval(delaySeconds(lengthDifferenceMetres, velocityFactor), bitRateBps);
    }

    private static void checkVf(double vf) {
        if (!(vf > 0 && vf <= 1)) {
            throw new IllegalArgumentException("velocity factor must be greater than 0 and at most 1, got " + vf);
        }
    }
}
