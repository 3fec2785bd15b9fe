package org.lanesift.examples.demo;

/**
 * The imperfections the demo scenario puts into its captures, each a documented parameter (see
 * {@code docs/demo-scenario.md}). All values are invented for the demo; they are in the range a
 * bench with home-made probes and a mid-range scope shows.
 *
 * @param sampleRateHz          instrument sample rate
 * @param ringFrequencyHz       natural frequency of the probe's ground-lead resonance (second-order step response)
 * @param ringDamping           damping ratio of that resonance (below 1 rings)
 * @param instrumentBandwidthHz -3 dB bandwidth of the instrument front end (first-order)
 * @param randomJitterRmsPs     transmitter random jitter, Gaussian, RMS, common to all lanes
 * @param laneJitterRmsPs       extra random jitter per lane, independent
 * @param periodicJitterPs      transmitter periodic jitter amplitude (sinusoidal)
 * @param periodicJitterHz      its frequency
 * @param noiseRmsVolts         additive noise per leg, Gaussian RMS
 * @param commonModeOffsetVolts extra offset on every leg (ground offset between probe and board)
 * @param seed                  random seed: the same seed gives byte-identical captures
 */
public record Impairments(double sampleRateHz, double ringFrequencyHz, double ringDamping, double instrumentBandwidthHz,
                          double randomJitterRmsPs, double laneJitterRmsPs, double periodicJitterPs, double periodicJitterHz,
                          double noiseRmsVolts, double commonModeOffsetVolts, long seed) {

    /**
     * The impairments of the demo's pixel-link capture.
     *
     * @return the parameters
     */
    public static Impairments pixelLinkDefaults() {
        return new Impairments(2.5e9, 450e6, 0.3, 1.0e9, 8, 3, 15, 1.3e6, 0.003, 0.060, 7);
    }

    /**
     * The impairments of the demo's packet-link capture.
     *
     * @return the parameters
     */
    public static Impairments packetLinkDefaults() {
        return new Impairments(2.5e9, 520e6, 0.35, 1.0e9, 5, 2, 10, 0.9e6, 0.002, 0.0, 11);
    }
}
