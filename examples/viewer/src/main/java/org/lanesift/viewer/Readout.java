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
        return timeLine(cursorFs, markFs, Double.NaN);
    }

    /**
     * The cursor's time line, the time written to the given resolution.
     *
     * @param cursorFs     the cursor, femtoseconds
     * @param markFs       the reference mark, femtoseconds, or NaN when none is set
     * @param resolutionFs the smallest step worth showing (one pixel column), or NaN for four significant digits
     * @return one line
     */
    public static String timeLine(double cursorFs, double markFs, double resolutionFs) {
        String s = "t " + (Double.isNaN(resolutionFs) ? Femtos.format(cursorFs) : time(cursorFs, resolutionFs));
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
     * An absolute time in the engineering unit of its size, with as many decimals as a step needs,
     * so that ticks a step apart read differently however far the capture's origin is.
     *
     * @param tFs    the time, femtoseconds
     * @param stepFs the step to resolve, femtoseconds (positive)
     * @return for example {@code "290.2004 us"}
     */
    public static String time(double tFs, double stepFs) {
        double a = Math.abs(tFs);
        String[] names = {"fs", "ps", "ns", "us", "ms", "s"};
        double unit = 1;
        int k = 0;
        while (k < names.length - 1 && a >= unit * 1000) {
            unit *= 1000;
            k++;
        }
        int decimals = (int) Math.max(0, Math.min(12, Math.ceil(Math.log10(unit / stepFs) - 1e-9)));
        return String.format(Locale.ROOT, "%." + decimals + "f %s", tFs / unit, names[k]);
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
