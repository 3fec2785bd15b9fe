package org.lanesift.runner.capture;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.lanesift.plugin.PortSpec;
import org.lanesift.time.Femtos;

/**
 * Streams an IEEE 1364-2005 clause 18 (four-state) value change dump: scalar variables become
 * edges (x and z as unknown spans), vectors up to 64 bits word streams, real variables analog
 * blocks by sample-and-hold on a fixed grid. See docs/capture-vcd.md.
 *
 * <p>{@link VcdTokens} splits the file, {@link VcdHeader} reads the declarations, and each
 * variable is a {@link VcdSignal} of its kind that collects its own changes; this class reads the
 * value-change section (times, {@code $dump*} sections, value changes) and cuts it into blocks.
 */
final class VcdReader implements CaptureReader {
    /** Most grid samples of one real variable over the whole capture. */
    static final double MAX_REAL_SAMPLES = 4e9;

    private final Path file;
    private final InputStream in;
    private final VcdTokens tk;
    private final long fileSize;
    private final List<VcdSignal> signals;
    private final VcdCodes codes;
    private final long unitFs;
    private final String timescaleText;
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
        CaptureFormatException.requireRegular(file);
        try {
            this.fileSize = Files.size(file);
            this.in = new BufferedInputStream(Files.newInputStream(file), 1 << 16);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, "file not found");
        }
        this.tk = new VcdTokens(in, file);
        VcdHeader header;
        try {
            header = VcdHeader.read(file, tk);
        } catch (RuntimeException | IOException e) {
            in.close();
            throw e;
        }
        this.signals = header.signals;
        this.codes = header.codes;
        this.unitFs = header.unitFs;
        this.timescaleText = header.timescaleText;
        boolean reals = false;
        for (VcdSignal s : signals) {
            reals |= s instanceof VcdReal;
            ports.add(PortSpec.of(s.port(), s.dataKind(), s.help(realPeriodFs)));
            units.add("");
        }
        this.hasReals = reals;
        if (headerOnly) {
            in.close();
        }
    }

    private CaptureFormatException err(String msg) {
        return tk.error(msg);
    }

    private CaptureFormatException truncated(String inside) {
        return tk.truncated(inside);
    }

    private VcdSignal findTok(int from) {
        return codes.find(tk, from);
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
        for (VcdSignal s : signals) {
            s.start(t);
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
            for (VcdSignal s : signals) {
                s.dumpOn();
            }
        } else if (tk.is("$comment")) {
            tk.skipToEnd("$comment");
        } else {
            throw err("unexpected '" + tk.shown() + "' among the value changes; expected #time, a value change, $dumpvars,"
                    + " $dumpall, $dumpon, $dumpoff or $comment");
        }
    }

    private void setOff(long t) {
        off = true;
        for (VcdSignal s : signals) {
            s.dumpOff(t);
        }
    }

    private void change(byte c) throws IOException {
        long t = current;
        switch (c) {
            case '0', '1', 'x', 'X', 'z', 'Z' -> {
                VcdSignal s = findTok(1);
                if (off) {
                    return;
                }
                if (s instanceof VcdScalar sc) {
                    sc.set(t, c);
                } else if (s instanceof VcdVector v) {
                    boolean xz = c != '0' && c != '1';
                    v.set(t, c == '1' ? 1 : 0, xz);
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
                VcdSignal s = findTok(0);
                if (s instanceof VcdReal) {
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
                if (s instanceof VcdScalar sc) {
                    sc.set(t, xz ? (byte) 'x' : (v & 1) == 1 ? (byte) '1' : (byte) '0');
                } else {
                    ((VcdVector) s).set(t, v, xz);
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
                VcdSignal s = findTok(0);
                if (!(s instanceof VcdReal r)) {
                    throw err("real value for " + s.width + "-bit variable '" + s.path + "'; expected 0, 1, x, z or b<digits>");
                }
                if (!off) {
                    r.set(t, d);
                }
            }
            default -> throw err("unexpected '" + tk.shown() + "'; expected #time, a value change (0, 1, x, z, b, r) or a"
                    + " $ keyword");
        }
    }

    private void emit(Out out, long end) {
        for (VcdSignal s : signals) {
            out.emit(s.index, s.take(spanStart, end, done, realPeriodFs));
        }
    }

    @Override
    public void close() throws IOException {
        in.close();
    }
}
