package org.lanesift.runner.capture;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.DataKind;
import org.lanesift.data.Edges;
import org.lanesift.data.WordStream;
import org.lanesift.plugin.PortSpec;
import org.lanesift.time.Femtos;

/**
 * Streams an IEEE 1364-2005 clause 18 (four-state) value change dump: scalar variables become
 * {@link Edges} (x and z as unknown spans), vectors up to 64 bits {@link WordStream}s, real
 * variables {@link AnalogBlock}s by sample-and-hold on a fixed grid. See docs/capture-vcd.md.
 */
final class VcdReader implements CaptureReader {
    /** Most variables (distinct identifier codes) accepted. */
    static final int MAX_SIGNALS = 65_536;
    /** Most bytes of declarations accepted before $enddefinitions. */
    static final long MAX_HEADER_BYTES = 64L << 20;
    /** Most grid samples of one real variable over the whole capture. */
    static final double MAX_REAL_SAMPLES = 4e9;

    enum Kind { SCALAR, VECTOR, REAL }

    /** One identifier code and what is known of its value. */
    static final class Signal {
        final int index;
        final Kind kind;
        final int width;
        final String path;
        final String code;
        String port;
        // scalar state
        boolean level;
        boolean unknown = true;
        long unknownSince;
        boolean spanInitial;
        long[] times = new long[16];
        int count;
        long[] spans = new long[8];
        int spanCount;
        // vector state
        long value;
        boolean suspect = true;
        boolean gapNext;
        boolean curGap;
        long valueSince;
        boolean hasValue;
        long[] wv = new long[8];
        long[] ws = new long[8];
        long[] we = new long[8];
        byte[] wf = new byte[8];
        int words;
        // real state
        double real = Double.NaN;
        long[] rt = new long[8];
        double[] rv = new double[8];
        int rcount;

        Signal(int index, Kind kind, int width, String path, String code) {
            this.index = index;
            this.kind = kind;
            this.width = width;
            this.path = path;
            this.code = code;
        }

        void addTime(long t) {
            if (count == times.length) {
                times = Arrays.copyOf(times, count * 2);
            }
            times[count++] = t;
        }

        void addSpan(long a, long b) {
            if (b <= a) {
                return;
            }
            if (spanCount > 0 && spans[2 * spanCount - 1] == a) {
                spans[2 * spanCount - 1] = b;
                return;
            }
            if (2 * spanCount + 2 > spans.length) {
                spans = Arrays.copyOf(spans, spans.length * 2);
            }
            spans[2 * spanCount] = a;
            spans[2 * spanCount + 1] = b;
            spanCount++;
        }

        void addWord(long v, long s, long e, byte f) {
            if (words == wv.length) {
                int n = words * 2;
                wv = Arrays.copyOf(wv, n);
                ws = Arrays.copyOf(ws, n);
                we = Arrays.copyOf(we, n);
                wf = Arrays.copyOf(wf, n);
            }
            wv[words] = v;
            ws[words] = s;
            we[words] = e;
            wf[words] = f;
            words++;
        }

        void addReal(long t, double v) {
            if (rcount == rt.length) {
                rt = Arrays.copyOf(rt, rcount * 2);
                rv = Arrays.copyOf(rv, rcount * 2);
            }
            rt[rcount] = t;
            rv[rcount] = v;
            rcount++;
        }
    }

    private final Path file;
    private final InputStream in;
    private final VcdTokens tk;
    private final long fileSize;
    final List<Signal> signals = new ArrayList<>();
    private final Map<Long, Signal> shortCodes = new HashMap<>();
    private final Map<String, Signal> longCodes = new HashMap<>();
    long unitFs;
    String timescaleText;
    private final int blockChanges;
    private final double realPeriodFs;
    private final boolean hasReals;
    private final List<PortSpec> ports = new ArrayList<>();
    private final List<String> units = new ArrayList<>();

    private long current;       // current time, fs
    private long spanStart;
    private boolean started;
    private boolean pendingTime;
    private long pendingFs;
    private boolean off;
    private boolean done;
    private long changes;
    private long lastTime;
    private String section;
    private long captureStartFs;
    private long sectionLine;

    /** Reads the declarations. */
    VcdReader(Path file, double realRateHz, int blockChanges, boolean headerOnly) throws IOException {
        this.file = file;
        this.blockChanges = blockChanges;
        this.realPeriodFs = Femtos.periodFs(realRateHz);
        try {
            this.fileSize = Files.size(file);
            this.in = new BufferedInputStream(Files.newInputStream(file), 1 << 16);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, "file not found");
        }
        this.tk = new VcdTokens(in, file);
        try {
            readHeader();
        } catch (RuntimeException | IOException e) {
            in.close();
            throw e;
        }
        boolean reals = false;
        for (Signal s : signals) {
            reals |= s.kind == Kind.REAL;
            DataKind k = s.kind == Kind.SCALAR ? DataKind.EDGES : s.kind == Kind.VECTOR ? DataKind.WORDS : DataKind.ANALOG;
            String help = switch (s.kind) {
                case SCALAR -> "scalar '" + s.path + "' as edges";
                case VECTOR -> s.width + "-bit vector '" + s.path + "' as words";
                case REAL -> "real '" + s.path + "' sampled and held at " + Femtos.format(realPeriodFs) + " intervals";
            };
            ports.add(PortSpec.of(s.port, k, help));
            units.add(s.kind == Kind.REAL ? "" : "");
        }
        this.hasReals = reals;
        if (headerOnly) {
            in.close();
        }
    }

    private CaptureFormatException err(String msg) {
        return new CaptureFormatException(file, tk.tokLine, msg);
    }

    private void readHeader() throws IOException {
        List<String> scope = new ArrayList<>();
        List<List<String>> paths = new ArrayList<>();
        while (true) {
            if (!tk.next()) {
                throw new CaptureFormatException(file, tk.tokLine, "truncated: the file ends inside the declarations; expected"
                        + " $enddefinitions $end");
            }
            if (tk.bytesRead() > MAX_HEADER_BYTES) {
                throw err("declarations longer than " + MAX_HEADER_BYTES + " bytes; expected $enddefinitions sooner");
            }
            if (tk.is("$enddefinitions")) {
                expectEnd("$enddefinitions");
                break;
            } else if (tk.is("$timescale")) {
                StringBuilder sb = new StringBuilder();
                long ln = tk.tokLine;
                while (true) {
                    if (!tk.next()) {
                        throw truncated("$timescale");
                    }
                    if (tk.is("$end")) {
                        break;
                    }
                    sb.append(tk.text());
                    if (sb.length() > 64) {
                        break;
                    }
                }
                parseTimescale(sb.toString(), ln);
            } else if (tk.is("$scope")) {
                List<String> args = args("$scope");
                if (args.size() != 2) {
                    throw err("$scope: expected a scope type and a name before $end, found " + args.size() + " words");
                }
                scope.add(args.get(1));
            } else if (tk.is("$upscope")) {
                expectEnd("$upscope");
                if (scope.isEmpty()) {
                    throw err("$upscope without an open $scope");
                }
                scope.remove(scope.size() - 1);
            } else if (tk.is("$var")) {
                long ln = tk.tokLine;
                List<String> a = args("$var");
                if (a.size() < 4 || a.size() > 5) {
                    throw new CaptureFormatException(file, ln, "$var: expected type, size, identifier code, reference"
                            + " [and a bit select] before $end, found " + a.size() + " words");
                }
                declare(a, scope, paths, ln);
            } else if (tk.is("$date") || tk.is("$version") || tk.is("$comment")) {
                String what = tk.text();
                skipToEnd(what);
            } else if (tk.tokLen > 0 && tk.tok[0] == '$') {
                throw err("unknown declaration keyword '" + tk.shown() + "'; expected $date, $version, $comment, $timescale,"
                        + " $scope, $upscope, $var or $enddefinitions");
            } else {
                throw err("unexpected '" + tk.shown() + "' in the declarations; expected a keyword starting with '$'");
            }
        }
        if (timescaleText == null) {
            throw new CaptureFormatException(file, tk.tokLine, "no $timescale declaration; expected one such as '$timescale 1ns $end'"
                    + " before $enddefinitions");
        }
        if (signals.isEmpty()) {
            throw new CaptureFormatException(file, tk.tokLine, "no $var declarations; expected at least one variable");
        }
        assignPorts(paths);
    }

    private CaptureFormatException truncated(String inside) {
        return new CaptureFormatException(file, tk.tokLine, "truncated: the file ends inside " + inside + "; expected $end");
    }

    private void expectEnd(String kw) throws IOException {
        if (!tk.next()) {
            throw truncated(kw);
        }
        if (!tk.is("$end")) {
            throw err(kw + ": expected $end, found '" + tk.shown() + "'");
        }
    }

    private void skipToEnd(String kw) throws IOException {
        while (true) {
            if (!tk.next()) {
                throw truncated(kw);
            }
            if (tk.is("$end")) {
                return;
            }
        }
    }

    private List<String> args(String kw) throws IOException {
        List<String> out = new ArrayList<>();
        while (true) {
            if (!tk.next()) {
                throw truncated(kw);
            }
            if (tk.is("$end")) {
                return out;
            }
            if (out.size() > 8) {
                throw err(kw + ": too many words before $end");
            }
            out.add(tk.text());
        }
    }

    private void parseTimescale(String s, long ln) {
        String t = s.trim();
        int i = 0;
        while (i < t.length() && Character.isDigit(t.charAt(i))) {
            i++;
        }
        String num = t.substring(0, i);
        String unit = t.substring(i);
        long mult = switch (num) {
            case "1" -> 1;
            case "10" -> 10;
            case "100" -> 100;
            default -> -1;
        };
        long u = switch (unit) {
            case "s" -> Femtos.PER_S;
            case "ms" -> Femtos.PER_MS;
            case "us" -> Femtos.PER_US;
            case "ns" -> Femtos.PER_NS;
            case "ps" -> Femtos.PER_PS;
            case "fs" -> 1;
            default -> -1;
        };
        if (mult < 0 || u < 0 || (u == Femtos.PER_S && mult > 1)) {
            throw new CaptureFormatException(file, ln, "bad $timescale '" + (t.length() > 40 ? t.substring(0, 40) + "..." : t)
                    + "'; expected 1, 10 or 100 followed by s, ms, us, ns, ps or fs");
        }
        unitFs = mult * u;
        timescaleText = num + " " + unit;
    }

    private void declare(List<String> a, List<String> scope, List<List<String>> paths, long ln) {
        String type = a.get(0);
        String code = a.get(2);
        String ref = a.get(3);
        String select = a.size() == 5 ? a.get(4) : null;
        if (ref.contains("[") && select == null) {
            int b = ref.indexOf('[');
            select = ref.substring(b);
            ref = ref.substring(0, b);
        }
        long size;
        try {
            size = Long.parseLong(a.get(1));
        } catch (NumberFormatException e) {
            throw new CaptureFormatException(file, ln, "$var " + ref + ": expected a size in bits, found '" + a.get(1) + "'");
        }
        boolean real = type.equals("real") || type.equals("realtime") || type.equals("shortreal");
        if (!real && (size < 1 || size > 64)) {
            throw new CaptureFormatException(file, ln, "$var " + ref + ": " + size + " bits; expected 1 to 64 (wider vectors"
                    + " are not supported)");
        }
        for (int i = 0; i < code.length(); i++) {
            char c = code.charAt(i);
            if (c < 33 || c > 126) {
                throw new CaptureFormatException(file, ln, "$var " + ref + ": identifier code has a non-printable character");
            }
        }
        if (find(code) != null) {
            return; // another name for a signal already declared: the first name is kept
        }
        if (signals.size() >= MAX_SIGNALS) {
            throw new CaptureFormatException(file, ln, "more than " + MAX_SIGNALS + " variables; at most " + MAX_SIGNALS
                    + " are supported");
        }
        Kind kind = real ? Kind.REAL : size == 1 ? Kind.SCALAR : Kind.VECTOR;
        if (select != null && select.matches("\\[\\s*-?\\d+\\s*\\]")) {
            ref = ref + select.replace(" ", "");
        }
        List<String> path = new ArrayList<>(scope);
        path.add(ref);
        Signal s = new Signal(signals.size(), kind, real ? 64 : (int) size, String.join(".", path), code);
        signals.add(s);
        paths.add(path);
        long key = key(code);
        if (key >= 0) {
            shortCodes.put(key, s);
        } else {
            longCodes.put(code, s);
        }
    }

    /** Port name: the shortest suffix of the scope path that is unique, sanitised. */
    private void assignPorts(List<List<String>> paths) {
        int n = signals.size();
        int[] depth = new int[n];
        Arrays.fill(depth, 1);
        for (int round = 0; round < 64; round++) {
            Map<String, List<Integer>> by = new HashMap<>();
            for (int i = 0; i < n; i++) {
                by.computeIfAbsent(suffix(paths.get(i), depth[i]).toLowerCase(Locale.ROOT), k -> new ArrayList<>()).add(i);
            }
            boolean changed = false;
            for (List<Integer> g : by.values()) {
                if (g.size() > 1) {
                    for (int i : g) {
                        if (depth[i] < paths.get(i).size()) {
                            depth[i]++;
                            changed = true;
                        }
                    }
                }
            }
            if (!changed) {
                break;
            }
        }
        List<String> raw = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            raw.add(suffix(paths.get(i), depth[i]));
        }
        List<String> p = Names.ports(raw);
        for (int i = 0; i < n; i++) {
            signals.get(i).port = p.get(i);
        }
    }

    private static String suffix(List<String> path, int d) {
        return String.join(".", path.subList(Math.max(0, path.size() - d), path.size()));
    }

    /** Base-95 key of a code of up to 9 printable characters, or -1. */
    private static long key(CharSequence code) {
        if (code.length() > 9) {
            return -1;
        }
        long k = 0;
        for (int i = 0; i < code.length(); i++) {
            k = k * 95 + (code.charAt(i) - 32);
        }
        return k;
    }

    private Signal find(String code) {
        long k = key(code);
        return k >= 0 ? shortCodes.get(k) : longCodes.get(code);
    }

    private Signal findTok(int from) {
        int n = tk.tokLen - from;
        Signal s;
        if (n <= 9 && n > 0) {
            long k = 0;
            for (int i = from; i < tk.tokLen; i++) {
                k = k * 95 + ((tk.tok[i] & 0xff) - 32);
            }
            s = shortCodes.get(k);
        } else {
            s = n <= 0 ? null : longCodes.get(tk.text(from));
        }
        if (s == null) {
            throw err("unknown identifier code '" + (n <= 0 ? "" : tk.text(from)) + "'; expected one declared with $var");
        }
        return s;
    }

    @Override
    public List<PortSpec> ports() {
        return ports;
    }

    @Override
    public List<String> units() {
        return units;
    }

    @Override
    public long done() {
        return tk.bytesRead();
    }

    @Override
    public long total() {
        return fileSize;
    }

    /** Time-step unit of the file, fs. */
    long unitFs() {
        return unitFs;
    }

    double realPeriodFs() {
        return realPeriodFs;
    }

    @Override
    public boolean next(Out out) throws IOException {
        if (done) {
            return false;
        }
        long spanChanges = 0;
        long end;
        long maxSpanFs = (long) Math.min(Long.MAX_VALUE / 4.0, blockChanges * realPeriodFs);
        while (true) {
            if (pendingTime) {
                long t = pendingFs;
                if (t > current && (spanChanges >= blockChanges || (hasReals && t - spanStart > maxSpanFs))) {
                    end = hasReals ? Math.max(current + 1, Math.min(t, spanStart + maxSpanFs)) : t;
                    break; // the time stays pending for the next span
                }
                current = t;
                lastTime = t;
                pendingTime = false;
            }
            if (!tk.next()) {
                if (section != null) {
                    throw new CaptureFormatException(file, tk.tokLine, "truncated: the file ends inside " + section
                            + " (opened on line " + sectionLine + "); expected $end");
                }
                if (!started) {
                    done = true;
                    return false; // declarations only, no value changes
                }
                end = lastTime + unitFs;
                done = true;
                break;
            }
            byte c = tk.tok[0];
            if (c == '#') {
                long t = readTime();
                if (!started) {
                    start(t);
                    continue;
                }
                if (t < current) {
                    throw err("time goes backwards: #" + (t / unitFs) + " after #" + (current / unitFs)
                            + "; expected non-decreasing times");
                }
                if (hasReals && (t - captureStartFs) / realPeriodFs > MAX_REAL_SAMPLES) {
                    throw err("#" + (t / unitFs) + " would need more than " + MAX_REAL_SAMPLES + " samples per real variable"
                            + " on the grid of " + Femtos.format(realPeriodFs) + "; expected a lower option 'realRateHz'");
                }
                pendingTime = true;
                pendingFs = t;
            } else {
                if (!started) {
                    start(0);
                }
                if (c == '$') {
                    keyword();
                } else {
                    change(c);
                    spanChanges++;
                    changes++;
                }
            }
        }
        emit(out, end);
        spanStart = end;
        return true;
    }

    private void start(long t) {
        started = true;
        captureStartFs = t;
        spanStart = t;
        current = t;
        lastTime = t;
        for (Signal s : signals) {
            s.unknownSince = t;
            s.valueSince = t;
        }
    }

    private long readTime() {
        long t = 0;
        if (tk.tokLen < 2) {
            throw err("'#' without a time; expected #<digits>");
        }
        for (int i = 1; i < tk.tokLen; i++) {
            int d = tk.tok[i] - '0';
            if (d < 0 || d > 9) {
                throw err("bad time '" + tk.shown() + "'; expected # followed by decimal digits");
            }
            if (t > (Long.MAX_VALUE - d) / 10) {
                throw err("time '" + tk.shown() + "' is too large");
            }
            t = t * 10 + d;
        }
        if (t > Long.MAX_VALUE / unitFs / 2) {
            throw err("time " + t + " x " + timescaleText + " is beyond the " + (long) (Femtos.MAX_SECONDS / 2)
                    + " s the reader covers");
        }
        return t * unitFs;
    }

    private void keyword() throws IOException {
        if (tk.is("$dumpvars") || tk.is("$dumpall") || tk.is("$dumpon")) {
            if (section != null) {
                throw err(tk.text() + " inside " + section + "; expected $end first");
            }
            section = tk.text();
            sectionLine = tk.tokLine;
            if (!tk.is("$dumpon")) {
                return; // the values inside apply at the current time
            }
        } else if (tk.is("$end")) {
            if (section == null) {
                throw err("$end without an open $dumpvars, $dumpall or $dumpon");
            }
            section = null;
            return;
        }
        if (tk.is("$dumpoff")) {
            if (section != null) {
                throw err("$dumpoff inside " + section + "; expected $end first");
            }
            setOff(current);
            // the x values listed until $end carry no information
            while (true) {
                if (!tk.next()) {
                    throw truncated("$dumpoff");
                }
                if (tk.is("$end")) {
                    return;
                }
                if (tk.tok[0] == 'b' || tk.tok[0] == 'B' || tk.tok[0] == 'r' || tk.tok[0] == 'R') {
                    if (!tk.next()) {
                        throw truncated("$dumpoff");
                    }
                    findTok(0);
                } else if ("01xXzZ".indexOf(tk.tok[0]) >= 0) {
                    findTok(1);
                } else {
                    throw err("unexpected '" + tk.shown() + "' inside $dumpoff; expected values and $end");
                }
            }
        } else if (tk.is("$dumpon")) {
            off = false;
            for (Signal s : signals) {
                if (s.kind == Kind.VECTOR) {
                    s.gapNext = true;
                }
            }
        } else if (tk.is("$comment")) {
            skipToEnd("$comment");
        } else {
            throw err("unexpected '" + tk.shown() + "' among the value changes; expected #time, a value change, $dumpvars,"
                    + " $dumpall, $dumpon, $dumpoff or $comment");
        }
    }

    private void setOff(long t) {
        off = true;
        for (Signal s : signals) {
            switch (s.kind) {
                case SCALAR -> {
                    if (!s.unknown) {
                        s.unknown = true;
                        s.unknownSince = t;
                    }
                }
                case VECTOR -> setWord(s, t, 0, true);
                case REAL -> setReal(s, t, Double.NaN);
            }
        }
    }

    private void change(byte c) throws IOException {
        long t = current;
        switch (c) {
            case '0', '1', 'x', 'X', 'z', 'Z' -> {
                Signal s = findTok(1);
                if (off) {
                    return;
                }
                if (s.kind == Kind.SCALAR) {
                    setScalar(s, t, c);
                } else if (s.kind == Kind.VECTOR) {
                    boolean xz = c != '0' && c != '1';
                    setWord(s, t, c == '1' ? 1 : 0, xz);
                } else {
                    throw err("scalar value for real variable '" + s.path + "'; expected r<number>");
                }
            }
            case 'b', 'B' -> {
                int n = tk.tokLen - 1;
                if (n < 1) {
                    throw err("vector value without digits; expected b followed by 0, 1, x or z");
                }
                long v = 0;
                boolean xz = false;
                for (int i = 1; i < tk.tokLen; i++) {
                    byte d = tk.tok[i];
                    if (d == '0' || d == '1') {
                        v = (v << 1) | (d - '0');
                    } else if (d == 'x' || d == 'X' || d == 'z' || d == 'Z') {
                        xz = true;
                        v <<= 1;
                    } else {
                        throw err("bad vector digit '" + (char) d + "' in '" + tk.shown() + "'; expected 0, 1, x or z");
                    }
                }
                byte first = tk.tok[1];
                long valueLine = tk.tokLine;
                String shown = tk.shown();
                if (!tk.next()) {
                    throw new CaptureFormatException(file, valueLine, "truncated: the file ends after the value '" + shown
                            + "'; expected an identifier code");
                }
                Signal s = findTok(0);
                if (s.kind == Kind.REAL) {
                    throw err("vector value for real variable '" + s.path + "'; expected r<number>");
                }
                if (n > s.width) {
                    throw new CaptureFormatException(file, valueLine, "vector value '" + shown + "' has " + n + " bits but '"
                            + s.path + "' is declared with " + s.width + "; expected at most " + s.width + " digits");
                }
                if (n < s.width && (first == 'x' || first == 'X' || first == 'z' || first == 'Z')) {
                    xz = true; // left-extended with x or z (IEEE 1364-2005 18.2.1)
                }
                if (off) {
                    return;
                }
                if (s.kind == Kind.SCALAR) {
                    setScalar(s, t, xz ? (byte) 'x' : (v & 1) == 1 ? (byte) '1' : (byte) '0');
                } else {
                    setWord(s, t, v, xz);
                }
            }
            case 'r', 'R' -> {
                double d;
                String txt = tk.text(1);
                try {
                    d = Double.parseDouble(txt);
                } catch (NumberFormatException e) {
                    throw err("bad real value '" + tk.shown() + "'; expected r followed by a number");
                }
                long valueLine = tk.tokLine;
                if (!tk.next()) {
                    throw new CaptureFormatException(file, valueLine, "truncated: the file ends after the value 'r" + txt
                            + "'; expected an identifier code");
                }
                Signal s = findTok(0);
                if (s.kind != Kind.REAL) {
                    throw err("real value for " + s.width + "-bit variable '" + s.path + "'; expected 0, 1, x, z or b<digits>");
                }
                if (!off) {
                    setReal(s, t, d);
                }
            }
            default -> throw err("unexpected '" + tk.shown() + "'; expected #time, a value change (0, 1, x, z, b, r) or a"
                    + " $ keyword");
        }
    }

    private static void setScalar(Signal s, long t, byte c) {
        if (c == '0' || c == '1') {
            boolean lv = c == '1';
            if (s.unknown) {
                s.addSpan(s.unknownSince, t);
                s.unknown = false;
            }
            if (lv != s.level) {
                s.addTime(t);
                s.level = lv;
            }
        } else if (!s.unknown) {
            s.unknown = true;
            s.unknownSince = t;
        }
    }

    private static void setWord(Signal s, long t, long v, boolean xz) {
        boolean keepGap = s.hasValue && t == s.valueSince && s.curGap;
        if (s.hasValue && t > s.valueSince) {
            s.addWord(s.value, s.valueSince, t, flags(s));
        }
        s.hasValue = true;
        s.value = v;
        s.suspect = xz;
        s.valueSince = t;
        s.curGap = keepGap || s.gapNext;
        s.gapNext = false;
    }

    private static byte flags(Signal s) {
        return (byte) ((s.suspect ? WordStream.FLAG_SUSPECT : 0) | (s.curGap ? WordStream.FLAG_GAP_BEFORE : 0));
    }

    private static void setReal(Signal s, long t, double v) {
        s.addReal(t, v);
    }

    private void emit(Out out, long end) {
        for (Signal s : signals) {
            switch (s.kind) {
                case SCALAR -> {
                    if (s.unknown) {
                        s.addSpan(Math.max(s.unknownSince, spanStart), end);
                        s.unknownSince = end;
                    }
                    out.emit(s.index, new Edges(s.port, spanStart, end, s.spanInitial, s.times, s.count, s.spans, s.spanCount));
                    s.spanInitial = s.level;
                    s.times = new long[Math.max(16, Math.min(s.count, 1 << 16))];
                    s.count = 0;
                    s.spans = new long[8];
                    s.spanCount = 0;
                }
                case VECTOR -> {
                    if (done && s.hasValue && end > s.valueSince) {
                        s.addWord(s.value, s.valueSince, end, flags(s));
                    }
                    out.emit(s.index, new WordStream(s.port, spanStart, end, s.words, s.width, s.wv, s.ws, s.we, lanes(s.words), s.wf));
                    int n = Math.max(8, Math.min(s.words, 1 << 16));
                    s.wv = new long[n];
                    s.ws = new long[n];
                    s.we = new long[n];
                    s.wf = new byte[n];
                    s.words = 0;
                }
                case REAL -> out.emit(s.index, realBlock(s, end));
            }
        }
    }

    private static int[] lanes(int n) {
        return new int[n];
    }

    private AnalogBlock realBlock(Signal s, long end) {
        long k0 = (long) Math.ceil(spanStart / realPeriodFs);
        long k1 = (long) Math.ceil(end / realPeriodFs);
        int n = (int) Math.max(0, k1 - k0);
        float[] v = new float[n];
        long[] inv = null;
        int j = 0;
        double cur = s.real;
        for (int i = 0; i < n; i++) {
            double t = (k0 + i) * realPeriodFs;
            while (j < s.rcount && s.rt[j] <= t) {
                cur = s.rv[j++];
            }
            if (Double.isNaN(cur)) {
                if (inv == null) {
                    inv = new long[(n + 63) >>> 6];
                }
                inv[i >>> 6] |= 1L << i;
            } else {
                v[i] = (float) cur;
            }
        }
        if (s.rcount > 0) {
            s.real = s.rv[s.rcount - 1];
        }
        s.rcount = 0;
        return new AnalogBlock(s.port, k0, Math.round(k0 * realPeriodFs), realPeriodFs, v, n, inv);
    }

    @Override
    public void close() throws IOException {
        in.close();
    }
}
