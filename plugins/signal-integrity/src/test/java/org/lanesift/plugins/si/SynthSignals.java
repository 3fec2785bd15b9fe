package org.lanesift.plugins.si;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.Artifact;
import org.lanesift.time.Femtos;

/** Synthetic waveforms with known properties for the tests of this module. */
final class SynthSignals {
    private SynthSignals() {
    }

    /**
     * An NRZ signal: bit k holds {@code +/-amp} over {@code [k ui, (k+1) ui)}, with linear transitions
     * of total duration {@code rampFs} centred on each bit boundary (shifted by a uniform jitter of
     * up to +/-{@code jitterFs}), plus uniform noise of up to +/-{@code noiseV}.
     */
    static AnalogBlock nrz(int bits, double uiFs, double rateHz, double amp, double rampFs, double jitterFs,
                           double noiseV, long seed) {
        Random r = new Random(seed);
        boolean[] b = new boolean[bits];
        double[] jit = new double[bits + 1];
        for (int i = 0; i < bits; i++) {
            b[i] = r.nextBoolean();
            jit[i] = (r.nextDouble() * 2 - 1) * jitterFs;
        }
        double periodFs = Femtos.periodFs(rateHz);
        int n = (int) Math.floor((bits - 1) * uiFs / periodFs);
        float[] v = new float[n];
        for (int i = 0; i < n; i++) {
            double t = i * periodFs;
            int k = (int) Math.floor(t / uiFs);
            double level = b[k] ? amp : -amp;
            // transition into bit k (around k*ui) and out of it (around (k+1)*ui)
            double c0 = k * uiFs + jit[k];
            double c1 = (k + 1) * uiFs + jit[k + 1];
            double val = level;
            if (k > 0 && b[k - 1] != b[k] && t < c0 + rampFs / 2) {
                val = ramp(t, c0, rampFs, b[k - 1] ? amp : -amp, level);
            }
            if (k + 1 < bits && b[k + 1] != b[k] && t > c1 - rampFs / 2) {
                val = ramp(t, c1, rampFs, level, b[k + 1] ? amp : -amp);
            }
            v[i] = (float) (val + (r.nextDouble() * 2 - 1) * noiseV);
        }
        return new AnalogBlock("sig", 0, 0, periodFs, v, n, null);
    }

    private static double ramp(double t, double centre, double rampFs, double from, double to) {
        double f = (t - (centre - rampFs / 2)) / rampFs;
        f = Math.max(0, Math.min(1, f));
        return from + f * (to - from);
    }

    /** Writes an artifact under target/si-pictures for looking at it. */
    static void save(Artifact a) {
        try {
            Path dir = Path.of("target", "si-pictures");
            Files.createDirectories(dir);
            Files.write(dir.resolve(a.fileName()), a.content());
        } catch (IOException e) {
            throw new AssertionError("cannot save " + a.fileName() + ": " + e);
        }
    }
}
