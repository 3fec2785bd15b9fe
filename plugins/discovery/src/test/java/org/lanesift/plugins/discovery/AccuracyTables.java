package org.lanesift.plugins.discovery;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Top-1 and top-3 accuracy of discovery per parameter over the links one generator seed draws,
 * in two tables: links whose clock pauses between bursts and links that idle at a level between
 * bursts on a running clock (streaming links, with neither, count in the idle-run table).
 */
final class AccuracyTables {
    static final String[] ROWS = {"clocking", "word length", "bit order", "sync", "lane distribution", "checksum", "length field",
        "picture in top 3", "picture top 1"};
    /** The rows the issue holds to 95 % top-1. */
    static final String[] TOP1_BARS = {"clocking", "word length", "bit order", "sync"};

    final long seed;
    /** Per table (mode), per row: {correct, tried}. */
    final Map<String, Map<String, int[]>> tables = new LinkedHashMap<>();
    final List<String> misses = new ArrayList<>();

    private AccuracyTables(long seed) {
        this.seed = seed;
        for (String mode : new String[] {CLOCK_PAUSES, IDLE_RUNS, STREAMING}) {
            Map<String, int[]> t = new LinkedHashMap<>();
            for (String k : ROWS) {
                t.put(k, new int[2]);
            }
            tables.put(mode, t);
        }
    }

    static final String CLOCK_PAUSES = "clock pauses";
    static final String IDLE_RUNS = "idle runs";
    static final String STREAMING = "no pause (streaming)";

    /** Draws {@code formats} links from the seed, runs discovery over each and counts. */
    static AccuracyTables measure(long seed, int formats) {
        return measure(new LinkFormatGenerator(seed), seed, formats);
    }

    /** The same over the links of a given generator. */
    static AccuracyTables measure(LinkFormatGenerator g, long seed, int formats) {
        AccuracyTables a = new AccuracyTables(seed);
        DiscoveryEngine engine = new DiscoveryEngine(DiscoveryEngine.DEFAULT_MAX_BITS);
        for (int i = 0; i < formats; i++) {
            LinkFormatGenerator.Link l = g.next();
            a.count(i, l, engine.discover(l.input));
        }
        return a;
    }

    private void count(int i, LinkFormatGenerator.Link l, Hypotheses h) {
        Map<String, int[]> table = tables.get(l.clockStops ? CLOCK_PAUSES : l.streaming ? STREAMING : IDLE_RUNS);
        Hypotheses.Framing b = h.best();
        StringBuilder miss = new StringBuilder();
        count(table, "clocking", h.clocking().name().equals(l.clocking), miss, h.clocking().name());
        count(table, "word length", b.wordBits() == l.wordBits, miss, "W=" + b.wordBits());
        count(table, "bit order", b.msbFirst() == l.msbFirst, miss, b.msbFirst() ? "msb" : "lsb");
        String wantSync = l.sync.length == 0 ? "" : l.visibleSync();
        count(table, "sync", h.syncWire().equals(wantSync), miss, "sync=" + h.syncWire());
        if (l.lanes > 1) {
            count(table, "lane distribution", b.distribution() == l.dist, miss, b.distribution().label);
        }
        count(table, "checksum", l.crc == null ? b.crc() == null : b.crc() != null && (b.crc().model().equals(l.crc)
                || CrcCatalogue.twins(l.crc).contains(b.crc().model())), miss,
                b.crc() == null ? "crc none" : b.crc().model().name());
        count(table, "length field", l.lengthField == (b.fields().lengthWord == 1), miss, "lengthWord=" + b.fields().lengthWord);
        int found = -1;
        for (int c = 0; c < Math.min(3, h.pictures().size()) && found < 0; c++) {
            if (same(h.pictures().get(c), l)) {
                found = c;
            }
        }
        String top = h.pictures().isEmpty() ? "none" : h.pictures().get(0).format().label + "/" + h.pictures().get(0).lineLength();
        count(table, "picture in top 3", found >= 0, miss, "picture " + top);
        count(table, "picture top 1", found == 0, new StringBuilder(), "");
        if (miss.length() > 0) {
            misses.add(i + ": " + l + " -> " + miss);
        }
    }

    private static void count(Map<String, int[]> t, String k, boolean ok, StringBuilder miss, String got) {
        t.get(k)[1]++;
        if (ok) {
            t.get(k)[0]++;
        } else {
            miss.append(' ').append(k).append(": got ").append(got).append(';');
        }
    }

    double share(String mode, String row) {
        int[] c = tables.get(mode).get(row);
        return c[0] / (double) Math.max(1, c[1]);
    }

    /** The bars of the issue that this seed misses in the tables named, one line each (empty: all met). */
    List<String> missedBars(String... modes) {
        List<String> out = new ArrayList<>();
        for (String mode : modes) {
            for (String k : TOP1_BARS) {
                if (share(mode, k) < 0.95) {
                    out.add(String.format(Locale.ROOT, "seed %d, %s, %s: %.1f %% < 95 %%", seed, mode, k, 100 * share(mode, k)));
                }
            }
            if (share(mode, "picture in top 3") < 0.90) {
                out.add(String.format(Locale.ROOT, "seed %d, %s, picture in top 3: %.1f %% < 90 %%", seed, mode,
                        100 * share(mode, "picture in top 3")));
            }
        }
        return out;
    }

    /** Both tables as text. */
    String table() {
        StringBuilder out = new StringBuilder();
        for (Map.Entry<String, Map<String, int[]>> t : tables.entrySet()) {
            if (t.getValue().get("clocking")[1] == 0) {
                continue;
            }
            out.append(String.format(Locale.ROOT, "%nseed %d%n%-18s %8s %8s   (bursts separated by %s)%n", seed, "parameter", "correct",
                    "share", t.getKey()));
            for (Map.Entry<String, int[]> e : t.getValue().entrySet()) {
                out.append(String.format(Locale.ROOT, "%-18s %4d/%-4d %7.1f %%%n", e.getKey(), e.getValue()[0], e.getValue()[1],
                        100.0 * e.getValue()[0] / Math.max(1, e.getValue()[1])));
            }
        }
        return out.toString();
    }

    /** The candidate is the sent picture: same format and line length, and at least 90 % of its pixels equal. */
    static boolean same(PictureCandidate p, LinkFormatGenerator.Link l) {
        if (p.format() != l.pixel || p.lineLength() != l.width) {
            return false;
        }
        int n = Math.min(p.rgb().length, l.pictureRgb.length);
        int eq = 0;
        for (int i = 0; i < n; i++) {
            if (p.rgb()[i] == l.pictureRgb[i]) {
                eq++;
            }
        }
        return n > 0 && eq >= 0.9 * n;
    }
}
