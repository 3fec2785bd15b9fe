package org.lanesift.time;

import java.util.Locale;
import org.lanesift.unit.Quantity;

/**
 * A time quantity as a user writes it in an option: a number and a unit, where the unit may be
 * absolute (fs, ps, ns, us, ms, s, min, h), in samples of the channel it applies to, or in unit intervals
 * (UI) of the link. Resolve it to femtoseconds with {@link #toFs(double, double)}.
 *
 * @param value the number as written
 * @param unit  its unit
 */
public record TimeValue(double value, Unit unit) {

    /** Units a time option may be written in. */
    public enum Unit {
        /** Femtoseconds. */
        FS("fs", 1),
        /** Picoseconds. */
        PS("ps", Femtos.PER_PS),
        /** Nanoseconds. */
        NS("ns", Femtos.PER_NS),
        /** Microseconds. */
        US("us", Femtos.PER_US),
        /** Milliseconds. */
        MS("ms", Femtos.PER_MS),
        /** Seconds. */
        S("s", Femtos.PER_S),
        /** Minutes. */
        MIN("min", 60 * Femtos.PER_S),
        /** Hours. */
        H("h", 3600 * Femtos.PER_S),
        /** Sample periods of the channel the value applies to. */
        SAMPLES("samples", 0),
        /** Unit intervals (bit times) of the link. */
        UI("UI", 0);

        private final String symbol;
        private final long fs;

        Unit(String symbol, long fs) {
            this.symbol = symbol;
            this.fs = fs;
        }

        /**
         * The symbol used when parsing and printing.
         *
         * @return for example {@code "ps"}
         */
        public String symbol() {
            return symbol;
        }
    }

    /**
     * Creates a time value.
     *
     * @param value the number, finite
     * @param unit  the unit, not null
     */
    public TimeValue {
        if (!Double.isFinite(value)) {
            throw new IllegalArgumentException("time value must be finite");
        }
        if (unit == null) {
            throw new IllegalArgumentException("time unit missing");
        }
    }

    /**
     * Parses text such as {@code "150ps"}, {@code "-1.5 ns"}, {@code "3 samples"}, {@code "0.25UI"}.
     * A bare number is taken in {@code defaultUnit}.
     *
     * @param text        the text
     * @param defaultUnit unit for a bare number
     * @return the parsed value
     * @throws IllegalArgumentException naming what was expected
     */
    public static TimeValue parse(String text, Unit defaultUnit) {
        String t = text == null ? "" : text.trim();
        int i = Quantity.numberLength(t);
        String num = t.substring(0, i).trim();
        String u = t.substring(i).trim().toLowerCase(Locale.ROOT);
        double v;
        try {
            v = Double.parseDouble(num);
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException("expected a time such as 150ps, 1.5ns, 3samples or 0.25UI, got '" + text + "'");
        }
        Unit unit;
        switch (u) {
            case "" -> unit = defaultUnit;
            case "sa", "sample", "samples" -> unit = Unit.SAMPLES;
            case "ui" -> unit = Unit.UI;
            case "m", "min" -> unit = Unit.MIN;
            case "h" -> unit = Unit.H;
            default -> {
                // absolute times share the SI prefix table of Quantity (micro as u, U+00B5 or U+03BC)
                unit = null;
                double scale = Quantity.scaleOf(u, "s");
                for (Unit c : Unit.values()) {
                    if (c.fs > 0 && c.fs < Unit.MIN.fs && Math.abs(c.fs - scale * Femtos.PER_S) < 0.5) {
                        unit = c;
                    }
                }
                if (unit == null) {
                    throw new IllegalArgumentException("unknown time unit '" + u + "' in '" + text
                            + "': expected fs, ps, ns, us, ms, s, min, h, samples or UI");
                }
            }
        }
        return new TimeValue(v, unit);
    }

    /**
     * Resolves the value to femtoseconds.
     *
     * @param samplePeriodFs period of the channel, used for {@link Unit#SAMPLES}
     * @param unitIntervalFs unit interval of the link, used for {@link Unit#UI}
     * @return femtoseconds (fractional)
     * @throws IllegalStateException if the unit needs a period that is not known (NaN or not positive)
     */
    public double toFs(double samplePeriodFs, double unitIntervalFs) {
        return switch (unit) {
            case SAMPLES -> {
                if (!(samplePeriodFs > 0)) {
                    throw new IllegalStateException("a time in samples needs the sample period, which is not known here");
                }
                yield value * samplePeriodFs;
            }
            case UI -> {
                if (!(unitIntervalFs > 0)) {
                    throw new IllegalStateException("a time in UI needs the unit interval, which is not known yet");
                }
                yield value * unitIntervalFs;
            }
            default -> value * unit.fs;
        };
    }

    @Override
    public String toString() {
        return (value == Math.rint(value) && Math.abs(value) < 1e15 ? Long.toString((long) value) : Double.toString(value))
                + unit.symbol;
    }
}
