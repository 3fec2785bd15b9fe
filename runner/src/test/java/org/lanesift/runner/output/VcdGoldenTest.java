package org.lanesift.runner.output;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.lanesift.data.Block;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.WordStream;
import org.lanesift.testkit.Synth;

/**
 * The streaming VCD writer against the writer before issue 19 ({@link LegacyVcdWriter}, every change
 * spooled and merged at close) as oracle, byte for byte after the {@code $date} section, on seeded
 * random signal sets: logic with unknown runs and gaps, edges with unknown spans and gaps, word
 * streams on several lanes with and without flags, times before 0, blocks of different signals
 * arriving in any order (each signal's own blocks in non-decreasing start order, as
 * {@link Block} promises), with and without declarations, and memory budgets that force the spools.
 */
class VcdGoldenTest {
    @TempDir
    Path tmp;

    private record Sig(String scope, String name, List<Block> blocks) {
    }

    private static List<Block> logic(Random r, String name, long startFs) {
        int n = 1 + r.nextInt(3000);
        double p = 1000 + r.nextDouble() * 400_000;
        long[] bits = new long[(n + 63) / 64];
        boolean level = r.nextBoolean();
        for (int i = 0; i < n; i++) {
            if (r.nextInt(8) == 0) {
                level = !level;
            }
            if (level) {
                bits[i >> 6] |= 1L << i;
            }
        }
        long[] inv = null;
        if (r.nextBoolean()) {
            inv = new long[bits.length];
            for (int k = 0; k < 3; k++) {
                int at = r.nextInt(n);
                for (int i = at; i < Math.min(n, at + r.nextInt(40)); i++) {
                    inv[i >> 6] |= 1L << i;
                }
            }
        }
        LogicBlock whole = new LogicBlock(name, 0, startFs, p, bits, n, inv);
        int[] sizes = {1 + r.nextInt(700), 1 + r.nextInt(700), 1 + r.nextInt(700)};
        List<Block> out = new ArrayList<>();
        long shift = 0;
        for (LogicBlock b : Synth.split(whole, sizes)) {
            if (r.nextInt(6) == 0) {
                shift += (long) (p * (2 + r.nextInt(50))); // a gap: lost data
            }
            out.add(new LogicBlock(name, b.firstIndex(), b.startFs() + shift, p, b.bits(), b.length(), b.invalid()));
        }
        return out;
    }

    private static List<Block> edges(Random r, String name, long startFs) {
        int n = r.nextInt(400);
        long[] t = new long[n];
        long at = startFs;
        for (int i = 0; i < n; i++) {
            at += 1 + r.nextInt(2_000_000);
            t[i] = at;
        }
        long end = at + 1 + r.nextInt(1_000_000);
        int spans = r.nextInt(4);
        long[] sp = new long[2 * spans];
        for (int s = 0; s < spans; s++) {
            long a = startFs + (long) (r.nextDouble() * (end - startFs) * (s + r.nextDouble()) / spans);
            sp[2 * s] = Math.min(a, end - 1);
            sp[2 * s + 1] = Math.min(end, sp[2 * s] + 1 + r.nextInt(3_000_000));
        }
        for (int s = 1; s < spans; s++) { // in order, not overlapping
            sp[2 * s] = Math.max(sp[2 * s], sp[2 * s - 1]);
            sp[2 * s + 1] = Math.max(sp[2 * s + 1], sp[2 * s]);
        }
        Edges whole = new Edges(name, startFs, end, r.nextBoolean(), t, n, sp, spans);
        int cuts = r.nextInt(5);
        long[] c = new long[cuts];
        for (int i = 0; i < cuts; i++) {
            c[i] = startFs + 1 + (long) (r.nextDouble() * (end - startFs - 2));
        }
        Arrays.sort(c);
        List<Block> out = new ArrayList<>();
        for (Edges e : Synth.split(whole, Arrays.stream(c).distinct().toArray())) {
            if (e.endFs() > e.startFs() && r.nextInt(7) != 0) { // now and then a piece is lost: a gap
                out.add(e);
            }
        }
        return out;
    }

    private static List<Block> words(Random r, String name, long startFs) {
        List<Block> out = new ArrayList<>();
        long at = startFs;
        int lanes = 1 + r.nextInt(3);
        boolean flags = r.nextBoolean();
        for (int b = 0; b < 1 + r.nextInt(4); b++) {
            int n = r.nextInt(20);
            long[] v = new long[n];
            long[] st = new long[n];
            long[] en = new long[n];
            int[] lane = new int[n];
            byte[] fl = new byte[n];
            long blockStart = at;
            for (int i = 0; i < n; i++) {
                lane[i] = r.nextInt(lanes);
                if (lane[i] == 0) {
                    at += r.nextInt(3) * 1000L;
                }
                st[i] = at;
                en[i] = at + 500 + r.nextInt(1500);
                v[i] = r.nextInt(256);
                fl[i] = flags && r.nextInt(5) == 0 ? (byte) (1 << r.nextInt(8)) : 0;
            }
            at += 3000;
            out.add(new WordStream(name, blockStart, at, n, 8, v, st, en, lane, fl));
        }
        return out;
    }

    /** Gives a block to the new writer or to the oracle. */
    private static void feed(Object w, String scope, String name, Block b) {
        VcdWriter v = w instanceof VcdWriter x ? x : null;
        LegacyVcdWriter o = v == null ? (LegacyVcdWriter) w : null;
        if (b instanceof LogicBlock l) {
            if (v != null) {
                v.logic(scope, name, l);
            } else {
                o.logic(scope, name, l);
            }
        } else if (b instanceof Edges e) {
            if (v != null) {
                v.edges(scope, name, e);
            } else {
                o.edges(scope, name, e);
            }
        } else if (v != null) {
            v.words(scope, name, (WordStream) b);
        } else {
            o.words(scope, name, (WordStream) b);
        }
    }

    private static String withoutDate(Path f) throws Exception {
        String s = Files.readString(f);
        return s.substring(s.indexOf("$end\n") + 5);
    }

    @Test
    void sameFileAsTheWriterBeforeOnRandomSignalSets() throws Exception {
        Random r = new Random(20261203L);
        int streamed = 0;
        int spooled = 0;
        for (int c = 0; c < 160; c++) {
            int nSig = 1 + r.nextInt(7);
            boolean withWords = r.nextInt(5) == 0;
            List<Sig> sigs = new ArrayList<>();
            for (int i = 0; i < nSig; i++) {
                long start = r.nextInt(4) == 0 ? -r.nextInt(5_000_000) : r.nextInt(5_000_000);
                String scope = "u" + r.nextInt(3);
                String name = "s" + i;
                int kind = r.nextInt(withWords ? 3 : 2);
                sigs.add(new Sig(scope, name, kind == 0 ? logic(r, name, start) : kind == 1 ? edges(r, name, start) : words(r, name, start)));
            }
            // the arrival order: signals interleaved at random, each one's blocks in order
            List<int[]> order = new ArrayList<>();
            int[] next = new int[nSig];
            int left = sigs.stream().mapToInt(s -> s.blocks().size()).sum();
            while (left-- > 0) {
                int k;
                do {
                    k = r.nextInt(nSig);
                } while (next[k] >= sigs.get(k).blocks().size());
                order.add(new int[] {k, next[k]++});
            }
            boolean declare = r.nextInt(4) != 0;
            List<Integer> declared = new ArrayList<>();
            for (int i = 0; i < nSig; i++) {
                declared.add(i);
            }
            Collections.shuffle(declared, r);
            int budget = new int[] {5, 60, VcdWriter.QUEUE_BUDGET}[r.nextInt(3)];
            Path a = tmp.resolve("legacy" + c + ".vcd");
            Path b = tmp.resolve("new" + c + ".vcd");
            LegacyVcdWriter old = new LegacyVcdWriter(a, tmp.resolve("sa" + c), "t");
            VcdWriter now = new VcdWriter(b, tmp.resolve("sb" + c), "t", budget);
            if (declare) {
                for (int i : declared) {
                    old.declare(sigs.get(i).scope(), sigs.get(i).name());
                    now.declare(sigs.get(i).scope(), sigs.get(i).name());
                }
            }
            boolean wasStreaming = false;
            for (int[] o : order) {
                Sig s = sigs.get(o[0]);
                feed(old, s.scope(), s.name(), s.blocks().get(o[1]));
                feed(now, s.scope(), s.name(), s.blocks().get(o[1]));
                wasStreaming |= now.streaming();
            }
            streamed += wasStreaming ? 1 : 0;
            spooled += Files.isDirectory(tmp.resolve("sb" + c)) && budget < 100 ? 1 : 0;
            old.close();
            now.close();
            assertEquals(Files.exists(a), Files.exists(b));
            if (Files.exists(a)) {
                assertEquals(withoutDate(a), withoutDate(b), "case " + c);
            }
            assertFalse(Files.exists(tmp.resolve("sb" + c)), "spools removed");
        }
        assertTrue(streamed > 60, "cases written while the signals arrived: " + streamed);
        assertTrue(spooled > 20, "cases that went through the spools: " + spooled);
    }

    /** Once laid out, the file cannot take a signal nobody declared: that is the host's bug, not bad input. */
    @Test
    void anUndeclaredSignalAfterTheLayoutIsABug() throws Exception {
        VcdWriter w = new VcdWriter(tmp.resolve("u.vcd"), tmp.resolve("s"), "t");
        w.declare("a", "x");
        w.edges("a", "x", new Edges("x", 0, 100, false, new long[] {10}, 1, new long[0], 0));
        assertTrue(w.streaming());
        assertThrows(IllegalStateException.class,
                () -> w.edges("a", "y", new Edges("y", 0, 100, false, new long[] {10}, 1, new long[0], 0)));
        w.close();
    }
}
