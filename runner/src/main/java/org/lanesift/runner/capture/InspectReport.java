package org.lanesift.runner.capture;

import java.util.List;
import java.util.Locale;
import org.lanesift.json.JsonWriter;
import org.lanesift.time.Femtos;

/**
 * What {@link Inspector} found in a capture: per channel statistics, guessed differential pairs
 * and guessed clocks. {@link #toText()} is for people, {@link #toJson()} is the stable
 * machine-readable form documented in docs/capture-csv.md, section "inspect --json"
 * ({@code "schema": "lanesift-inspect/1"}).
 *
 * @param file     the file as given
 * @param format   reader plugin id: csv, vcd, raw or packed-logic
 * @param channels one entry per channel, in port order
 * @param pairs    guessed differential pairs, strongest anti-correlation first
 * @param clocks   channels whose rising edges come at a regular period
 */
public record InspectReport(String file, String format, List<Channel> channels, List<Pair> pairs, List<Clock> clocks) {

    /** Schema name and version written into the JSON form. */
    public static final String SCHEMA = "lanesift-inspect/1";

    /** Copies the lists. */
    public InspectReport {
        channels = List.copyOf(channels);
        pairs = List.copyOf(pairs);
        clocks = List.copyOf(clocks);
    }

    /**
     * One channel's summary; a null component does not apply to the channel's kind.
     *
     * @param name           port name
     * @param kind           ANALOG, LOGIC, EDGES or WORDS
     * @param unit           unit of the analog values ("V" for volts), null otherwise
     * @param samples        analog or logic samples
     * @param invalidSamples analog samples marked invalid (missing, clipped)
     * @param words          words (vector value changes)
     * @param suspectWords   words with x or z bits
     * @param widthBits      vector width
     * @param edges          transitions: counted for EDGES and LOGIC, found at the automatic threshold for ANALOG
     * @param unknownS       seconds during which an EDGES channel was unknown (x, z, dump off)
     * @param durationS      seconds covered
     * @param sampleRateHz   analog or logic sample rate
     * @param min            smallest valid analog value
     * @param max            largest valid analog value
     * @param lowLevel       lower level (the shared two-level finder)
     * @param highLevel      upper dominant level
     * @param threshold      automatic threshold, the midpoint of the two levels
     * @param hysteresis     hysteresis either side of the threshold
     * @param fundamentalHz  1 / mean interval between rising edges
     * @param periodCv       coefficient of variation of the rising-edge intervals
     */
    public record Channel(String name, String kind, String unit, Long samples, Long invalidSamples, Long words,
                          Long suspectWords, Integer widthBits, Long edges, Double unknownS, double durationS,
                          Double sampleRateHz, Double min, Double max, Double lowLevel, Double highLevel, Double threshold,
                          Double hysteresis, Double fundamentalHz, Double periodCv) {
    }

    /**
     * Two analog channels that move against each other.
     *
     * @param first       one leg
     * @param second      the other leg
     * @param correlation     Pearson coefficient of the levels, -1 to 1
     * @param stepCorrelation Pearson coefficient of the sample-to-sample steps (about zero mean), -1 to 1
     */
    public record Pair(String first, String second, double correlation, double stepCorrelation) {
    }

    /**
     * A channel that looks like a clock.
     *
     * @param channel     port name
     * @param frequencyHz 1 / mean rising-edge interval
     * @param periodCv    coefficient of variation of the intervals
     * @param otherLeg    the other leg when the clock is a differential pair (listed once per pair), or null
     */
    public record Clock(String channel, double frequencyHz, double periodCv, String otherLeg) {
    }

    /**
     * A short table for a terminal.
     *
     * @return lines ending with '\n'
     */
    public String toText() {
        StringBuilder sb = new StringBuilder();
        sb.append(file).append(" (").append(format).append("): ").append(channels.size())
                .append(channels.size() == 1 ? " channel" : " channels").append('\n');
        for (Channel c : channels) {
            sb.append("  ").append(c.name()).append("  ").append(c.kind());
            if (c.samples() != null) {
                sb.append("  ").append(c.samples()).append(" samples");
                if (c.invalidSamples() != null && c.invalidSamples() > 0) {
                    sb.append(" (").append(c.invalidSamples()).append(" invalid)");
                }
                if (c.sampleRateHz() != null) {
                    sb.append(" at ").append(si(c.sampleRateHz(), "S/s"));
                }
            }
            if (c.words() != null) {
                sb.append("  ").append(c.words()).append(" words of ").append(c.widthBits()).append(" bits");
                if (c.suspectWords() > 0) {
                    sb.append(" (").append(c.suspectWords()).append(" with x/z)");
                }
            }
            sb.append("  ").append(Femtos.format(c.durationS() * 1e15));
            if (c.min() != null) {
                String u = c.unit() == null ? "" : c.unit();
                sb.append("\n      min ").append(num(c.min(), u)).append("  max ").append(num(c.max(), u))
                        .append("  levels ").append(num(c.lowLevel(), u)).append(" / ").append(num(c.highLevel(), u))
                        .append("  threshold ").append(num(c.threshold(), u)).append(" +/- ").append(num(c.hysteresis(), u));
            }
            if (c.edges() != null) {
                sb.append(c.min() != null ? "\n      " : "  ").append(c.edges()).append(c.edges() == 1 ? " edge" : " edges");
                if (c.min() != null) {
                    sb.append(" at the threshold");
                }
            }
            if (c.unknownS() != null && c.unknownS() > 0) {
                sb.append(", unknown for ").append(Femtos.format(c.unknownS() * 1e15));
            }
            if (c.fundamentalHz() != null) {
                sb.append(", fundamental ").append(si(c.fundamentalHz(), "Hz"));
            }
            sb.append('\n');
        }
        sb.append("differential pairs (guess): ");
        if (pairs.isEmpty()) {
            sb.append("none");
        }
        for (int i = 0; i < pairs.size(); i++) {
            Pair p = pairs.get(i);
            sb.append(i == 0 ? "" : ", ").append(p.first()).append(" & ").append(p.second())
                    .append(String.format(Locale.ROOT, " (r = %.3f, steps r = %.3f)", p.correlation(), p.stepCorrelation()));
        }
        sb.append("\nclocks (guess): ");
        if (clocks.isEmpty()) {
            sb.append("none");
        }
        for (int i = 0; i < clocks.size(); i++) {
            Clock c = clocks.get(i);
            sb.append(i == 0 ? "" : ", ").append(c.channel()).append(c.otherLeg() == null ? "" : " & " + c.otherLeg())
                    .append(' ').append(si(c.frequencyHz(), "Hz"))
                    .append(String.format(Locale.ROOT, " (period cv %.2f %%)", 100 * c.periodCv()));
        }
        sb.append('\n');
        sb.append("next: ").append(NextCommand.suggest(this)).append('\n');
        return sb.toString();
    }

    /**
     * The documented JSON object (schema {@value #SCHEMA}); components that do not apply are left out.
     *
     * @return pretty-printed JSON
     */
    public String toJson() {
        JsonWriter w = JsonWriter.pretty().nonFiniteAsNull().beginObject();
        w.field("schema", SCHEMA).field("file", file).field("format", format);
        w.name("channels").beginArray();
        for (Channel c : channels) {
            w.beginObject();
            w.field("name", c.name());
            w.field("kind", c.kind());
            putIf(w, "unit", c.unit());
            putIf(w, "samples", c.samples());
            putIf(w, "invalidSamples", c.invalidSamples());
            putIf(w, "words", c.words());
            putIf(w, "suspectWords", c.suspectWords());
            putIf(w, "widthBits", c.widthBits());
            putIf(w, "edges", c.edges());
            putIf(w, "unknownS", c.unknownS());
            w.field("durationS", c.durationS());
            putIf(w, "sampleRateHz", c.sampleRateHz());
            putIf(w, "min", c.min());
            putIf(w, "max", c.max());
            putIf(w, "lowLevel", c.lowLevel());
            putIf(w, "highLevel", c.highLevel());
            putIf(w, "threshold", c.threshold());
            putIf(w, "hysteresis", c.hysteresis());
            putIf(w, "fundamentalHz", c.fundamentalHz());
            putIf(w, "periodCv", c.periodCv());
            w.endObject();
        }
        w.endArray();
        w.name("differentialPairs").beginArray();
        for (Pair p : pairs) {
            w.beginObject().field("first", p.first()).field("second", p.second()).field("correlation", p.correlation())
                    .field("stepCorrelation", p.stepCorrelation()).endObject();
        }
        w.endArray();
        w.name("clocks").beginArray();
        for (Clock c : clocks) {
            w.beginObject().field("channel", c.channel());
            putIf(w, "otherLeg", c.otherLeg());
            w.field("frequencyHz", c.frequencyHz()).field("periodCv", c.periodCv()).endObject();
        }
        w.endArray();
        w.field("next", NextCommand.suggest(this));
        return w.endObject().finish() + "\n";
    }

    /** Writes a member only when the value is there (a null or non-finite value is left out). */
    private static void putIf(JsonWriter w, String k, Object v) {
        if (v instanceof String s) {
            w.field(k, s);
        } else if (v instanceof Long l) {
            w.field(k, l);
        } else if (v instanceof Integer i) {
            w.field(k, i);
        } else if (v instanceof Double d && Double.isFinite(d)) {
            w.field(k, d);
        }
    }

    private static String num(double v, String unit) {
        return String.format(Locale.ROOT, "%.4g", v) + (unit.isEmpty() ? "" : " " + unit);
    }

    private static String si(double v, String unit) {
        String[] p = {"", "k", "M", "G", "T"};
        int i = 0;
        double a = Math.abs(v);
        while (a >= 1000 && i < p.length - 1) {
            a /= 1000;
            v /= 1000;
            i++;
        }
        return String.format(Locale.ROOT, "%.4g %s%s", v, p[i], unit);
    }
}
