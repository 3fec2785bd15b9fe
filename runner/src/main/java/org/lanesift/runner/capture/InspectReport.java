package org.lanesift.runner.capture;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.List;
import java.util.Locale;
import org.lanesift.time.Femtos;

/**
 * What {@link Inspector} found in a capture: per channel statistics, guessed differential pairs
 * and guessed clocks. {@link #toText()} is for people, {@link #toJson()} is the stable
 * machine-readable form documented in docs/capture-csv.md, section "inspect --json"
 * ({@code "schema": "lanesift-inspect/1"}).
 *
 * @param file     the file as given
 * @param format   reader plugin id: csv, vcd or raw
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
     * @param kind           ANALOG, EDGES or WORDS
     * @param unit           unit of the analog values ("V" for volts), null otherwise
     * @param samples        analog samples
     * @param invalidSamples analog samples marked invalid (missing, clipped)
     * @param words          words (vector value changes)
     * @param suspectWords   words with x or z bits
     * @param widthBits      vector width
     * @param edges          transitions: counted for EDGES, found at the automatic threshold for ANALOG
     * @param unknownS       seconds during which an EDGES channel was unknown (x, z, dump off)
     * @param durationS      seconds covered
     * @param sampleRateHz   analog sample rate
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
     * @param correlation Pearson coefficient, -1 to -0.8
     */
    public record Pair(String first, String second, double correlation) {
    }

    /**
     * A channel that looks like a clock.
     *
     * @param channel     port name
     * @param frequencyHz 1 / mean rising-edge interval
     * @param periodCv    coefficient of variation of the intervals
     */
    public record Clock(String channel, double frequencyHz, double periodCv) {
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
                    .append(String.format(Locale.ROOT, " (r = %.3f)", p.correlation()));
        }
        sb.append("\nclocks (guess): ");
        if (clocks.isEmpty()) {
            sb.append("none");
        }
        for (int i = 0; i < clocks.size(); i++) {
            Clock c = clocks.get(i);
            sb.append(i == 0 ? "" : ", ").append(c.channel()).append(' ').append(si(c.frequencyHz(), "Hz"))
                    .append(String.format(Locale.ROOT, " (period cv %.2f %%)", 100 * c.periodCv()));
        }
        sb.append('\n');
        return sb.toString();
    }

    /**
     * The documented JSON object (schema {@value #SCHEMA}); components that do not apply are left out.
     *
     * @return pretty-printed JSON
     */
    public String toJson() {
        ObjectMapper m = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
        ObjectNode root = m.createObjectNode();
        root.put("schema", SCHEMA);
        root.put("file", file);
        root.put("format", format);
        ArrayNode ch = root.putArray("channels");
        for (Channel c : channels) {
            ObjectNode o = ch.addObject();
            o.put("name", c.name());
            o.put("kind", c.kind());
            putIf(o, "unit", c.unit());
            putIf(o, "samples", c.samples());
            putIf(o, "invalidSamples", c.invalidSamples());
            putIf(o, "words", c.words());
            putIf(o, "suspectWords", c.suspectWords());
            putIf(o, "widthBits", c.widthBits());
            putIf(o, "edges", c.edges());
            putIf(o, "unknownS", c.unknownS());
            o.put("durationS", c.durationS());
            putIf(o, "sampleRateHz", c.sampleRateHz());
            putIf(o, "min", c.min());
            putIf(o, "max", c.max());
            putIf(o, "lowLevel", c.lowLevel());
            putIf(o, "highLevel", c.highLevel());
            putIf(o, "threshold", c.threshold());
            putIf(o, "hysteresis", c.hysteresis());
            putIf(o, "fundamentalHz", c.fundamentalHz());
            putIf(o, "periodCv", c.periodCv());
        }
        ArrayNode pr = root.putArray("differentialPairs");
        for (Pair p : pairs) {
            ObjectNode o = pr.addObject();
            o.put("first", p.first());
            o.put("second", p.second());
            o.put("correlation", p.correlation());
        }
        ArrayNode cl = root.putArray("clocks");
        for (Clock c : clocks) {
            ObjectNode o = cl.addObject();
            o.put("channel", c.channel());
            o.put("frequencyHz", c.frequencyHz());
            o.put("periodCv", c.periodCv());
        }
        try {
            return m.writeValueAsString(root) + "\n";
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("cannot write the inspect report as JSON", e);
        }
    }

    private static void putIf(ObjectNode o, String k, Object v) {
        if (v instanceof String s) {
            o.put(k, s);
        } else if (v instanceof Long l) {
            o.put(k, l);
        } else if (v instanceof Integer i) {
            o.put(k, i);
        } else if (v instanceof Double d) {
            if (Double.isFinite(d)) {
                o.put(k, d);
            }
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
