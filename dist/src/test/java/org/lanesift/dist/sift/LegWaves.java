package org.lanesift.dist.sift;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

/**
 * Test-tree waveform maker for the {@code sift} tests, independent of the demo scenario: turns a
 * bit stream on a slot grid into the two legs of a differential pair with their own delays,
 * Gaussian edge jitter, a tanh-shaped edge, a damped ringing after every edge and Gaussian noise.
 * Times are in seconds, levels in volts.
 */
final class LegWaves {
    private final double edgeTauS;
    private final double rateHz;
    private final int samples;
    private final Random rnd;

    /**
     * @param rateHz   sample rate
     * @param samples  samples per leg
     * @param edgeTauS tanh edge time constant; the 10-90 % time is about 2.2 x this. Keep the edge slower than
     *                 about two sample periods: an instrument's bandwidth limit does the same, and a faster edge
     *                 on a sample grid that divides the unit interval biases every interpolated crossing alike
     * @param seed     jitter and noise seed
     */
    LegWaves(double rateHz, int samples, double edgeTauS, long seed) {
        this.edgeTauS = edgeTauS;
        this.rateHz = rateHz;
        this.samples = samples;
        this.rnd = new Random(seed);
    }

    /**
     * One leg.
     *
     * @param levels      the leg's level in volts for every slot
     * @param slotS       slot time
     * @param delayS      the leg's delay
     * @param jitterRmsS  Gaussian jitter per edge
     * @param ringFrac    ringing amplitude as a fraction of the step
     * @param ringHz      ringing frequency
     * @param noiseRmsV   Gaussian noise per sample
     * @return the samples
     */
    float[] leg(double[] levels, double slotS, double delayS, double jitterRmsS, double ringFrac, double ringHz, double noiseRmsV) {
        float[] v = new float[samples];
        double dt = 1 / rateHz;
        // piecewise levels first, then each edge's shape correction over a short window
        int slots = levels.length;
        for (int i = 0; i < samples; i++) {
            int s = (int) Math.floor((i * dt - delayS) / slotS);
            v[i] = (float) levels[Math.max(0, Math.min(slots - 1, s))];
        }
        double tauRing = 3 / ringHz;
        for (int s = 1; s < slots; s++) {
            double step = levels[s] - levels[s - 1];
            if (step == 0) {
                continue;
            }
            double nominal = s * slotS + delayS;
            double te = nominal + jitterRmsS * rnd.nextGaussian();
            int from = Math.max(0, (int) Math.floor((Math.min(te, nominal) - 8 * edgeTauS) * rateHz));
            int to = Math.min(samples - 1, (int) Math.ceil((te + 4 * tauRing) * rateHz));
            for (int i = from; i <= to; i++) {
                double t = i * dt;
                double ideal = t >= nominal ? 1 : 0; // the piecewise level already holds this step
                double shape = 0.5 * (1 + Math.tanh((t - te) / edgeTauS));
                double tau = t - te;
                if (tau > 0) {
                    shape += ringFrac * Math.exp(-tau / tauRing) * Math.sin(2 * Math.PI * ringHz * tau) * Math.tanh(tau / edgeTauS);
                }
                v[i] += (float) (step * (shape - ideal));
            }
        }
        for (int i = 0; i < samples; i++) {
            v[i] += (float) (noiseRmsV * rnd.nextGaussian());
        }
        return v;
    }

    /** Writes a CSV capture: a header line with units, then time in seconds and one column per channel in volts. */
    static void writeCsv(Path file, double rateHz, String[] names, float[][] volts) throws IOException {
        try (BufferedWriter w = Files.newBufferedWriter(file, StandardCharsets.US_ASCII)) {
            StringBuilder sb = new StringBuilder("Time (s)");
            for (String n : names) {
                sb.append(',').append(n).append(" (V)");
            }
            w.write(sb.append('\n').toString());
            for (int i = 0; i < volts[0].length; i++) {
                sb.setLength(0);
                sb.append(String.format(Locale.ROOT, "%.12e", i / rateHz));
                for (float[] c : volts) {
                    sb.append(',').append(String.format(Locale.ROOT, "%.5f", c[i]));
                }
                w.write(sb.append('\n').toString());
            }
        }
    }
}
