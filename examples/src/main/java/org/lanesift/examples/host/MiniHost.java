package org.lanesift.examples.host;

import java.io.BufferedInputStream;
import java.io.DataInputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.lanesift.chain.Chain;
import org.lanesift.chain.ChainException;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.plugin.PluginRegistry;

/**
 * The smallest useful host: it reads a capture with its own code (as a GUI already holds its
 * buffers), builds a chain through the host API, pushes the buffers block by block and prints
 * the annotations and edge counts.
 *
 * <p>Usage: {@code MiniHost FILE RATE_HZ CHANNELS P_INDEX N_INDEX} where FILE holds interleaved
 * signed 16-bit little-endian codes at 50 uV per code (the demo's raw export).
 */
public final class MiniHost {
    private MiniHost() {
    }

    /**
     * Runs the host.
     *
     * @param args file, rate, channel count, index of the P leg, index of the N leg
     * @throws IOException if the file cannot be read
     */
    public static void main(String[] args) throws IOException {
        if (args.length != 5) {
            System.err.println("usage: MiniHost FILE RATE_HZ CHANNELS P_INDEX N_INDEX");
            System.exit(2);
        }
        Path file = Path.of(args[0]);
        double periodFs = 1e15 / Double.parseDouble(args[1]);
        int channels = Integer.parseInt(args[2]);
        int pi = Integer.parseInt(args[3]);
        int ni = Integer.parseInt(args[4]);
        long[] edges = new long[1];
        Chain chain;
        try {
            chain = Chain.builder(PluginRegistry.discover(null))
                    .input("p", DataKind.ANALOG).input("n", DataKind.ANALOG)
                    .add("rx", "differential", Map.of("mode", "pair"))
                    .wire("p", "rx.p").wire("n", "rx.n")
                    .annotations((src, a) -> System.out.println(src + " [" + a.severity() + "] " + a.kind() + ": " + a.label()))
                    .tap("rx.edges", b -> edges[0] += ((Edges) b).count())
                    .build();
        } catch (ChainException e) {
            System.err.println("cannot build the chain: " + e.getMessage());
            System.exit(2);
            return;
        }
        final int block = 65536;
        float[] p = new float[block];
        float[] n = new float[block];
        long first = 0;
        try (InputStream in = new BufferedInputStream(Files.newInputStream(file), 1 << 20)) {
            DataInputStream d = new DataInputStream(in);
            int k = 0;
            boolean eof = false;
            while (!eof) {
                try {
                    for (int c = 0; c < channels; c++) {
                        short code = Short.reverseBytes(d.readShort());
                        if (c == pi) {
                            p[k] = code * 50e-6f;
                        } else if (c == ni) {
                            n[k] = code * 50e-6f;
                        }
                    }
                    k++;
                } catch (EOFException e) {
                    eof = true;
                }
                if (k == block || (eof && k > 0)) {
                    long startFs = Math.round(first * periodFs);
                    chain.push("p", new AnalogBlock("P", first, startFs, periodFs, p.clone(), k, null));
                    chain.push("n", new AnalogBlock("N", first, startFs, periodFs, n.clone(), k, null));
                    first += k;
                    k = 0;
                }
            }
        }
        chain.finish();
        chain.close();
        System.out.println(first + " samples per leg, " + edges[0] + " edges");
    }
}
