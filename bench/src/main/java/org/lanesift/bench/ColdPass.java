package org.lanesift.bench;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.lanesift.chain.BlockSink;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainBuilder;
import org.lanesift.chain.ChainFileReader;
import org.lanesift.chain.ChainSpec;
import org.lanesift.data.BitSets;
import org.lanesift.data.BitStream;
import org.lanesift.data.Block;
import org.lanesift.plugin.PluginRegistry;

/**
 * One pass of the chain of bench/scripts/ddr-chain.json, read from that file with its {@code raw}
 * source pointed at the capture given, over a capture written by bench/scripts/ddr-capture.py, in
 * this JVM, with no output files: raw, four differential stages with a fixed threshold of 0 V (legs
 * {@code clk_p, clk_n, d0_p ... d2_n}), dual-edge; the bits of the three data lanes are counted by
 * the host sink, which declares that it does not read the per-bit margins, as a run writing only
 * the packed binary bits does (runner {@code RunOutputs}), so the sampler sends its bits without
 * them; with {@code --margins} the sink declares that it reads them, as a run writing the bits CSV
 * does (the bits CSV itself is not written). Prints the bit and ones counts (the check that every
 * variant decodes the same), the pass's wall time and the JVM's uptime at the end, in seconds, the
 * bytes the pass allocated on its thread (the chain runs on the calling thread), and the CPU seconds
 * of the pass on its thread and in the whole process (the read-ahead thread, the compilers and the
 * collector besides): on two idle cores the pass takes about the larger of the calling thread's CPU
 * and the read-ahead thread's. With {@code --no-lend} every raw output also gets a host tap that
 * does nothing, so the source lends no block (host-api {@code Block}, "Ownership"): the same pass
 * with new arrays for every block. Meant to be started in a fresh JVM per run, with the JVM options
 * under test (bench/scripts/cold-start.sh). With {@code --passes N} it makes N passes in the same
 * JVM, one line each: the first is the cold pass, the later ones show the warm speed. The
 * read-ahead thread of the raw source is on unless the JVM is started with
 * {@code -Dlanesift.readAhead=false}; the allocation figure counts the calling thread only, so
 * blocks that thread allocates are not in it. With {@code --differences} it is the chain of
 * bench/scripts/ddr-diff-chain.json instead: the raw source takes each pair's difference from the
 * frames (its {@code differences} option) and the four receivers are in mode
 * {@code differential}; {@code --chain CHAIN} names another chain file whose bits outputs go to the
 * host. The chain files are found relative to the working directory (the scripts run from the
 * repository's root). Arguments, a chain file or a capture it cannot use: one line on the error
 * stream saying what and why, and exit code 2.
 *
 * <p>Usage: {@code java [options] -cp bench/target/benchmarks.jar org.lanesift.bench.ColdPass FILE [--no-lend] [--margins]
 * [--differences | --chain CHAIN] [--passes N]}
 */
public final class ColdPass {
    private static final String USAGE = "expected FILE [--no-lend] [--margins] [--differences | --chain CHAIN] [--passes N]";

    private ColdPass() {
    }

    /**
     * Runs the pass.
     *
     * @param args the capture written by bench/scripts/ddr-capture.py (its sidecar beside it), then the options above
     */
    public static void main(String[] args) {
        if (args.length == 0) {
            usage("no capture given");
        }
        Path file = Path.of(args[0]);
        boolean lend = true;
        boolean margins = false;
        Path chain = Path.of("bench/scripts/ddr-chain.json");
        int passes = 1;
        for (int i = 1; i < args.length; i++) {
            if (args[i].equals("--no-lend")) {
                lend = false;
            } else if (args[i].equals("--margins")) {
                margins = true;
            } else if (args[i].equals("--differences")) {
                chain = Path.of("bench/scripts/ddr-diff-chain.json");
            } else if (args[i].equals("--chain") && i + 1 < args.length) {
                chain = Path.of(args[++i]);
            } else if (args[i].equals("--passes") && i + 1 < args.length) {
                String n = args[++i];
                passes = n.matches("[1-9][0-9]{0,5}") ? Integer.parseInt(n) : usage("--passes '" + n + "' is not a whole number from 1");
            } else {
                usage("unknown argument '" + args[i] + "'");
            }
        }
        ChainSpec spec;
        try {
            spec = onCapture(new ChainFileReader().read(chain, chain.toString()).spec(), file);
        } catch (org.lanesift.chain.ChainFileException e) {
            System.err.println("ColdPass: " + e.getMessage() + " (run it from the repository's root, or give --chain)");
            System.exit(2);
            return;
        }
        try {
            for (int p = 0; p < passes; p++) {
                pass(spec, lend, margins);
            }
        } catch (org.lanesift.plugin.InputException e) {
            // a capture or sidecar that cannot be read as the chain asks: bad input, not a bug
            System.err.println("ColdPass: " + e.getMessage());
            System.exit(2);
        }
    }

    /** Prints what was wrong with the arguments and what was expected, then exits with 2 (bad input). */
    private static int usage(String what) {
        System.err.println("ColdPass: " + what + "; " + USAGE);
        System.exit(2);
        return 0;
    }

    /** The chain with every {@code raw} source reading {@code file} instead of the file its chain file names. */
    static ChainSpec onCapture(ChainSpec spec, Path file) {
        List<ChainSpec.Node> nodes = new ArrayList<>();
        for (ChainSpec.Node n : spec.nodes()) {
            if (n.plugin().equals("raw")) {
                Map<String, Object> o = new HashMap<>(n.options());
                o.put("file", file.toString());
                n = new ChainSpec.Node(n.id(), n.plugin(), o);
            }
            nodes.add(n);
        }
        return new ChainSpec(nodes, spec.wires());
    }

    private static void pass(ChainSpec spec, boolean lend, boolean margins) {
        long t0 = System.nanoTime();
        com.sun.management.ThreadMXBean threads = (com.sun.management.ThreadMXBean) java.lang.management.ManagementFactory.getThreadMXBean();
        long allocated0 = threads.getCurrentThreadAllocatedBytes();
        long cpu0 = threads.getCurrentThreadCpuTime();
        com.sun.management.OperatingSystemMXBean os =
                (com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory.getOperatingSystemMXBean();
        long processCpu0 = os.getProcessCpuTime();
        long[] counts = new long[2];
        ChainBuilder b = ChainBuilder.fromSpec(spec, PluginRegistry.discover(ColdPass.class.getClassLoader()));
        if (!lend) {
            for (ChainSpec.Wire w : spec.wires()) {
                String from = w.from().substring(0, w.from().indexOf('.'));
                if (spec.nodes().stream().anyMatch(n -> n.id().equals(from) && n.plugin().equals("raw"))) {
                    b.tap(w.from(), blk -> { });
                }
            }
        }
        b.outputs(new BlockSink() {
            @Override
            public void accept(String id, String port, Block blk) {
                BitStream s = (BitStream) blk;
                counts[0] += s.count();
                // a population count of the packed words, as a user's sink would count them (one
                // BitStream.bit call per bit cost the pass about 3 % of the decode thread)
                counts[1] += BitSets.count(s.values(), s.count());
            }

            @Override
            public boolean wants(String id, String port) {
                return port.startsWith("bits"); // the three lanes' bits, not the sampler's report
            }

            @Override
            public boolean readsBitMargins(String id, String port) {
                return margins;
            }
        });
        try (Chain c = b.build()) {
            c.run();
        }
        double pass = (System.nanoTime() - t0) / 1e9;
        double uptime = java.lang.management.ManagementFactory.getRuntimeMXBean().getUptime() / 1e3;
        double allocatedMb = (threads.getCurrentThreadAllocatedBytes() - allocated0) / 1e6;
        double cpu = (threads.getCurrentThreadCpuTime() - cpu0) / 1e9;
        double processCpu = (os.getProcessCpuTime() - processCpu0) / 1e9;
        System.out.printf(java.util.Locale.ROOT, "bits %d ones %d pass %.3f s uptime %.3f s allocated %.0f MB cpu %.3f s (this thread) %.3f s"
                + " (process)%n", counts[0], counts[1], pass, uptime, allocatedMb, cpu, processCpu);
    }
}
