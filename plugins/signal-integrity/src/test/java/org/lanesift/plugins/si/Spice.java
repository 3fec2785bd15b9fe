package org.lanesift.plugins.si;

import static org.junit.jupiter.api.Assertions.fail;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;
import org.lanesift.data.AnalogBlock;

/**
 * Runs the ngspice netlists kept in src/test/spice (ngspice, Debian package "ngspice"). Each
 * netlist writes its waveform with {@code wrdata} after {@code linearize}, so the samples are
 * uniformly spaced. Without ngspice on the PATH the calling test is skipped, unless the
 * environment variable CI is "true", when it fails.
 */
final class Spice {
    private Spice() {
    }

    static Path ngspice() {
        return org.lanesift.testkit.ExternalTool.require("ngspice");
    }

    /**
     * Runs a netlist in a temporary directory and reads the file it writes.
     *
     * @param netlist file name under src/test/spice
     * @param output  the file the netlist's wrdata writes
     * @param dir     temporary directory
     * @return the waveform as one analog block (volts, uniform period)
     */
    static AnalogBlock run(String netlist, String output, Path dir) throws IOException, InterruptedException {
        Path exe = ngspice();
        Path src = Path.of("src", "test", "spice", netlist);
        Files.copy(src, dir.resolve(netlist));
        Process p = new ProcessBuilder(exe.toString(), netlist)
                .directory(dir.toFile())
                .redirectInput(new File("/dev/null"))
                .redirectErrorStream(true)
                .redirectOutput(dir.resolve("ngspice.log").toFile())
                .start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail("ngspice did not finish " + netlist + " within 120 s");
        }
        Path out = dir.resolve(output);
        if (p.exitValue() != 0 || !Files.exists(out)) {
            fail("ngspice failed on " + netlist + " (exit " + p.exitValue() + "): " + Files.readString(dir.resolve("ngspice.log")));
        }
        List<String> lines = Files.readAllLines(out);
        double[] t = new double[lines.size()];
        float[] v = new float[lines.size()];
        int n = 0;
        for (String line : lines) {
            String s = line.trim();
            if (s.isEmpty()) {
                continue;
            }
            String[] tok = s.split("\\s+");
            t[n] = Double.parseDouble(tok[0]);
            v[n] = Float.parseFloat(tok[1]);
            n++;
        }
        double dt = (t[n - 1] - t[0]) / (n - 1);
        for (int i = 1; i < n; i++) {
            if (Math.abs(t[i] - t[i - 1] - dt) > 1e-3 * dt) {
                fail(output + ": samples not uniformly spaced at row " + i + " (linearize missing?)");
            }
        }
        return new AnalogBlock("spice", 0, Math.round(t[0] * 1e15), dt * 1e15, v, n, null);
    }
}
