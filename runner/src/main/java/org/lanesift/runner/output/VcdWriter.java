package org.lanesift.runner.output;

import java.io.Closeable;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.lanesift.data.BitSets;
import org.lanesift.data.Edges;
import org.lanesift.data.LogicBlock;
import org.lanesift.data.LogicEdges;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.OutputException;

/**
 * Writes logic signals and word streams into one IEEE 1364-2005 Value Change Dump (clause 18)
 * with {@code $timescale 1 fs}: edge lists and logic blocks become scalar wires (unknown spans
 * written as {@code x}), word streams become vectors of their width.
 *
 * <p>Blocks of different signals reach the host in no common time order, while a VCD needs one
 * time order for the whole file. Each signal's value changes wait in a small queue of its own; once
 * every declared signal has arrived the file is laid out (order, identifier codes, time origin) and
 * a k-way merge writes, while the run goes on, every change earlier than the point all signals
 * have passed (each signal's last change, or what the block order promises about its next one:
 * blocks on one wire arrive in non-decreasing start order). The text goes to a body file that
 * {@link #close()} appends to the header with a plain byte copy. When the layout cannot be fixed
 * early (no signal was declared, or word streams, whose lanes are known only at the end), the same
 * merge runs at close. Queues beyond a memory budget are spooled to one file per signal, opened
 * only while appending or reading a chunk, so memory and open files stay bounded whatever the
 * capture length and the number of signals. VCD times cannot be negative: if any change lies
 * before time 0, every time is shifted by the earliest one and a {@code $comment} says by how much.
 */
public final class VcdWriter implements Closeable {
    static final byte KNOWN = 0;
    static final byte UNKNOWN = 1;
    /** Changes held in memory by all signals together before the queues are spooled to disk. */
    static final int QUEUE_BUDGET = 1 << 17;
    private final int budget;
    /** Spooled changes read back at once per signal, at most. */
    private static final int READ_CHUNK = 1 << 13;

    private final Path file;
    private final Path spoolDir;
    private final Path bodyFile;
    private final String version;
    private final Map<String, Var> vars = new LinkedHashMap<>();
    private final Map<String, Integer> rank = new HashMap<>();
    private final Set<String> arrivedDeclared = new HashSet<>();
    /** Per word stream (scope NUL name): {highest lane seen, 1 if any word had a flag}. */
    private final Map<String, int[]> streams = new HashMap<>();
    private final ByteBuffer scratch = ByteBuffer.allocate(READ_CHUNK * ChangeQueue.RECORD_BYTES);
    private boolean closed;
    private boolean sawWords;
    /** Whether order, codes and origin are fixed ({@link #layout}). */
    private boolean settled;
    private List<Var> layout;
    private long origin;
    /** Changes below this time were written; later changes are kept at or after it. */
    private long writtenBelowFs = Long.MIN_VALUE;
    private long queued;
    private int callsSincePump;
    /** The text being written: the body file while the run goes on, or the VCD itself at close. */
    private AsciiFile out;
    private boolean first = true;
    private long current;
    private long firstTime;
    private boolean[] wrote;

    /** One declared signal, its queue and its spool. */
    private final class Var {
        final String scope;
        String name;
        final int width;
        String code;
        byte[] codeBytes;
        /** Position in the file's layout. */
        int order;
        /** Changes not yet written, after those in the spool. */
        final ChangeQueue queue = new ChangeQueue(16);
        /** Changes read back from the spool, before those in {@link #queue}. */
        ChangeQueue readBack;
        /** The queue {@link #next()} last returned (the merge's view of this signal's head). */
        ChangeQueue cur;
        Path spool;
        long spooled;
        long spoolRead;
        boolean logicStarted;
        boolean logicLevel;
        boolean logicInvalid;
        long lastTime = Long.MIN_VALUE;
        /** No later block brings a change before this time (from the block order). */
        long promiseFs = Long.MIN_VALUE;
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
        /** Edges: end of the last block, and start of the one before the last. */
        long edgesEndFs = Long.MIN_VALUE;
        long edgesPrevStartFs = Long.MIN_VALUE;

        final int arrival;
        String key;
        /** Key of the output this variable belongs to (declaration order). */
        String rankKey;
        /** For a word stream's lane or flags variable: the stream key, the lane and whether it holds flags. */
        String streamKey;
        int lane;
        boolean flagsVar;

        Var(String scope, String name, int width, int index) {
            this.scope = scope;
            this.name = name;
            this.width = width;
            this.code = code(index);
            this.arrival = index;
        }

        void change(long t, long value, byte state) throws IOException {
            long floor = Math.max(lastTime, writtenBelowFs);
            if (t < floor) {
                t = floor; // a block overlapping the previous one: keep the file in time order
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

        void flushPending() {
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
            queue.add(pendingTime, pendingValue, pendingState);
            queued++;
            changes++;
        }

        /** Notes that no later block brings a change before {@code fs}; a change waiting before it is final. */
        void promise(long fs) {
            promiseFs = Math.max(promiseFs, fs);
            if (havePending && pendingTime < promiseFs) {
                flushPending();
            }
        }

        /** The earliest time a change not yet queued can have. */
        long floorFs() {
            return havePending ? pendingTime : Math.max(lastTime, promiseFs);
        }

        /** Appends the queue to the spool file, opened only for that. */
        void spill() throws IOException {
            if (queue.isEmpty()) {
                return;
            }
            if (spool == null) {
                Files.createDirectories(spoolDir);
                spool = spoolDir.resolve("v" + arrival + ".bin");
            }
            queued -= queue.size();
            try (FileChannel ch = FileChannel.open(spool, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                    StandardOpenOption.APPEND)) {
                while (!queue.isEmpty()) {
                    scratch.clear();
                    spooled += queue.drainTo(scratch);
                    scratch.flip();
                    while (scratch.hasRemaining()) {
                        ch.write(scratch);
                    }
                }
            }
            queue.clear(1024);
        }

        /**
         * The queue that holds this signal's next change, reading a chunk of the spool back if needed.
         *
         * @return the queue, or null if no change waits
         */
        ChangeQueue next() throws IOException {
            cur = head();
            return cur;
        }

        private ChangeQueue head() throws IOException {
            if (readBack != null && !readBack.isEmpty()) {
                return readBack;
            }
            if (spoolRead < spooled) {
                int chunk = (int) Math.min(spooled - spoolRead, Math.max(64, Math.min(READ_CHUNK, budget / vars.size())));
                if (readBack == null) {
                    readBack = new ChangeQueue(chunk);
                }
                scratch.clear().limit(chunk * ChangeQueue.RECORD_BYTES);
                try (FileChannel ch = FileChannel.open(spool, StandardOpenOption.READ)) {
                    long at = spoolRead * ChangeQueue.RECORD_BYTES;
                    while (scratch.hasRemaining()) {
                        int n = ch.read(scratch, at);
                        if (n < 0) {
                            throw new IOException("spool " + spool + " ended early");
                        }
                        at += n;
                    }
                }
                scratch.flip();
                readBack.fillFrom(scratch);
                spoolRead += chunk;
                return readBack;
            }
            return queue.isEmpty() ? null : queue;
        }
    }

    /**
     * Creates a writer; nothing is written until a signal arrives.
     *
     * @param file     the VCD to write
     * @param spoolDir a directory for the body being written and the spools (created when needed,
     *                 emptied at close)
     * @param version  text for {@code $version}
     */
    public VcdWriter(Path file, Path spoolDir, String version) {
        this(file, spoolDir, version, QUEUE_BUDGET);
    }

    /** A writer that spools beyond {@code budget} queued changes (tests use a small number). */
    VcdWriter(Path file, Path spoolDir, String version, int budget) {
        this.budget = Math.max(1, budget);
        this.file = file;
        this.spoolDir = spoolDir;
        this.bodyFile = spoolDir.resolve("body.vcd");
        this.version = version;
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
            String rankKey = scope + "\u0000" + name;
            if (settled) {
                // the layout (order, codes) is fixed once streaming began; every signal is declared before
                throw new IllegalStateException("VCD signal " + scope + "." + name + " arrived after the file was laid out;"
                        + " every signal must be declared before the first one arrives");
            }
            v = new Var(Texts.safe(scope), Texts.safe(name), width, vars.size());
            v.key = key;
            v.rankKey = rankKey;
            if (rank.containsKey(rankKey)) {
                arrivedDeclared.add(rankKey);
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
            // a later block starts no earlier than this one; edges right before a block's start are
            // allowed for, by promising only the previous block's start
            v.promise(v.edgesPrevStartFs);
            v.edgesPrevStartFs = e.startFs();
            afterBlock();
        } catch (IOException x) {
            throw new OutputException("cannot write " + file + " for " + scope + "." + name + ": " + x.getMessage(), x);
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
            // the next block starts no earlier than this one, and its first change lies at most half a
            // sample before its start
            v.promise(b.startFs() - (long) Math.ceil(b.periodFs()) - 1);
            afterBlock();
        } catch (IOException x) {
            throw new OutputException("cannot write " + file + " for " + scope + "." + name + ": " + x.getMessage(), x);
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
        sawWords = true; // lanes and flags are known only at close: the file is laid out then
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
            afterBlock();
        } catch (IOException x) {
            throw new OutputException("cannot write " + file + " for " + scope + "." + name + ": " + x.getMessage(), x);
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
    private List<Var> settleWordNames(List<Var> list) {
        List<Var> keep = new ArrayList<>();
        for (Var v : list) {
            if (v.streamKey == null) {
                keep.add(v);
                continue;
            }
            int[] info = streams.get(v.streamKey);
            if (v.flagsVar && info[1] == 0) {
                continue; // its spool, if any, is removed with the others at close
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

    /**
     * Whether the file was laid out while signals were still arriving, so that the changes are
     * written as the run goes on (tests).
     *
     * @return true once streaming
     */
    boolean streaming() {
        return settled && !closed;
    }

    /** After a block: keeps the queues within budget and writes what every signal has passed. */
    private void afterBlock() throws IOException {
        callsSincePump++;
        if (!settled && !sawWords && !rank.isEmpty() && arrivedDeclared.size() == rank.size()) {
            settle(new ArrayList<>(vars.values()));
        }
        if (settled && (callsSincePump >= vars.size() || queued > budget / 2)) {
            callsSincePump = 0;
            long below = Long.MAX_VALUE;
            for (Var v : layout) {
                below = Math.min(below, v.floorFs());
            }
            if (below > writtenBelowFs) {
                if (out == null) {
                    Files.createDirectories(spoolDir);
                    out = new AsciiFile(bodyFile);
                }
                merge(below, false);
                writtenBelowFs = below;
            }
        }
        if (queued > budget) {
            for (Var v : vars.values()) {
                v.spill();
            }
        }
    }

    /**
     * Fixes the file's layout: signals in the order declared, then the rest in order of arrival,
     * grouped by scope in order of first appearance; identifier codes by position; the time origin.
     */
    private void settle(List<Var> list) {
        list.sort((a, b) -> rankOf(a) != rankOf(b) ? Integer.compare(rankOf(a), rankOf(b)) : Integer.compare(a.arrival, b.arrival));
        List<String> scopes = new ArrayList<>();
        for (Var v : list) {
            if (!scopes.contains(v.scope)) {
                scopes.add(v.scope);
            }
        }
        list.sort((a, b) -> Integer.compare(scopes.indexOf(a.scope), scopes.indexOf(b.scope)));
        origin = 0;
        for (int i = 0; i < list.size(); i++) {
            Var v = list.get(i);
            v.order = i;
            v.code = code(i);
            v.codeBytes = v.code.getBytes(StandardCharsets.US_ASCII);
            // a signal's changes are in time order: its first one is the earliest (flushed or waiting)
            origin = Math.min(origin, Math.min(v.firstTime, v.havePending ? v.pendingTime : Long.MAX_VALUE));
        }
        layout = list;
        wrote = new boolean[list.size()];
        settled = true;
    }

    /**
     * The k-way merge: writes, in time order and by position at equal times, every queued change
     * earlier than {@code below} (all of them if {@code all}).
     */
    private void merge(long below, boolean all) throws IOException {
        int n = 0;
        Var[] heap = new Var[layout.size()];
        for (Var v : layout) {
            ChangeQueue q = v.next();
            if (q != null && (all || q.headTime() < below)) {
                heap[n++] = v;
            }
        }
        for (int i = n / 2 - 1; i >= 0; i--) {
            siftDown(heap, n, i);
        }
        while (n > 0) {
            Var v = heap[0];
            ChangeQueue q = v.cur;
            emit(v, q.headTime(), q.headValue(), q.headState());
            boolean fromQueue = q == v.queue;
            q.pop();
            if (fromQueue) {
                queued--;
            }
            ChangeQueue nq = v.next();
            if (nq == null || (!all && nq.headTime() >= below)) {
                heap[0] = heap[--n];
            }
            siftDown(heap, n, 0);
        }
    }

    /** Heap order: earlier head first, then position (every var in the heap has its head in {@code cur}). */
    private static boolean before(Var a, Var b) {
        long ta = a.cur.headTime();
        long tb = b.cur.headTime();
        return ta != tb ? ta < tb : a.order < b.order;
    }

    private static void siftDown(Var[] heap, int n, int i) {
        Var x = heap[i];
        while (true) {
            int c = 2 * i + 1;
            if (c >= n) {
                break;
            }
            if (c + 1 < n && before(heap[c + 1], heap[c])) {
                c++;
            }
            if (!before(heap[c], x)) {
                break;
            }
            heap[i] = heap[c];
            i = c;
        }
        heap[i] = x;
    }

    /** Writes one change: a time line when the time moves on (with the initial dump first), then the value. */
    private void emit(Var v, long time, long value, byte state) throws IOException {
        long t = time - origin;
        out.room(2 * Ascii.MAX_NUMBER + 16);
        byte[] d = out.buf;
        int p = out.pos;
        if (first || t != current) {
            if (first) {
                // initial values of every signal at the first time: unknown until set
                p = timeLine(d, p, t);
                out.pos = p;
                ascii(out, "$dumpvars\n");
                for (Var x : layout) {
                    ascii(out, x.width == 1 ? "x" + x.code + "\n" : "bx " + x.code + "\n");
                }
                ascii(out, "$end\n");
                first = false;
                firstTime = t;
                out.room(2 * Ascii.MAX_NUMBER + 16);
                d = out.buf;
                p = out.pos;
            } else {
                p = timeLine(d, p, t);
            }
            current = t;
        }
        boolean redundant = state == UNKNOWN && t == firstTime && !wrote[v.order]; // $dumpvars said x already
        wrote[v.order] = true;
        if (!redundant) {
            byte[] code = v.codeBytes;
            if (code.length > Ascii.MAX_NUMBER) {
                out.pos = p;
                out.room(code.length + 8);
                d = out.buf;
                p = out.pos;
            }
            if (v.width == 1) {
                d[p++] = state == UNKNOWN ? (byte) 'x' : value != 0 ? (byte) '1' : (byte) '0';
            } else {
                d[p++] = 'b';
                if (state == UNKNOWN) {
                    d[p++] = 'x';
                } else {
                    // leading zeros may be dropped (IEEE 1364-2005 18.2.1: left-extended with 0)
                    p = Ascii.putBinary(d, p, value);
                }
                d[p++] = ' ';
            }
            System.arraycopy(code, 0, d, p, code.length);
            p += code.length;
            d[p++] = '\n';
        }
        out.pos = p;
    }

    private static int timeLine(byte[] d, int p, long t) {
        d[p++] = '#';
        p = Ascii.putLong(d, p, t);
        d[p++] = '\n';
        return p;
    }

    private static void ascii(AsciiFile f, String s) throws IOException {
        byte[] b = s.getBytes(StandardCharsets.US_ASCII);
        f.put(b, 0, b.length);
    }

    /**
     * Writes what is left and finishes the VCD: the header, then the body (a byte copy of what was
     * written while the run went on). Removes the spools. Does nothing if no signal arrived.
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
        try {
            boolean early = settled;
            for (Var v : settled ? layout : vars.values()) {
                if (v.lastWordEnd != Long.MIN_VALUE) {
                    v.change(v.lastWordEnd, 0, UNKNOWN); // no word after the last one
                }
                v.flushPending();
            }
            if (!settled) {
                settle(settleWordNames(new ArrayList<>(vars.values())));
            }
            if (early) {
                merge(Long.MAX_VALUE, true);
                out.close();
                try (AsciiFile vcd = new AsciiFile(file)) {
                    header(vcd);
                    FileChannel to = vcd.channel();
                    try (FileChannel from = FileChannel.open(bodyFile, StandardOpenOption.READ)) {
                        long size = from.size();
                        long at = 0;
                        while (at < size) {
                            at += from.transferTo(at, size - at, to);
                        }
                    }
                }
            } else {
                out = new AsciiFile(file);
                header(out);
                merge(Long.MAX_VALUE, true);
                out.close();
            }
        } finally {
            if (out != null) {
                out.close();
            }
            for (Var v : vars.values()) {
                if (v.spool != null) {
                    Files.deleteIfExists(v.spool);
                }
            }
            Files.deleteIfExists(bodyFile);
            try {
                Files.deleteIfExists(spoolDir);
            } catch (IOException ignored) {
                // not empty: someone else's file; leave it
            }
        }
    }

    private void header(AsciiFile w) throws IOException {
        ascii(w, "$date\n   " + java.time.Instant.now().truncatedTo(java.time.temporal.ChronoUnit.SECONDS) + "\n$end\n");
        ascii(w, "$version\n   " + version + "\n$end\n");
        if (origin != 0) {
            ascii(w, "$comment\n   times shifted by " + (-origin) + " fs: time 0 here is " + origin
                    + " fs in the capture\n$end\n");
        }
        ascii(w, "$timescale 1 fs $end\n");
        String open = null;
        for (Var v : layout) {
            if (!v.scope.equals(open)) {
                if (open != null) {
                    ascii(w, "$upscope $end\n");
                }
                ascii(w, "$scope module " + v.scope + " $end\n");
                open = v.scope;
            }
            ascii(w, "$var wire " + v.width + " " + v.code + " " + v.name + (v.width > 1 ? " [" + (v.width - 1) + ":0]" : "") + " $end\n");
        }
        ascii(w, "$upscope $end\n$enddefinitions $end\n");
    }
}
