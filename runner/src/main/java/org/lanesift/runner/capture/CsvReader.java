package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.lanesift.data.AnalogBlock;
import org.lanesift.data.DataKind;
import org.lanesift.plugin.OptionException;
import org.lanesift.plugin.PortSpec;
import org.lanesift.time.Femtos;

/** Streams a CSV capture as analog blocks, one per channel column per span. */
final class CsvReader implements CaptureReader {
    /** Longest line accepted, also the read buffer size. */
    static final int MAX_LINE = 1 << 20;
    /** Most values (channels x rows) in one span. */
    static final int MAX_SPAN_VALUES = 1 << 24;

    private final CsvLayout l;
    private final Path file;
    private final FileChannel ch;
    private final byte[] buf = new byte[MAX_LINE + 1];
    private final ByteBuffer bb = ByteBuffer.wrap(buf);
    private int pos;
    private int len;
    private boolean eof;
    private long consumedBytes;
    private long line;
    private long rows;
    private final int rowsPerBlock;
    private final int nch;
    private final int[] action;  // per field: -2 ignore, -1 time, k channel
    private final double[] scales;
    private final byte sep;
    private final boolean dc;
    private final NumberParser np = new NumberParser();
    private final double periodFs;
    private final long startFs;
    private final double stepS;
    private final double t0S;
    private final double index0;
    private double prevT = Double.NaN;
    private int cachedExp = Integer.MIN_VALUE;
    private double cachedRes;
    private final List<PortSpec> ports = new ArrayList<>();

    CsvReader(CsvLayout l, double rateHz, int blockSamples) throws IOException {
        this.l = l;
        this.file = l.file;
        this.nch = l.channelColumns.length;
        this.rowsPerBlock = Math.max(1, Math.min(blockSamples, MAX_SPAN_VALUES / nch));
        this.action = new int[l.fieldCount];
        Arrays.fill(action, -2);
        for (int k = 0; k < nch; k++) {
            action[l.channelColumns[k]] = k;
        }
        if (l.timeColumn >= 0) {
            action[l.timeColumn] = -1;
        }
        this.scales = l.scales.clone();
        this.sep = l.separator;
        this.dc = l.decimalComma;
        for (int k = 0; k < nch; k++) {
            ports.add(PortSpec.of(l.ports[k], DataKind.ANALOG, "column '" + l.channelNames[k] + "' in " + l.units[k] + " (" + l.fileUnits[k] + ")"));
        }
        switch (l.timeKind) {
            case SECONDS -> {
                if (rateHz > 0) {
                    stepS = 1 / rateHz;
                } else if (Double.isNaN(l.headStep)) {
                    throw new OptionException("rateHz", file.getFileName() + ": only one data row, so the time column gives no"
                            + " sample rate; give option 'rateHz'");
                } else {
                    stepS = l.headStep;
                }
                t0S = l.headFirstTime;
                index0 = 0;
                startFs = startFs(t0S);
            }
            case INDEX -> {
                requireRate(rateHz, "a sample-index column");
                stepS = 1 / rateHz;
                index0 = Double.isNaN(l.headFirstIndex) ? 0 : l.headFirstIndex;
                t0S = index0 * stepS;
                startFs = startFs(t0S);
            }
            default -> {
                requireRate(rateHz, "no time column");
                stepS = 1 / rateHz;
                t0S = 0;
                index0 = 0;
                startFs = 0;
            }
        }
        if (!(stepS > 0) || !Double.isFinite(stepS)) {
            throw new CaptureFormatException(file, l.dataLine, "the time column does not advance; expected increasing times");
        }
        if (stepS * Femtos.PER_S < 1) {
            throw new CaptureFormatException(file, l.dataLine, "a time step of " + fmt(stepS) + " s is below 1 fs, the time"
                    + " base's step; expected at most 1e15 samples per second");
        }
        this.periodFs = stepS * Femtos.PER_S;
        CaptureFormatException.requireRegular(file);
        this.ch = FileChannel.open(file, StandardOpenOption.READ);
        ch.position(l.dataOffset);
        consumedBytes = l.dataOffset;
        line = l.dataLine - 1;
    }

    /** The first row's time in femtoseconds, refused when the time base cannot hold it. */
    private long startFs(double t0S) {
        if (!Double.isFinite(t0S) || Math.abs(t0S) > Femtos.MAX_SECONDS) {
            throw new CaptureFormatException(file, l.dataLine, "time " + fmt(t0S) + " s is beyond +/-"
                    + String.format(java.util.Locale.ROOT, "%.0f", Femtos.MAX_SECONDS) + " s; expected times within the"
                    + " time base (femtoseconds in 64 bits, about 2.5 h either side of the origin)");
        }
        return Femtos.fromSeconds(t0S);
    }

    private void requireRate(double rateHz, String why) {
        if (!(rateHz > 0)) {
            throw new OptionException("rateHz", file.getFileName() + " has " + why + "; give the sample rate with option"
                    + " 'rateHz' (a positive number of Hz)");
        }
    }

    double periodFs() {
        return periodFs;
    }

    @Override
    public List<PortSpec> ports() {
        return ports;
    }

    @Override
    public List<String> units() {
        return Arrays.asList(l.units);
    }

    @Override
    public long done() {
        return rows;
    }

    @Override
    public long total() {
        if (consumedBytes <= l.dataOffset || rows == 0) {
            return l.estimatedRows();
        }
        double perRow = (double) (consumedBytes - l.dataOffset) / rows;
        return Math.max(rows, Math.round((l.fileSize - l.dataOffset) / perRow));
    }

    private boolean fill() throws IOException {
        if (eof) {
            return false;
        }
        if (pos > 0) {
            System.arraycopy(buf, pos, buf, 0, len - pos);
            len -= pos;
            pos = 0;
        }
        if (len >= buf.length) {
            throw new CaptureFormatException(file, line + 1, "line longer than " + MAX_LINE + " bytes; expected at most "
                    + CsvLayout.MAX_COLUMNS + " columns");
        }
        bb.limit(buf.length).position(len);
        int r = ch.read(bb);
        if (r < 0) {
            eof = true;
            return false;
        }
        len += r;
        return true;
    }

    @Override
    public boolean next(Out out) throws IOException {
        float[][] v = null;
        long[][] inv = null;
        int n = 0;
        final byte[] b = buf;
        while (n < rowsPerBlock) {
            // find the line end
            int e = pos;
            while (e < len && b[e] != '\n' && b[e] != '\r') {
                e++;
            }
            if (e >= len || (b[e] == '\r' && e + 1 >= len && !eof)) {
                if (fill()) {
                    continue;
                }
                if (pos >= len) {
                    break;
                }
                e = len;
            }
            int next = e;
            if (next < len && b[next] == '\r') {
                next++;
            }
            if (next < len && b[next] == '\n') {
                next++;
            }
            line++;
            int s = pos;
            consumedBytes += next - pos;
            pos = next;
            if (v == null) {
                v = new float[nch][rowsPerBlock];
            }
            int r = parseLine(b, s, e, v, n);
            if (r == 1) {
                n++;
            } else if (r == 2) {
                if (inv == null) {
                    inv = new long[nch][];
                }
                markInvalid(v, inv, n);
                n++;
            }
        }
        if (n == 0) {
            return false;
        }
        long first = rows;
        if (!Femtos.spanFits(startFs, periodFs, first + n)) {
            throw new CaptureFormatException(file, line, "row " + (first + n) + " at " + fmt(Femtos.toSeconds(startFs) + (first + n - 1)
                    * periodFs / Femtos.PER_S) + " s is beyond +/-" + String.format(java.util.Locale.ROOT, "%.0f", Femtos.MAX_SECONDS)
                    + " s; expected a capture within the time base (femtoseconds in 64 bits)");
        }
        long blockStart = startFs + Math.round(first * periodFs);
        for (int k = 0; k < nch; k++) {
            out.emit(k, new AnalogBlock(l.ports[k], first, blockStart, periodFs, v[k], n, inv == null ? null : inv[k]));
        }
        rows += n;
        return true;
    }

    private void markInvalid(float[][] v, long[][] inv, int row) {
        for (int k = 0; k < nch; k++) {
            if (Float.isNaN(v[k][row])) {
                if (inv[k] == null) {
                    inv[k] = new long[(rowsPerBlock + 63) >>> 6];
                }
                inv[k][row >>> 6] |= 1L << row;
            }
        }
    }

    /** Parses one line into row {@code row}; returns 0 for a skipped line, 1 for a row, 2 for a row with missing cells. */
    private int parseLine(byte[] b, int s, int e, float[][] v, int row) {
        int end = e;
        while (end > s && (b[end - 1] == ' ' || b[end - 1] == '\t' && sep != '\t')) {
            end--;
        }
        if (end == s) {
            return 0;
        }
        final int[] act = action;
        final int nf = act.length;
        final byte sp = sep;
        int result = 1;
        int j = 0;
        int k = s;
        while (true) {
            if (j >= nf) {
                if (isHeader(b, s, end)) {
                    return 0;
                }
                throw new CaptureFormatException(file, line, "expected " + nf + " fields separated by " + sepName()
                        + ", found " + countFields(b, s, end));
            }
            int a = act[j];
            int fs = k;
            if (a == -2) {
                while (k < end && b[k] != sp) {
                    k++;
                }
            } else {
                double d = np.parseField(b, k, end, sp, dc);
                if (np.ok) {
                    k = np.stop;
                } else {
                    while (k < end && b[k] != sp) {
                        k++;
                    }
                    d = slowCell(b, s, end, fs, k, a, j);
                    if (skipLine) {
                        skipLine = false;
                        return 0;
                    }
                }
                if (a >= 0) {
                    float f = (float) (d * scales[a]);
                    if (!Float.isFinite(f)) {
                        f = Float.NaN; // inf, 1e309, or beyond float range: not a measured value (docs/capture-csv.md)
                    }
                    v[a][row] = f;
                    if (f != f) {
                        result = 2;
                    }
                } else {
                    checkTime(d, j, row);
                }
            }
            j++;
            if (k >= end) {
                break;
            }
            k++; // the separator
        }
        if (j < nf && !(j == nf - 1 && act[nf - 1] == -2)) {
            if (isHeader(b, s, end)) {
                return 0;
            }
            throw new CaptureFormatException(file, line, "expected " + nf + " fields separated by " + sepName() + ", found " + j);
        }
        return result;
    }

    /** Set by {@link #slowCell} when the line is a repeated header. */
    private boolean skipLine;

    /** A cell the one-pass parser did not take: quoted, blank, or not a number. */
    private double slowCell(byte[] b, int s, int end, int fs, int k, int a, int j) {
        int cs = fs;
        int ce = k;
        while (cs < ce && b[cs] == ' ') {
            cs++;
        }
        while (ce > cs && b[ce - 1] == ' ') {
            ce--;
        }
        if (ce - cs >= 2 && b[cs] == '"' && b[ce - 1] == '"') {
            cs++;
            ce--;
        }
        double d = np.parse(b, cs, ce, dc);
        if (np.ok) {
            return d;
        }
        if (isBlank(b, cs, ce) && a >= 0) {
            return Double.NaN;
        }
        if (isHeader(b, s, end)) {
            skipLine = true;
            return 0;
        }
        throw new CaptureFormatException(file, line, "column " + (j + 1) + " (" + columnName(j) + "): expected a number"
                + (dc ? " with a decimal comma" : "") + ", found '" + text(b, fs, k) + "'");
    }

    private void checkTime(double t, int column, int row) {
        long r = rows + row;
        if (l.timeKind == CsvLayout.TimeKind.INDEX) {
            double expected = index0 + r;
            if (t != expected) {
                throw new CaptureFormatException(file, line, "column " + (column + 1) + " (" + columnName(column)
                        + "): expected sample index " + fmt(expected) + ", found " + fmt(t));
            }
            return;
        }
        double ts = t * l.timeScale;
        if (!Double.isFinite(ts)) {
            throw new CaptureFormatException(file, line, "column " + (column + 1) + " (" + columnName(column) + "): expected a finite time");
        }
        if (!Double.isNaN(prevT) && !(ts > prevT)) {
            throw new CaptureFormatException(file, line, "time " + (ts < prevT ? "goes backwards" : "does not advance") + ": "
                    + fmt(ts) + " s after " + fmt(prevT) + " s on the row before; expected increasing, uniformly spaced times");
        }
        prevT = ts;
        if (Math.abs(ts) > Femtos.MAX_SECONDS) {
            throw new CaptureFormatException(file, line, "time " + fmt(ts) + " s is beyond +/-"
                    + String.format(java.util.Locale.ROOT, "%.0f", Femtos.MAX_SECONDS) + " s; expected times within the"
                    + " time base (femtoseconds in 64 bits, about 2.5 h either side of the origin)");
        }
        double expected = t0S + r * stepS;
        if (np.lastExp10 != cachedExp) {
            cachedExp = np.lastExp10;
            cachedRes = Math.pow(10, cachedExp) * l.timeScale;
        }
        double tol = 0.5 * stepS + 0.5 * cachedRes;
        if (Math.abs(ts - expected) > tol) {
            throw new CaptureFormatException(file, line, "time " + fmt(ts) + " s is off the uniform sample grid (expected "
                    + fmt(expected) + " s +/- half a sample of " + fmt(stepS) + " s); the reader needs uniformly spaced samples"
                    + " (a gap in the capture, or give option 'rateHz' if the time column is rounded)");
        }
    }

    private boolean isHeader(byte[] b, int s, int end) {
        byte[] h = l.headerBytes;
        if (h == null || end - s != h.length) {
            return false;
        }
        for (int i = 0; i < h.length; i++) {
            if (b[s + i] != h[i]) {
                return false;
            }
        }
        return true;
    }

    private static boolean isBlank(byte[] b, int s, int e) {
        for (int i = s; i < e; i++) {
            if (b[i] != ' ' && b[i] != '\t') {
                return false;
            }
        }
        return true;
    }

    private int countFields(byte[] b, int s, int e) {
        int n = 1;
        for (int i = s; i < e; i++) {
            if (b[i] == sep) {
                n++;
            }
        }
        return n;
    }

    private String columnName(int j) {
        if (j == l.timeColumn) {
            return l.timeKind == CsvLayout.TimeKind.INDEX ? "sample index" : "time";
        }
        for (int k = 0; k < nch; k++) {
            if (l.channelColumns[k] == j) {
                return "'" + l.channelNames[k] + "'";
            }
        }
        return "unused";
    }

    private String sepName() {
        return sep == '\t' ? "tabs" : "'" + (char) sep + "'";
    }

    private static String text(byte[] b, int s, int e) {
        int n = Math.min(e - s, 40);
        return new String(b, s, n, StandardCharsets.UTF_8) + (e - s > n ? "..." : "");
    }

    private static String fmt(double d) {
        if (d == Math.rint(d) && Math.abs(d) < 1e15) {
            return Long.toString((long) d);
        }
        return String.format(Locale.ROOT, "%.9g", d);
    }

    @Override
    public void close() throws IOException {
        ch.close();
    }
}
