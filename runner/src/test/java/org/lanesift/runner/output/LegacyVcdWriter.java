package org.lanesift.runner.output;

import org.lanesift.plugin.OutputException;
import java.io.BufferedInputStream;
import java.io.BufferedOutputStream;
import java.io.BufferedWriter;
import java.io.Closeable;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.PriorityQueue;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.data.WordStream;

/**
 * Test oracle only: the VCD writer as it was before issue 19 (per-signal spools merged at close),
 * kept so that the streaming writer is checked byte for byte against it.
 *
 * <p>Writes logic signals and word streams into one IEEE 1364-2005 Value Change Dump (clause 18)
 * with {@code $timescale 1 fs}: edge lists and logic blocks become scalar wires (unknown spans
 * written as {@code x}), word streams become vectors of their width.
 *
 * <p>Blocks of different signals reach the host in no common time order, while a VCD needs one
 * time order for the whole file. So each signal's value changes are spooled to its own small
 * binary file as they arrive (memory stays constant in capture length), and {@link #close()}
 * merges the spools in time order into the VCD. VCD times cannot be negative: if any change lies
 * before time 0, every time is shifted by the earliest one and a {@code $comment} says by how much.
 */
final class LegacyVcdWriter implements Closeable {
    static final byte KNOWN = 0;
    static final byte UNKNOWN = 1;

    private final Path file;
    private final Path spoolDir;
    private final String version;
    private final Map<String, Var> vars = new LinkedHashMap<>();
    private final Map<String, Integer> rank = new java.util.HashMap<>();
    /** Per word stream (scope NUL name): {highest lane seen, 1 if any word had a flag}. */
    private final Map<String, int[]> streams = new java.util.HashMap<>();
    private boolean closed;
    /** Spool files open at once while merging, whatever the number of signals. */
    static final int MAX_OPEN_SPOOLS = 128;
    /** Bytes of changes a signal holds in memory before appending them to its spool. */
    static final int SPILL_BYTES = 16 << 10;
    private final int maxOpen;
    private int mergeFiles;

    /** One declared signal and its spool. */
    private final class Var {
        final String scope;
        String name;
        final int width;
        String code;
        final Path spool;
        /** Changes not yet appended to the spool; the spool file is open only while they are appended. */
        final java.io.ByteArrayOutputStream pending = new java.io.ByteArrayOutputStream(256);
        final DataOutputStream out = new DataOutputStream(pending);
        boolean logicStarted;
        boolean logicLevel;
        boolean logicInvalid;
        long lastTime = Long.MIN_VALUE;
        boolean havePending;
        long pendingTime;
        long pendingValue;
        byte pendingState;
        boolean haveWritten;
        long writtenValue;
        byte writtenState;
        long firstTime = Long.MAX_VALUE;
        long changes;
        long lastWordEnd = Long.MIN_VALUE;
        /** Logic: where the next block is expected to start, and where the gap before it would start. */
        long logicNextFs = Long.MIN_VALUE;
        long logicGapFs;
        /** Edges: end of the last block. */
        long edgesEndFs = Long.MIN_VALUE;

        final int arrival;
        String key;
        /** Key of the output this variable belongs to (declaration order). */
        String rankKey;
        /** For a word stream's lane or flags variable: the stream key, the lane and whether it holds flags. */
        String streamKey;
        int lane;
        boolean flagsVar;

        Var(String scope, String name, int width, int index) throws IOException {
            this.scope = scope;
            this.name = name;
            this.width = width;
            this.code = code(index);
            this.arrival = index;
            Files.createDirectories(spoolDir);
            this.spool = spoolDir.resolve("v" + index + ".bin");
            Files.newOutputStream(spool).close();
        }

        /** Appends what is held in memory to the spool file, opening it only for that. */
        void spill() throws IOException {
            if (pending.size() == 0) {
                return;
            }
            try (java.io.OutputStream o = Files.newOutputStream(spool, java.nio.file.StandardOpenOption.APPEND)) {
                pending.writeTo(o);
            }
            pending.reset();
        }

        void change(long t, long value, byte state) throws IOException {
            if (t < lastTime) {
                t = lastTime; // a block overlapping the previous one: keep the file in time order
            }
            lastTime = t;
            if (havePending && pendingTime == t) {
                pendingValue = value;
                pendingState = state;
                return;
            }
            flushPending();
            havePending = true;
            pendingTime = t;
            pendingValue = value;
            pendingState = state;
        }

        void flushPending() throws IOException {
            if (!havePending) {
                return;
            }
            havePending = false;
            if (haveWritten && writtenState == pendingState && (pendingState == UNKNOWN || writtenValue == pendingValue)) {
                return;
            }
            haveWritten = true;
            writtenValue = pendingValue;
            writtenState = pendingState;
            firstTime = Math.min(firstTime, pendingTime);
            out.writeLong(pendingTime);
            out.writeLong(pendingValue);
            out.writeByte(pendingState);
            changes++;
            if (pending.size() >= SPILL_BYTES) {
                spill();
            }
        }
    }

    /**
     * Creates a writer; nothing is written until a signal arrives.
     *
     * @param file     the VCD to write at {@link #close()}
     * @param spoolDir a directory for the per-signal spools (created when needed, emptied at close)
     * @param version  text for {@code $version}
     */
    LegacyVcdWriter(Path file, Path spoolDir, String version) {
        this(file, spoolDir, version, MAX_OPEN_SPOOLS);
    }

    /** A writer that merges at most {@code maxOpen} spools at once (tests use a small number). */
    LegacyVcdWriter(Path file, Path spoolDir, String version, int maxOpen) {
        this.file = file;
        this.spoolDir = spoolDir;
        this.version = version;
        this.maxOpen = Math.max(2, maxOpen);
    }

    /** VCD identifier codes: printable ASCII 33..126, base 94 (IEEE 1364-2005 18.2.1). */
    static String code(int index) {
        StringBuilder sb = new StringBuilder();
        int i = index;
        do {
            sb.append((char) (33 + i % 94));
            i = i / 94 - 1;
        } while (i >= 0);
        return sb.toString();
    }

    /**
     * Fixes the place of a signal in the file before any of its values arrive: signals are listed
     * (and given identifier codes) in the order declared, then the rest in order of arrival, so
     * the file does not depend on which stage happened to emit first.
     *
     * @param scope instance id
     * @param name  output name
     */
    public void declare(String scope, String name) {
        rank.putIfAbsent(scope + "\u0000" + name, rank.size());
    }

    private int rankOf(Var v) {
        Integer r = rank.get(v.rankKey);
        return r == null ? Integer.MAX_VALUE : r;
    }

    private Var var(String scope, String name, int width) {
        return var(scope, name, width, scope + "\u0000" + name);
    }

    private Var var(String scope, String name, int width, String key) {
        Var v = vars.get(key);
        if (v == null) {
            try {
                v = new Var(Texts.safe(scope), Texts.safe(name), width, vars.size());
                v.key = key;
                v.rankKey = scope + "\u0000" + name;
            } catch (IOException e) {
                throw new OutputException("cannot create spool in " + spoolDir + ": " + e.getMessage(), e);
            }
            vars.put(key, v);
        }
        return v;
    }

    /**
     * Whether any signal was written.
     *
     * @return true if {@link #close()} will write a file
     */
    public boolean hasSignals() {
        return !vars.isEmpty();
    }

    /**
     * Adds an edge list to a scalar wire.
     *
     * @param scope instance id
     * @param name  signal name (the output port)
     * @param e     the edges
     * @throws OutputException if the spool cannot be written
     */
    public void edges(String scope, String name, Edges e) {
        Var v = var(scope, name, 1);
        try {
            writeEdges(v, e);
        } catch (IOException x) {
            throw new OutputException("cannot write spool for " + scope + "." + name + ": " + x.getMessage(), x);
        }
    }

    /**
     * Adds a logic block to a scalar wire (unknown samples as x).
     *
     * @param scope instance id
     * @param name  signal name
     * @param b     the block
     */
    public void logic(String scope, String name, LogicBlock b) {
        if (b.length() == 0) {
            return;
        }
        Var v = var(scope, name, 1);
        try {
            writeLogic(v, b);
        } catch (IOException x) {
            throw new OutputException("cannot write spool for " + scope + "." + name + ": " + x.getMessage(), x);
        }
    }

    /**
     * Logic samples straight to value changes, 64 at a time: a change of level or of validity
     * between samples j-1 and j is placed at their midpoint (the convention of
     * {@link LogicEdges}); a signal starts at the time of its first sample. Working from
     * the samples keeps the level after an unknown run, which an edge list cannot carry.
     */
    private static void writeLogic(Var v, LogicBlock b) throws IOException {
        final int n = b.length();
        final long[] bits = b.bits();
        final long[] inv = b.invalid();
        final double p = b.periodFs();
        final long origin = b.startFs();
        long carryX;
        long carryI;
        if (v.logicStarted && origin - v.logicNextFs > p / 2) {
            // a gap between blocks (lost data, a live source's drop): unknown, never the last level held on
            v.change(v.logicGapFs, 0, UNKNOWN);
            v.logicStarted = false;
        }
        if (!v.logicStarted) {
            boolean i0 = inv != null && (inv[0] & 1L) != 0;
            v.change(origin, (bits[0] & 1L), i0 ? UNKNOWN : KNOWN);
            carryX = bits[0] & 1L;
            carryI = i0 ? 1L : 0L;
            v.logicStarted = true;
        } else {
            carryX = v.logicLevel ? 1L : 0L;
            carryI = v.logicInvalid ? 1L : 0L;
        }
        final int words = BitSets.words(n);
        for (int w = 0; w < words; w++) {
            long x = bits[w];
            long iv = inv == null ? 0L : inv[w];
            long lastMask = (w == words - 1 && (n & 63) != 0) ? (1L << n) - 1 : -1L;
            long d = ((x ^ ((x << 1) | carryX)) | (iv ^ ((iv << 1) | carryI))) & lastMask;
            carryX = x >>> 63;
            carryI = iv >>> 63;
            final double base = ((long) w << 6) - 0.5;
            while (d != 0) {
                int j = Long.numberOfTrailingZeros(d);
                long t = origin + Math.round((base + j) * p);
                if (((iv >>> j) & 1L) != 0) {
                    v.change(t, 0, UNKNOWN);
                } else {
                    v.change(t, (x >>> j) & 1L, KNOWN);
                }
                d &= d - 1;
            }
        }
        v.logicLevel = b.get(n - 1);
        v.logicInvalid = inv != null && BitSets.get(inv, n - 1);
        v.logicNextFs = origin + Math.round(n * p);
        v.logicGapFs = origin + Math.round((n - 0.5) * p);
    }

    /**
     * Adds words: one vector of the stream's width per lane, so that bytes that travel side by
     * side on several lanes (and start at the same instant) are all kept, and one 8-bit vector of
     * the words' flags per lane. A value holds from a word's start until the next word of its lane,
     * and becomes x where a word ends before the next begins. Names are settled at {@link #close()}:
     * a stream that only ever had lane 0 keeps its name ({@code <name>}, {@code <name>_flags}),
     * otherwise each lane is {@code <name>_lane<k>} and {@code <name>_lane<k>_flags}; the flags
     * vectors are left out when no word of the stream had a flag.
     *
     * @param scope instance id
     * @param name  signal name
     * @param w     the words
     */
    public void words(String scope, String name, WordStream w) {
        String stream = scope + "\u0000" + name;
        int[] info = streams.computeIfAbsent(stream, k -> new int[2]);
        try {
            long[] vals = w.values();
            long[] st = w.wordStartFs();
            long[] en = w.wordEndFs();
            int[] lanes = w.lane();
            byte[] flags = w.flags();
            long mask = w.widthBits() == 64 ? -1L : (1L << w.widthBits()) - 1;
            for (int i = 0; i < w.count(); i++) {
                int lane = Math.max(0, lanes[i]);
                info[0] = Math.max(info[0], lane);
                Var v = laneVar(scope, name, stream, lane, false, w.widthBits());
                Var f = laneVar(scope, name, stream, lane, true, 8);
                info[1] |= flags[i] != 0 ? 1 : 0;
                word(v, st[i], en[i], vals[i] & mask);
                word(f, st[i], en[i], flags[i] & 0xFF);
            }
        } catch (IOException x) {
            throw new OutputException("cannot write spool for " + scope + "." + name + ": " + x.getMessage(), x);
        }
    }

    private Var laneVar(String scope, String name, String stream, int lane, boolean flags, int width) {
        Var v = var(scope, name, width, stream + "\u0000" + lane + (flags ? "f" : ""));
        if (v.streamKey == null) {
            v.streamKey = stream;
            v.lane = lane;
            v.flagsVar = flags;
        }
        return v;
    }

    private static void word(Var v, long start, long end, long value) throws IOException {
        if (v.lastWordEnd != Long.MIN_VALUE && start > v.lastWordEnd) {
            v.change(v.lastWordEnd, 0, UNKNOWN);
        }
        v.change(start, value, KNOWN);
        v.lastWordEnd = end;
    }

    /** Final names of word-stream variables; drops flags variables of streams without flags. */
    private List<Var> settleWordNames(List<Var> list) throws IOException {
        List<Var> keep = new ArrayList<>();
        for (Var v : list) {
            if (v.streamKey == null) {
                keep.add(v);
                continue;
            }
            int[] info = streams.get(v.streamKey);
            if (v.flagsVar && info[1] == 0) {
                v.out.close();
                Files.deleteIfExists(v.spool);
                continue;
            }
            v.name = v.name + (info[0] > 0 ? "_lane" + v.lane : "") + (v.flagsVar ? "_flags" : "");
            keep.add(v);
        }
        return keep;
    }

    private static void writeEdges(Var v, Edges e) throws IOException {
        long[] t = e.timesFs();
        int n = e.count();
        int ns = e.invalidCount();
        long[] sp = e.invalidSpans();
        if (ns > 1 && !sorted(sp, ns)) {
            sp = sortSpans(sp, ns);
        }
        boolean level = e.initialLevel();
        if (v.edgesEndFs != Long.MIN_VALUE && e.startFs() > v.edgesEndFs) {
            // a gap between blocks: unknown until the next block starts, no level carried across it
            v.change(v.edgesEndFs, 0, UNKNOWN);
        }
        v.edgesEndFs = Math.max(v.edgesEndFs, e.endFs());
        v.change(e.startFs(), level ? 1 : 0, KNOWN);
        int k = 0;
        for (int s = 0; s <= ns; s++) {
            long spanStart = s < ns ? sp[2 * s] : Long.MAX_VALUE;
            while (k < n && t[k] < spanStart) {
                level = !level;
                v.change(t[k], level ? 1 : 0, KNOWN);
                k++;
            }
            if (s == ns) {
                break;
            }
            long spanEnd = sp[2 * s + 1];
            if (spanEnd <= spanStart) {
                continue;
            }
            v.change(spanStart, 0, UNKNOWN);
            while (k < n && t[k] < spanEnd) {
                level = !level;
                k++;
            }
            if (spanEnd < e.endFs()) {
                v.change(spanEnd, level ? 1 : 0, KNOWN);
            }
        }
    }

    private static boolean sorted(long[] sp, int ns) {
        for (int i = 1; i < ns; i++) {
            if (sp[2 * i] < sp[2 * i - 2]) {
                return false;
            }
        }
        return true;
    }

    private static long[] sortSpans(long[] sp, int ns) {
        Integer[] idx = new Integer[ns];
        for (int i = 0; i < ns; i++) {
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, (a, b) -> Long.compare(sp[2 * a], sp[2 * b]));
        long[] out = new long[2 * ns];
        for (int i = 0; i < ns; i++) {
            out[2 * i] = sp[2 * idx[i]];
            out[2 * i + 1] = sp[2 * idx[i] + 1];
        }
        return out;
    }

    /**
     * Number of value changes written for a signal so far.
     *
     * @param scope instance id
     * @param name  signal name
     * @return changes, 0 if the signal is unknown
     */
    public long changes(String scope, String name) {
        Var v = vars.get(scope + "\u0000" + name);
        return v == null ? 0 : v.changes + (v.havePending ? 1 : 0);
    }

    /** A spool to merge: one signal's changes (time, value, state), or merged ones that carry their signal. */
    private record Source(Path file, int fixedVar) {
    }

    private static final class Cursor {
        /** The signal of every record, or -1 when each record carries its own. */
        final int fixedVar;
        final DataInputStream in;
        int var;
        long time;
        long value;
        byte state;

        Cursor(Source s) throws IOException {
            this.fixedVar = s.fixedVar();
            this.var = fixedVar;
            this.in = new DataInputStream(new BufferedInputStream(Files.newInputStream(s.file()), 1 << 15));
        }

        boolean next() throws IOException {
            try {
                time = in.readLong();
                if (fixedVar < 0) {
                    var = in.readInt();
                }
                value = in.readLong();
                state = in.readByte();
                return true;
            } catch (EOFException e) {
                return false;
            }
        }
    }

    private static PriorityQueue<Cursor> queue() {
        return new PriorityQueue<>((a, b) -> a.time != b.time ? Long.compare(a.time, b.time) : Integer.compare(a.var, b.var));
    }

    /**
     * Merges groups of at most {@link #maxOpen} sources into one spool each until no more than
     * that many are left, so the final merge never holds more files open than that.
     */
    private List<Source> premerge(List<Source> sources, List<Path> temporary) throws IOException {
        List<Source> level = sources;
        while (level.size() > maxOpen) {
            List<Source> next = new ArrayList<>();
            for (int g = 0; g < level.size(); g += maxOpen) {
                List<Source> group = level.subList(g, Math.min(level.size(), g + maxOpen));
                Path merged = spoolDir.resolve("m" + (mergeFiles++) + ".bin");
                temporary.add(merged);
                List<Cursor> open = new ArrayList<>();
                try (DataOutputStream o = new DataOutputStream(new BufferedOutputStream(Files.newOutputStream(merged), 1 << 15))) {
                    PriorityQueue<Cursor> q = queue();
                    for (Source src : group) {
                        Cursor c = new Cursor(src);
                        open.add(c);
                        if (c.next()) {
                            q.add(c);
                        }
                    }
                    while (!q.isEmpty()) {
                        Cursor c = q.poll();
                        o.writeLong(c.time);
                        o.writeInt(c.var);
                        o.writeLong(c.value);
                        o.writeByte(c.state);
                        if (c.next()) {
                            q.add(c);
                        }
                    }
                } finally {
                    for (Cursor c : open) {
                        c.in.close();
                    }
                }
                next.add(new Source(merged, -1));
            }
            level = next;
        }
        return level;
    }

    /**
     * Merges the spools into the VCD and removes them. Does nothing if no signal arrived.
     *
     * @throws IOException if writing fails
     */
    @Override
    public void close() throws IOException {
        if (closed) {
            return;
        }
        closed = true;
        if (vars.isEmpty()) {
            return;
        }
        List<Var> list = settleWordNames(new ArrayList<>(vars.values()));
        list.sort((a, b) -> rankOf(a) != rankOf(b) ? Integer.compare(rankOf(a), rankOf(b)) : Integer.compare(a.arrival, b.arrival));
        // group by scope, scopes in order of first appearance (in that order)
        List<String> scopes = new ArrayList<>();
        for (Var v : list) {
            if (!scopes.contains(v.scope)) {
                scopes.add(v.scope);
            }
        }
        list.sort((a, b) -> Integer.compare(scopes.indexOf(a.scope), scopes.indexOf(b.scope)));
        for (int i = 0; i < list.size(); i++) {
            list.get(i).code = code(i);
        }
        long origin = 0;
        for (Var v : list) {
            if (v.lastWordEnd != Long.MIN_VALUE) {
                v.change(v.lastWordEnd, 0, UNKNOWN); // no word after the last one
            }
            v.flushPending();
            v.spill();
            origin = Math.min(origin, v.firstTime);
        }
        List<Cursor> cursors = new ArrayList<>();
        List<Path> temporary = new ArrayList<>();
        try (Writer w = new BufferedWriter(Files.newBufferedWriter(file, StandardCharsets.US_ASCII), 1 << 16)) {
            header(w, list, origin);
            List<Source> sources = new ArrayList<>();
            for (int i = 0; i < list.size(); i++) {
                sources.add(new Source(list.get(i).spool, i));
            }
            PriorityQueue<Cursor> q = queue();
            for (Source src : premerge(sources, temporary)) {
                Cursor c = new Cursor(src);
                cursors.add(c);
                if (c.next()) {
                    q.add(c);
                }
            }
            long current = Long.MIN_VALUE;
            boolean first = true;
            long firstTime = q.isEmpty() ? 0 : q.peek().time - origin;
            boolean[] wrote = new boolean[list.size()];
            StringBuilder sb = new StringBuilder(128);
            while (!q.isEmpty()) {
                Cursor c = q.poll();
                long t = c.time - origin;
                if (first || t != current) {
                    if (first) {
                        // initial values of every signal at the first time: unknown until set
                        w.write("#" + t + "\n$dumpvars\n");
                        for (Var v : list) {
                            w.write(v.width == 1 ? "x" + v.code + "\n" : "bx " + v.code + "\n");
                        }
                        w.write("$end\n");
                        first = false;
                    } else {
                        w.write("#" + t + "\n");
                    }
                    current = t;
                }
                Var v = list.get(c.var);
                boolean redundant = c.state == UNKNOWN && t == firstTime && !wrote[c.var]; // $dumpvars said x already
                wrote[c.var] = true;
                if (!redundant) {
                    sb.setLength(0);
                    value(sb, v, c.value, c.state);
                    w.write(sb.toString());
                }
                if (c.next()) {
                    q.add(c);
                }
            }
        } finally {
            for (Cursor c : cursors) {
                c.in.close();
            }
            for (Var v : list) {
                Files.deleteIfExists(v.spool);
            }
            for (Path t : temporary) {
                Files.deleteIfExists(t);
            }
            try {
                Files.deleteIfExists(spoolDir);
            } catch (IOException ignored) {
                // not empty: someone else's file; leave it
            }
        }
    }

    private static void value(StringBuilder sb, Var v, long value, byte state) {
        if (v.width == 1) {
            sb.append(state == UNKNOWN ? 'x' : value != 0 ? '1' : '0').append(v.code).append('\n');
            return;
        }
        sb.append('b');
        if (state == UNKNOWN) {
            sb.append('x');
        } else {
            // leading zeros may be dropped (IEEE 1364-2005 18.2.1: left-extended with 0)
            sb.append(Long.toBinaryString(value));
        }
        sb.append(' ').append(v.code).append('\n');
    }

    private void header(Writer w, List<Var> list, long origin) throws IOException {
        w.write("$date\n   " + java.time.Instant.now().truncatedTo(java.time.temporal.ChronoUnit.SECONDS) + "\n$end\n");
        w.write("$version\n   " + version + "\n$end\n");
        if (origin != 0) {
            w.write("$comment\n   times shifted by " + (-origin) + " fs: time 0 here is " + origin
                    + " fs in the capture\n$end\n");
        }
        w.write("$timescale 1 fs $end\n");
        String open = null;
        for (Var v : list) {
            if (!v.scope.equals(open)) {
                if (open != null) {
                    w.write("$upscope $end\n");
                }
                w.write("$scope module " + v.scope + " $end\n");
                open = v.scope;
            }
            w.write("$var wire " + v.width + " " + v.code + " " + v.name + (v.width > 1 ? " [" + (v.width - 1) + ":0]" : "") + " $end\n");
        }
        w.write("$upscope $end\n$enddefinitions $end\n");
    }
}
