package org.lanesift.viewer;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.lanesift.annotation.Annotation;
import org.lanesift.time.Femtos;

/**
 * What the time cursor reads: per row, the value at the cursor (volts interpolated between
 * samples, a logic level, or the label of the annotation under it), and the cursor's time with
 * its distance from the reference mark when one is set.
 */
public final class Readout {
    private Readout() {
    }

    /**
     * The cursor's time line: {@code "t 1.250 us"}, plus {@code "  dt 20.00 ns  1/dt 50.00 MHz"} with a mark.
     *
     * @param cursorFs the cursor, femtoseconds
     * @param markFs   the reference mark, femtoseconds, or NaN when none is set
     * @return one line
     */
    public static String timeLine(double cursorFs, double markFs) {
        String s = "t " + Femtos.format(cursorFs);
        if (!Double.isNaN(markFs)) {
            double d = cursorFs - markFs;
            s += "   dt " + Femtos.format(d);
            if (d != 0) {
                s += "   1/dt " + hertz(1e15 / Math.abs(d));
            }
        }
        return s;
    }

    /**
     * A frequency with an engineering prefix and four significant digits.
     *
     * @param hz frequency, hertz
     * @return for example {@code "50.00 MHz"}
     */
    static String hertz(double hz) {
        String[] p = {"Hz", "kHz", "MHz", "GHz", "THz"};
        int k = 0;
        double v = hz;
        while (Math.abs(v) >= 1000 && k < p.length - 1) {
            v /= 1000;
            k++;
        }
        return String.format(Locale.ROOT, "%.4g %s", v, p[k]);
    }

    /**
     * The value of one row at a time.
     *
     * @param row the row
     * @param tFs the time, femtoseconds
     * @return text such as {@code "0.3125 V"}, {@code "1"}, a label, or {@code "-"} where nothing is there
     */
    public static String valueOf(Row row, double tFs) {
        if (row.analog() != null) {
            double v = row.analog().valueAt(tFs);
            return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.4f V", v);
        }
        if (row.logic() != null) {
            LogicTrace l = row.logic();
            if (tFs < l.startFs() || tFs >= l.endFs()) {
                return "-";
            }
            return l.levelAt(tFs) ? "1" : "0";
        }
        NoteTrack t = row.notes();
        List<Annotation> notes = t.notes();
        for (int i = t.firstReaching(tFs); i < notes.size() && notes.get(i).startFs() <= tFs; i++) {
            Annotation a = notes.get(i);
            if (a.endFs() > tFs || a.endFs() == a.startFs() && a.startFs() == (long) tFs) {
                return a.label();
            }
        }
        return "-";
    }

    /**
     * Every row's value at a time, as {@code "name  value"} lines.
     *
     * @param rows the rows
     * @param tFs  the time, femtoseconds
     * @return one line a row
     */
    public static List<String> lines(List<Row> rows, double tFs) {
        List<String> out = new ArrayList<>();
        for (Row r : rows) {
            out.add(r.name() + "  " + valueOf(r, tFs));
        }
        return out;
    }
}
