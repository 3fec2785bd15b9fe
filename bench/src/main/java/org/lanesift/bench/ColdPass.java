package org.lanesift.bench;

import java.nio.file.Path;
import java.util.Map;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.data.BitStream;
import org.lanesift.plugin.PluginRegistry;

/**
 * One pass of the {@link DdrCapture} chain over a capture in this JVM, with no output files: raw,
 * four differential stages with a fixed threshold, dual-edge; the bits of the three data lanes are
 * counted through taps. Prints the bit and ones counts (the check that every variant decodes the
 * same) and the pass's wall time and the JVM's uptime at the end, in seconds. Meant to be started
 * in a fresh JVM per run, with the JVM options under test (bench/scripts/cold-start.sh).
 *
 * <p>Usage: {@code java [options] -cp bench/target/benchmarks.jar org.lanesift.bench.ColdPass FILE}
 */
public final class ColdPass {
    private ColdPass() {
    }

    /**
     * Runs the pass.
     *
     * @param args the capture written by {@link DdrCapture}
     */
    public static void main(String[] args) {
        long t0 = System.nanoTime();
        Path file = Path.of(args[0]);
        long[] counts = new long[2];
        ChainBuilder b = Chain.builder(PluginRegistry.discover(ColdPass.class.getClassLoader()))
                .add("cap", "raw", Map.of("file", file.toString()))
                .add("sampler", "dual-edge", Map.of("mode", "ddr", "lanes", 3));
        for (String p : new String[] {"CLK", "D0", "D1", "D2"}) {
            b.add("rx-" + p, "differential", Map.of("thresholdVolts", 0.0, "hysteresisVolts", 0.05, "levelReport", false))
                    .wire("cap." + p + "_P", "rx-" + p + ".p").wire("cap." + p + "_N", "rx-" + p + ".n")
                    .wire("rx-" + p + ".edges", "sampler." + (p.equals("CLK") ? "clock" : "lane" + p.charAt(1)));
        }
        for (int lane = 0; lane < 3; lane++) {
            b.tap("sampler.bits" + lane, blk -> {
                BitStream s = (BitStream) blk;
                counts[0] += s.count();
                for (int i = 0; i < s.count(); i++) {
                    counts[1] += s.bit(i) ? 1 : 0;
                }
            });
        }
        try (Chain c = b.build()) {
            c.run();
        }
        double pass = (System.nanoTime() - t0) / 1e9;
        double uptime = java.lang.management.ManagementFactory.getRuntimeMXBean().getUptime() / 1e3;
        System.out.printf(java.util.Locale.ROOT, "bits %d ones %d pass %.3f s uptime %.3f s%n", counts[0], counts[1], pass, uptime);
    }
}
