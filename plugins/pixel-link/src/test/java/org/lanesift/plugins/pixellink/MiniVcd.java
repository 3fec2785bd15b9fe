package org.lanesift.plugins.pixellink;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Test-only reader of IEEE 1364 VCD files, scalar wires only: per signal name, the times (in
 * femtoseconds) and values (0, 1, or -1 for x/z) of every change. Vectors and reals are skipped.
 */
final class MiniVcd {
    /** Changes of one scalar signal. */
    static final class Signal {
        final String name;
        final List<long[]> changes = new ArrayList<>(); // {timeFs, value}

        Signal(String name) {
            this.name = name;
        }

        /** Value at time t (the last change at or before t), -1 before the first change. */
        int at(long tFs) {
            int lo = 0;
            int hi = changes.size() - 1;
            int best = -1;
            while (lo <= hi) {
                int mid = (lo + hi) >>> 1;
                if (changes.get(mid)[0] <= tFs) {
                    best = mid;
                    lo = mid + 1;
                } else {
                    hi = mid - 1;
                }
            }
            return best < 0 ? -1 : (int) changes.get(best)[1];
        }

        /** Times of 0 -> 1 transitions. */
        List<Long> risingEdges() {
            List<Long> out = new ArrayList<>();
            long prev = -1;
            for (long[] c : changes) {
                if (prev == 0 && c[1] == 1) {
                    out.add(c[0]);
                }
                prev = c[1];
            }
            return out;
        }
    }

    final Map<String, Signal> byName = new HashMap<>();

    static MiniVcd read(Path file) throws IOException {
        MiniVcd v = new MiniVcd();
        String[] tok = Files.readString(file).trim().split("\\s+");
        Map<String, Signal> byId = new HashMap<>();
        long unitFs = 1;
        long now = 0;
        int i = 0;
        while (i < tok.length) {
            String t = tok[i];
            if (t.equals("$timescale")) {
                StringBuilder sb = new StringBuilder();
                i++;
                while (!tok[i].equals("$end")) {
                    sb.append(tok[i++]);
                }
                unitFs = unit(sb.toString());
            } else if (t.equals("$var")) {
                // $var <type> <width> <id> <name> [range] $end
                int width = Integer.parseInt(tok[i + 2]);
                String id = tok[i + 3];
                String name = tok[i + 4];
                if (width == 1) {
                    Signal s = byId.computeIfAbsent(id, k -> new Signal(name));
                    v.byName.putIfAbsent(name, s);
                }
                while (!tok[i].equals("$end")) {
                    i++;
                }
            } else if (t.startsWith("$") && !t.equals("$dumpvars") && !t.equals("$end") && !t.equals("$dumpall")
                    && !t.equals("$dumpon") && !t.equals("$dumpoff")) {
                while (!tok[i].equals("$end")) {
                    i++;
                }
            } else if (t.startsWith("#")) {
                now = Long.parseLong(t.substring(1)) * unitFs;
            } else if (t.startsWith("b") || t.startsWith("B") || t.startsWith("r") || t.startsWith("R")) {
                i++; // vector or real value: skip its id too
            } else if (!t.startsWith("$")) {
                char c = t.charAt(0);
                Signal s = byId.get(t.substring(1));
                if (s != null) {
                    int val = c == '0' ? 0 : c == '1' ? 1 : -1;
                    s.changes.add(new long[] {now, val});
                }
            }
            i++;
        }
        return v;
    }

    private static long unit(String s) {
        int k = 0;
        while (k < s.length() && Character.isDigit(s.charAt(k))) {
            k++;
        }
        long mult = Long.parseLong(s.substring(0, k));
        long fs = switch (s.substring(k)) {
            case "s" -> 1_000_000_000_000_000L;
            case "ms" -> 1_000_000_000_000L;
            case "us" -> 1_000_000_000L;
            case "ns" -> 1_000_000L;
            case "ps" -> 1_000L;
            case "fs" -> 1L;
            default -> throw new IllegalArgumentException("VCD timescale unit '" + s + "'");
        };
        return mult * fs;
    }

    Signal signal(String name) {
        Signal s = byName.get(name);
        if (s == null) {
            throw new AssertionError("VCD has no scalar signal '" + name + "'; it has " + byName.keySet());
        }
        return s;
    }
}
