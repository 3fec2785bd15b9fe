package org.lanesift.runner.capture;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * What the head of a CSV capture says: separator, decimal mark, where the data starts, which
 * column is time (seconds) or sample index, and the channels with their units. Found from at most
 * {@link #HEAD_BYTES} bytes; see docs/capture-csv.md for the rules.
 */
final class CsvLayout {
    /** Bytes read to find the header. */
    static final int HEAD_BYTES = 1 << 20;
    /** Most columns accepted. */
    static final int MAX_COLUMNS = 4096;
    /** Lines searched for the first data row. */
    static final int MAX_LEAD_LINES = 4096;

    enum TimeKind { SECONDS, INDEX, NONE }

    Path file;
    byte separator;
    boolean decimalComma;
    long dataOffset;          // byte offset of the first data line
    long dataLine;            // its 1-based line number
    int fieldCount;
    byte[] headerBytes;       // the header line, trimmed, or null
    TimeKind timeKind = TimeKind.NONE;
    int timeColumn = -1;
    double timeScale = 1;     // seconds per unit of the time column
    String timeUnit = "";
    int[] channelColumns;
    String[] channelNames;
    String[] ports;
    String[] units;
    String[] fileUnits;
    double[] scales;          // to volts (or 1 for other units)
    double headRowBytes;      // average bytes per data row in the head, for the progress estimate
    int headRows;
    double headFirstTime = Double.NaN;
    double headStep = Double.NaN; // seconds per row, estimated from the head (SECONDS) or NaN
    double headFirstIndex = Double.NaN;
    long fileSize;

    private static final Pattern UNIT = Pattern.compile("^(.*?)[\\s_]*[\\(\\[]\\s*([^\\)\\]]*?)\\s*[\\)\\]]\\s*$");
    private static final Pattern TIME_NAME = Pattern.compile("(?i)(time|t|seconds?|sec|x-axis|timestamp|zeit|temps|tiempo)");
    private static final Pattern INDEX_NAME = Pattern.compile("(?i)(sample|samples|sample ?index|index|idx|n|no\\.?|nr\\.?|#|point|pt)");

    private CsvLayout() {
    }

    /**
     * Reads the head of a file.
     *
     * @param file        the CSV file
     * @param sepOption   "auto", ",", ";" or "\t" (a tab, or the text "tab")
     * @param dcOption    "auto", "true" or "false"
     */
    static CsvLayout sniff(Path file, String sepOption, String dcOption) {
        CsvLayout l = new CsvLayout();
        l.file = file;
        byte[] head;
        CaptureFormatException.requireRegular(file);
        try (InputStream in = Files.newInputStream(file)) {
            l.fileSize = Files.size(file);
            head = in.readNBytes(HEAD_BYTES);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, "file not found");
        } catch (IOException e) {
            throw new CaptureFormatException(file, 0, "cannot read: " + e.getMessage(), e);
        }
        boolean truncatedHead = l.fileSize > head.length;
        int start = head.length >= 3 && (head[0] & 0xff) == 0xEF && (head[1] & 0xff) == 0xBB && (head[2] & 0xff) == 0xBF ? 3 : 0;
        // split the head into complete lines
        List<int[]> lines = new ArrayList<>(); // {from, to(excl, without line end), nextLineStart}
        int p = start;
        while (p < head.length) {
            int q = p;
            while (q < head.length && head[q] != '\n' && head[q] != '\r') {
                q++;
            }
            if (q >= head.length && truncatedHead) {
                break; // incomplete last line of the head
            }
            int next = q;
            if (next < head.length && head[next] == '\r') {
                next++;
            }
            if (next < head.length && head[next] == '\n') {
                next++;
            }
            lines.add(new int[] {p, q, next});
            p = next;
            if (lines.size() > 200_000) {
                break;
            }
        }
        if (lines.isEmpty()) {
            if (head.length == 0 || allBlank(head, start, head.length)) {
                throw new CaptureFormatException(file, 0, "the file is empty; expected a header line and rows of numbers");
            }
            throw new CaptureFormatException(file, 1, "line 1 is longer than " + HEAD_BYTES + " bytes; expected a header of at most "
                    + MAX_COLUMNS + " columns");
        }
        if (!truncatedHead && allBlank(head, start, head.length)) {
            throw new CaptureFormatException(file, 0, "the file is empty; expected a header line and rows of numbers");
        }
        for (int i = 0, n = Math.min(lines.size(), MAX_LEAD_LINES + 2); i < n; i++) {
            int[] ln = lines.get(i);
            int cols = 1;
            for (int k = ln[0]; k < ln[1] && cols <= MAX_COLUMNS * 4; k++) {
                byte c = head[k];
                if (c == ',' || c == ';' || c == '\t') {
                    cols++;
                }
            }
            if (cols > MAX_COLUMNS * 2) {
                throw new CaptureFormatException(file, i + 1, "more than " + MAX_COLUMNS + " columns; at most " + MAX_COLUMNS
                        + " are supported");
            }
        }
        List<byte[]> combos = new ArrayList<>(); // {separator, decimalComma}
        for (byte s : sepChoices(sepOption)) {
            for (boolean dc : dcChoices(dcOption, s)) {
                combos.add(new byte[] {s, (byte) (dc ? 1 : 0)});
            }
        }
        NumberParser np = new NumberParser();
        int bestScore = Integer.MIN_VALUE;
        int bestData = -1;
        byte[] best = null;
        for (byte[] c : combos) {
            int d = firstDataLine(head, lines, c[0], c[1] == 1, np);
            if (d < 0) {
                continue;
            }
            int n = fields(head, lines.get(d), c[0]).size();
            int h = prevNonBlank(head, lines, d);
            boolean match = h >= 0 && headerFits(fields(head, lines.get(h), c[0]), fields(head, lines.get(d), c[0]));
            int score = (match ? 1_000_000 : 0) + n * 100 - Math.min(d, 99);
            if (score > bestScore) {
                bestScore = score;
                best = c;
                bestData = d;
            }
        }
        int lastEnd = lines.isEmpty() ? start : lines.get(lines.size() - 1)[2];
        if (best == null && truncatedHead && head.length - lastEnd > HEAD_BYTES / 2) {
            throw new CaptureFormatException(file, lines.size() + 1, "line is longer than " + (head.length - lastEnd)
                    + " bytes; expected a header of at most " + MAX_COLUMNS + " columns");
        }
        if (best == null) {
            String seps = sepOption.equals("auto") ? "',', ';' or tab" : "'" + printable(sepOption) + "'";
            throw new CaptureFormatException(file, 0, "found no rows of numbers separated by " + seps
                    + " in the first " + Math.min(lines.size(), MAX_LEAD_LINES) + " lines; expected an optional header line followed by numeric rows"
                    + " (check the 'separator' and 'decimalComma' options)");
        }
        l.separator = best[0];
        l.decimalComma = best[1] == 1;
        l.dataOffset = lines.get(bestData)[0];
        l.dataLine = bestData + 1;
        List<String> data0 = fields(head, lines.get(bestData), l.separator);
        l.fieldCount = data0.size();
        if (l.fieldCount > MAX_COLUMNS) {
            throw new CaptureFormatException(file, l.dataLine, "more than " + MAX_COLUMNS + " columns; at most "
                    + MAX_COLUMNS + " are supported");
        }
        // header, and an optional units line between header and data
        refuseBadLeadRow(file, head, lines, bestData, l.separator, l.decimalComma, np);
        int h = prevNonBlank(head, lines, bestData);
        List<String> names = null;
        String[] lineUnits = null;
        if (h >= 0) {
            List<String> hf = fields(head, lines.get(h), l.separator);
            if (headerFits(hf, data0)) {
                if (hf.size() < l.fieldCount) {
                    hf = new ArrayList<>(hf);
                    hf.add(""); // the rows end with a separator, the header does not
                } else if (hf.size() > l.fieldCount) {
                    hf = hf.subList(0, l.fieldCount); // the header ends with a separator, the rows do not
                }
                if (allUnits(hf)) {
                    int h2 = prevNonBlank(head, lines, h);
                    if (h2 >= 0 && fields(head, lines.get(h2), l.separator).size() == l.fieldCount) {
                        lineUnits = hf.stream().map(CsvLayout::stripBrackets).toArray(String[]::new);
                        h = h2;
                        hf = fields(head, lines.get(h), l.separator);
                    }
                }
                names = hf;
                int[] ln = lines.get(h);
                l.headerBytes = java.util.Arrays.copyOfRange(head, ln[0], trimEnd(head, ln[0], ln[1]));
            }
        }
        int n = l.fieldCount;
        String[] nm = new String[n];
        String[] un = new String[n];
        for (int j = 0; j < n; j++) {
            String raw = names == null ? "" : unquote(names.get(j).trim());
            String unit = lineUnits == null ? "" : lineUnits[j];
            Matcher m = UNIT.matcher(raw);
            if (m.matches() && !m.group(1).isBlank()) {
                raw = m.group(1).trim();
                unit = m.group(2).trim();
            } else if (unit.isEmpty() && raw.contains(" ")) {
                String last = raw.substring(raw.lastIndexOf(' ') + 1);
                if (isVoltUnit(last) || timeScaleOf(last) > 0) {
                    unit = last;
                    raw = raw.substring(0, raw.lastIndexOf(' ')).trim();
                }
            }
            nm[j] = raw;
            un[j] = unit;
        }
        if (names != null) {
            for (int j = 0; j < n; j++) {
                boolean timeUnit = timeScaleOf(un[j]) > 0;
                if (TIME_NAME.matcher(nm[j]).matches() && !un[j].isEmpty() && !timeUnit) {
                    throw new CaptureFormatException(file, h + 1, "column " + (j + 1) + " ('" + org.lanesift.plugin.Echo.of(nm[j])
                            + "'): unknown time unit '" + org.lanesift.plugin.Echo.of(un[j]) + "'; expected " + TIME_UNITS);
                }
                if (TIME_NAME.matcher(nm[j]).matches() || (timeUnit && !nm[j].isEmpty())) {
                    l.timeKind = TimeKind.SECONDS;
                    l.timeColumn = j;
                    l.timeScale = timeUnit ? timeScaleOf(un[j]) : 1;
                    l.timeUnit = un[j].isEmpty() ? "s" : un[j];
                    break;
                }
                if (INDEX_NAME.matcher(nm[j]).matches()) {
                    l.timeKind = TimeKind.INDEX;
                    l.timeColumn = j;
                    break;
                }
            }
        }
        List<Integer> cols = new ArrayList<>();
        for (int j = 0; j < n; j++) {
            if (j == l.timeColumn) {
                continue;
            }
            if (j == n - 1 && names != null && nm[j].isEmpty() && n > 1) {
                continue; // trailing separator on every line
            }
            cols.add(j);
        }
        if (cols.isEmpty()) {
            throw new CaptureFormatException(file, h >= 0 ? h + 1 : l.dataLine, "no channel columns besides the "
                    + (l.timeKind == TimeKind.INDEX ? "sample index" : "time") + " column; expected at least one");
        }
        l.channelColumns = cols.stream().mapToInt(Integer::intValue).toArray();
        int c = l.channelColumns.length;
        l.channelNames = new String[c];
        l.units = new String[c];
        l.fileUnits = new String[c];
        l.scales = new double[c];
        List<String> raws = new ArrayList<>();
        for (int k = 0; k < c; k++) {
            int j = l.channelColumns[k];
            if (!un[j].isEmpty() && !isVoltUnit(un[j])) {
                throw new CaptureFormatException(file, h + 1, "column " + (j + 1) + " ('" + org.lanesift.plugin.Echo.of(nm[j])
                        + "'): unknown unit '" + org.lanesift.plugin.Echo.of(un[j]) + "'; expected " + VOLT_UNITS
                        + " (a column without a unit is taken as volts)");
            }
            l.channelNames[k] = nm[j].isEmpty() ? "ch" + (j + 1) : nm[j];
            l.units[k] = un[j].isEmpty() || isVoltUnit(un[j]) ? "V" : un[j]; // volt units are scaled to volts
            l.fileUnits[k] = un[j].isEmpty() ? "no unit in the file" : un[j] + " in the file";
            l.scales[k] = voltScale(un[j]);
            raws.add(nm[j].isEmpty() ? "ch" + (j + 1) : nm[j]);
        }
        l.ports = Names.ports(raws).toArray(String[]::new);
        // estimate row size and time step from the head rows
        int rows = 0;
        double firstT = Double.NaN;
        double lastT = Double.NaN;
        double firstStep = Double.NaN;
        int steady = 0;           // rows after the first whose spacing stays within half of the first spacing
        double steadyT = Double.NaN;
        boolean broken = false;
        long bytes = 0;
        for (int i = bestData; i < lines.size() && rows < 2_000; i++) {
            int[] ln = lines.get(i);
            if (allBlank(head, ln[0], ln[1])) {
                continue;
            }
            List<String> f = fields(head, ln, l.separator);
            if (f.size() != n) {
                break;
            }
            if (l.timeColumn >= 0) {
                byte[] cell = unquote(f.get(l.timeColumn).trim()).getBytes(StandardCharsets.ISO_8859_1);
                double t = np.parse(cell, 0, cell.length, l.decimalComma);
                if (!np.ok) {
                    break;
                }
                if (rows == 0) {
                    firstT = t;
                } else if (!(t > lastT)) {
                    break; // the reader reports it with its line
                } else if (rows == 1) {
                    firstStep = t - firstT;
                    steady = 1;
                    steadyT = t;
                } else if (!broken && Math.abs(t - lastT - firstStep) <= 0.5 * firstStep) {
                    steady = rows;
                    steadyT = t;
                } else {
                    broken = true; // a gap: the reader reports it with its line
                }
                lastT = t;
            }
            bytes += ln[2] - ln[0];
            rows++;
        }
        l.headRows = rows;
        l.headRowBytes = rows == 0 ? 1 : (double) bytes / rows;
        if (l.timeKind == TimeKind.SECONDS) {
            l.headFirstTime = firstT * l.timeScale;
            l.headStep = steady >= 1 ? (steadyT - firstT) * l.timeScale / steady : Double.NaN;
        } else if (l.timeKind == TimeKind.INDEX) {
            l.headFirstIndex = firstT;
        }
        return l;
    }

    /**
     * A header fits the data rows if it has as many cells, or one fewer when the data row's last
     * cell is empty (a separator at the end of the rows only), or one more when its own last cell is
     * empty (a separator at the end of the header only).
     */
    private static boolean headerFits(List<String> header, List<String> row) {
        return header.size() == row.size() || header.size() == row.size() - 1 && row.get(row.size() - 1).isBlank()
                || header.size() == row.size() + 1 && header.get(header.size() - 1).isBlank();
    }

    /**
     * The lines just before the first data row are taken as the header; if they are data rows with
     * a bad cell (a number first, most cells numbers), that cell is reported with its line instead of
     * the file being read as one without a time column. Walks back over such rows and reports the
     * first bad cell from the earliest on.
     */
    private static void refuseBadLeadRow(Path file, byte[] head, List<int[]> lines, int data, byte sep, boolean dc,
            NumberParser np) {
        int n = fields(head, lines.get(data), sep).size();
        int bad = -1;
        for (int h = prevNonBlank(head, lines, data); h >= 0; h = prevNonBlank(head, lines, h)) {
            List<String> f = fields(head, lines.get(h), sep);
            int before = prevNonBlank(head, lines, h);
            boolean underHeader = before >= 0 && fields(head, lines.get(before), sep).size() == f.size();
            if (f.size() != n || !looksLikeData(f, dc, np, underHeader)) {
                break;
            }
            bad = h;
        }
        for (int i = bad; i >= 0 && i < data; i++) {
            if (allBlank(head, lines.get(i)[0], lines.get(i)[1])) {
                continue;
            }
            List<String> f = fields(head, lines.get(i), sep);
            for (int j = 0; j < f.size(); j++) {
                String cell = unquote(f.get(j).trim());
                if (!isNumber(cell, dc, np) && !(j == f.size() - 1 && cell.isEmpty())) {
                    throw new CaptureFormatException(file, i + 1, "column " + (j + 1) + ": expected a number"
                            + (dc ? " with a decimal comma" : "") + ", found '" + org.lanesift.plugin.Echo.of(cell)
                            + "' (the rows after it are numbers)");
                }
            }
        }
    }

    /** A row is data, not a header, if most cells are numbers and the first is one (or a header line sits above it). */
    private static boolean looksLikeData(List<String> f, boolean dc, NumberParser np, boolean underHeader) {
        int numbers = 0;
        for (String c : f) {
            if (isNumber(unquote(c.trim()), dc, np)) {
                numbers++;
            }
        }
        boolean firstIsNumber = isNumber(unquote(f.get(0).trim()), dc, np);
        return numbers > 0 && numbers * 2 >= f.size() && (firstIsNumber || underHeader);
    }

    private static boolean isNumber(String cell, boolean dc, NumberParser np) {
        byte[] b = cell.getBytes(StandardCharsets.ISO_8859_1);
        np.parse(b, 0, b.length, dc);
        return np.ok && !cell.isEmpty();
    }

    long estimatedRows() {
        return Math.max(1, Math.round((fileSize - dataOffset) / Math.max(1.0, headRowBytes)));
    }

    private static int trimEnd(byte[] b, int from, int to) {
        return trimEnd(b, from, to, (byte) 0);
    }

    /** Trims spaces and line ends, and tabs unless the tab is the separator (then a trailing tab ends an empty cell). */
    private static int trimEnd(byte[] b, int from, int to, byte sep) {
        while (to > from && (b[to - 1] == ' ' || b[to - 1] == '\t' && sep != '\t' || b[to - 1] == '\r')) {
            to--;
        }
        return to;
    }

    static String unquote(String s) {
        return s.length() >= 2 && s.charAt(0) == '"' && s.charAt(s.length() - 1) == '"' ? s.substring(1, s.length() - 1).trim() : s;
    }

    private static String stripBrackets(String s) {
        s = unquote(s.trim());
        if (s.length() >= 2 && (s.charAt(0) == '(' || s.charAt(0) == '[')) {
            s = s.substring(1, s.length() - 1).trim();
        }
        return s;
    }

    private static boolean allUnits(List<String> f) {
        for (String s : f) {
            String u = stripBrackets(s);
            if (!(isVoltUnit(u) || timeScaleOf(u) > 0 || u.isEmpty())) {
                return false;
            }
        }
        return true;
    }

    /** What a channel's unit may be, for messages. */
    static final String VOLT_UNITS = "V, mV, uV (or with the micro sign) or kV";
    /** What the time column's unit may be, for messages. */
    static final String TIME_UNITS = "s, ms, us (or with the micro sign), ns, ps or min";

    static boolean isVoltUnit(String u) {
        return !Double.isNaN(voltScaleOrNaN(u));
    }

    /**
     * Volts per unit of a channel column: V with an SI prefix (micro as u, U+00B5 or U+03BC; the
     * one prefix table, host-api {@link org.lanesift.unit.Quantity}), a lower-case v accepted.
     *
     * @return the scale, 1 for no unit or an unknown one (refused by {@link #sniff} before it is used)
     */
    static double voltScale(String u) {
        double k = voltScaleOrNaN(u);
        return Double.isNaN(k) ? 1 : k;
    }

    private static double voltScaleOrNaN(String u) {
        String s = u.trim();
        switch (s) {
            case "volt": case "volts": case "Volt": case "Volts": return 1;
            default: break;
        }
        if (s.endsWith("v")) {
            s = s.substring(0, s.length() - 1) + "V";
        }
        if (s.length() == 2 && s.charAt(0) == 'M') {
            return Double.NaN; // "MV" is written by no instrument for megavolts; more likely a typo of mV
        }
        return s.endsWith("V") ? org.lanesift.unit.Quantity.scaleOf(s, "V") : Double.NaN;
    }

    /**
     * Seconds per unit of a time column: s with an SI prefix (micro as u, U+00B5 or U+03BC), or min.
     *
     * @return the scale, or -1 for an unknown unit
     */
    static double timeScaleOf(String u) {
        String s = u.trim();
        switch (s) {
            case "S": case "sec": case "Sec": case "seconds": case "Seconds": return 1;
            case "min": return 60;
            default: break;
        }
        if (s.length() > 2 || s.isEmpty() || (s.length() == 2 && "munpf\u00b5\u03bc".indexOf(s.charAt(0)) < 0)) {
            return -1; // only s and its small prefixes: "Ms" or "ks" is no time axis anyone writes
        }
        double k = org.lanesift.unit.Quantity.scaleOf(s, "s");
        return Double.isNaN(k) ? -1 : k;
    }

    private static byte[] sepChoices(String opt) {
        switch (opt) {
            case "auto": return new byte[] {'\t', ';', ','};
            case ",": return new byte[] {','};
            case ";": return new byte[] {';'};
            default: return new byte[] {'\t'};
        }
    }

    private static boolean[] dcChoices(String opt, byte sep) {
        switch (opt) {
            case "true": return new boolean[] {true};
            case "false": return new boolean[] {false};
            default: return sep == ',' ? new boolean[] {false} : new boolean[] {false, true};
        }
    }

    private static String printable(String s) {
        return s.equals("\t") ? "tab" : s;
    }

    private static boolean allBlank(byte[] b, int from, int to) {
        for (int i = from; i < to; i++) {
            if (b[i] != ' ' && b[i] != '\t' && b[i] != '\r' && b[i] != '\n') {
                return false;
            }
        }
        return true;
    }

    private static int prevNonBlank(byte[] head, List<int[]> lines, int i) {
        for (int k = i - 1; k >= 0; k--) {
            int[] ln = lines.get(k);
            if (!allBlank(head, ln[0], ln[1])) {
                return k;
            }
        }
        return -1;
    }

    private static int firstDataLine(byte[] head, List<int[]> lines, byte sep, boolean dc, NumberParser np) {
        int prevNumeric = -1;
        int prevCount = -1;
        for (int i = 0, n = Math.min(lines.size(), MAX_LEAD_LINES); i < n; i++) {
            int[] ln = lines.get(i);
            if (allBlank(head, ln[0], ln[1])) {
                continue;
            }
            int count = numericFields(head, ln, sep, dc, np);
            if (count > 0 && prevNumeric >= 0 && count == prevCount) {
                return prevNumeric;
            }
            if (count > 0 && prevNumeric < 0) {
                prevNumeric = i;
                prevCount = count;
            } else if (count > 0) {
                prevNumeric = i;
                prevCount = count;
            } else {
                prevNumeric = -1;
            }
        }
        // a single data row at the end of a short file
        return prevNumeric;
    }

    /** Number of fields if every field is a number (an empty last field is allowed), else -1. */
    private static int numericFields(byte[] b, int[] ln, byte sep, boolean dc, NumberParser np) {
        int from = ln[0];
        int count = 0;
        int end = trimEnd(b, ln[0], ln[1], sep);
        for (int k = ln[0]; k <= end; k++) {
            if (k == end || b[k] == sep) {
                int s = from;
                int e = k;
                if (e - s >= 2 && b[s] == '"' && b[e - 1] == '"') {
                    s++;
                    e--;
                }
                np.parse(b, s, e, dc);
                boolean emptyLast = k == end && s == e && count > 0;
                if (!np.ok && !emptyLast) {
                    return -1;
                }
                count++;
                from = k + 1;
            }
        }
        return count;
    }

    private static List<String> fields(byte[] b, int[] ln, byte sep) {
        List<String> out = new ArrayList<>();
        int from = ln[0];
        int end = trimEnd(b, ln[0], ln[1], sep);
        for (int k = ln[0]; k <= end; k++) {
            if (k == end || b[k] == sep) {
                out.add(text(b, from, k - from));
                from = k + 1;
                if (out.size() > MAX_COLUMNS) {
                    break; // callers report the excess
                }
            }
        }
        return out;
    }

    /**
     * A header field as text: UTF-8, or Latin-1 when the bytes are not UTF-8 (so the micro sign
     * some tools write as the single byte 0xB5 reads as U+00B5, not as a replacement character).
     */
    static String text(byte[] b, int from, int len) {
        try {
            return StandardCharsets.UTF_8.newDecoder().onMalformedInput(java.nio.charset.CodingErrorAction.REPORT)
                    .onUnmappableCharacter(java.nio.charset.CodingErrorAction.REPORT)
                    .decode(java.nio.ByteBuffer.wrap(b, from, len)).toString();
        } catch (java.nio.charset.CharacterCodingException e) {
            return new String(b, from, len, StandardCharsets.ISO_8859_1);
        }
    }
}
