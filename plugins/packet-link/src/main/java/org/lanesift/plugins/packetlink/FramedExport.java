package org.lanesift.plugins.packetlink;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Locale;
import java.util.function.Consumer;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.data.WordStream;
import org.lanesift.json.JsonWriter;
import org.lanesift.json.NumberStyle;

/**
 * Output side of the framed-link profile: emits merged words as a {@link WordStream}, one
 * {@code word-group} annotation per fixed-length group, and keeps the rows of
 * {@code <id>-words.csv} (format in {@code docs/framed-link.md}) up to a limit.
 */
final class FramedExport {
    /** Times in seconds, nine significant digits as in the JSON exports. */
    private static final NumberStyle TIME_S = NumberStyle.significant(9);

    private final String id;
    private final int wordBits;
    private final int maxRows;
    private final Consumer<WordStream> out;
    private final Consumer<Annotation> notes;
    private final StringBuilder csv = new StringBuilder(4096);
    private final StringBuilder units = new StringBuilder(4096);
    private long unitWords;
    private long unitCount;
    boolean unitsTruncated;
    long rows;
    long words;
    long groups;
    boolean truncated;

    FramedExport(String id, int wordBits, int maxRows, Consumer<WordStream> out, Consumer<Annotation> notes) {
        this.id = id;
        this.wordBits = wordBits;
        this.maxRows = maxRows;
        this.out = out;
        this.notes = notes;
        csv.append("index,time_s,lane,group,word_in_group,value_hex,flags\n");
    }

    /**
     * Emits words.
     *
     * @param v      values
     * @param s      start times
     * @param e      end times
     * @param lane   lanes
     * @param f      flags
     * @param n      count
     * @param group  group number, or -1 when words are not grouped
     */
    void words(long[] v, long[] s, long[] e, int[] lane, byte[] f, int n, long group) {
        if (n == 0) {
            return;
        }
        int hexDigits = (wordBits + 3) / 4;
        for (int i = 0; i < n; i++) {
            if (rows >= maxRows) {
                truncated = true;
                break;
            }
            csv.append(words + i).append(',').append(TIME_S.format(s[i] * 1e-15)).append(',').append(lane[i]).append(',')
                    .append(group < 0 ? "" : Long.toString(group)).append(',').append(group < 0 ? "" : Integer.toString(i)).append(',')
                    .append(String.format(Locale.ROOT, "%0" + hexDigits + "X", v[i])).append(',').append(f[i]).append('\n');
            rows++;
        }
        words += n;
        if (group >= 0) {
            unit("group", group, v, s, e, lane, f, n);
            groups++;
            StringBuilder hex = new StringBuilder();
            for (int i = 0; i < n && i < 64; i++) {
                if (i > 0) {
                    hex.append(' ');
                }
                hex.append(String.format(Locale.ROOT, "%0" + hexDigits + "X", v[i]));
            }
            notes.accept(Annotation.on("words", "word-group").span(s[0], Math.max(s[0], e[n - 1]))
                    .label("group " + group + ": " + n + " words").field("group", Field.integer(group, ""))
                    .field("words", Field.integer(n, "")).text("values", hex.toString() + (n > 64 ? " ..." : "")).build());
        }
        out.accept(new WordStream(id + ".words", s[0], Math.max(s[0], e[n - 1]), n, wordBits, Arrays.copyOf(v, n),
                Arrays.copyOf(s, n), Arrays.copyOf(e, n), Arrays.copyOf(lane, n), Arrays.copyOf(f, n)));
    }

    /**
     * Records one burst or group for {@code <id>-bursts.jsonl} (format in docs/framed-link.md):
     * its words in wire order, each with its lane and flags, so a replay tool can send it again.
     * Bounded by the same word limit as the CSV.
     */
    void unit(String kind, long index, long[] v, long[] s, long[] e, int[] lane, byte[] f, int n) {
        if (n == 0 || unitsTruncated) {
            return;
        }
        if (unitWords + n > maxRows) {
            unitsTruncated = true;
            return;
        }
        unitWords += n;
        int hexDigits = (wordBits + 3) / 4;
        JsonWriter j = JsonWriter.compact().numberStyle(TIME_S);
        j.beginObject().field("index", unitCount++).field("kind", kind).field(kind.equals("group") ? "group" : "burst", index)
                .field("startS", s[0] * 1e-15).field("endS", Math.max(s[0], e[n - 1]) * 1e-15).field("wordBits", wordBits)
                .field("count", n).name("words").beginArray();
        for (int i = 0; i < n; i++) {
            j.value(String.format(Locale.ROOT, "%0" + hexDigits + "X", v[i]));
        }
        j.endArray().name("lanes").beginArray();
        for (int i = 0; i < n; i++) {
            j.value(lane[i]);
        }
        j.endArray().name("flags").beginArray();
        for (int i = 0; i < n; i++) {
            j.value(f[i]);
        }
        j.endArray().endObject();
        units.append(j.finish()).append('\n');
    }

    byte[] unitsJsonl() {
        if (!unitsTruncated) {
            return units.toString().getBytes(StandardCharsets.UTF_8);
        }
        JsonWriter j = JsonWriter.compact();
        j.beginObject().field("kind", "export-full").field("maxWords", maxRows).endObject();
        return (units + j.finish() + "\n").getBytes(StandardCharsets.UTF_8);
    }

    byte[] csv() {
        return csv.toString().getBytes(StandardCharsets.UTF_8);
    }
}
