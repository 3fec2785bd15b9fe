package org.lanesift.viewer;

import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.lanesift.annotation.Annotation;
import org.lanesift.annotation.Field;
import org.lanesift.annotation.Severity;
import org.lanesift.data.Frame;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.InputFormatException;
import org.lanesift.plugin.PluginRegistry;

/**
 * Reads back what a run wrote (docs/outputs.md): {@code signals.vcd} through the vcd reader
 * plugin (the decoded logic rows), {@code annotations.jsonl} (docs/annotations-jsonl.md) for the
 * note rows and findings, {@code *-frame-NNNN[-partial].png} as decoded frames and every other
 * PNG as an analysis picture.
 */
public final class OutputFolder {
    private static final Pattern FRAME = Pattern.compile(".*-frame-(\\d+)(-partial)?\\.png");
    private static final int MAX_LINE_CHARS = 1 << 20;

    private OutputFolder() {
    }

    /**
     * Loads a folder.
     *
     * @param registry where the vcd reader is found
     * @param dir      the run's output folder
     * @return the model
     * @throws InputFormatException naming the folder or the file and line that is bad
     */
    public static ViewModel load(PluginRegistry registry, Path dir) {
        if (!Files.isDirectory(dir)) {
            throw new InputFormatException(dir + ": not a folder (expected a run's output folder)");
        }
        Collector into = new Collector();
        Path vcd = dir.resolve("signals.vcd");
        Path notes = dir.resolve("annotations.jsonl");
        if (!Files.exists(vcd) && !Files.exists(notes)) {
            throw new InputFormatException(dir + ": neither signals.vcd nor annotations.jsonl here (expected a run's output folder)");
        }
        if (Files.exists(vcd)) {
            new RunJob(registry, Sources.captureOnly(vcd)).gather(into, (d, t) -> { });
        }
        if (Files.exists(notes)) {
            readNotes(notes, into);
        }
        List<Path> pngs = new ArrayList<>();
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir, "*.png")) {
            ds.forEach(pngs::add);
        } catch (IOException e) {
            throw new InputFormatException(dir + ": cannot list: " + e.getMessage(), e);
        }
        pngs.sort(null);
        for (Path p : pngs) {
            byte[] bytes;
            try {
                bytes = Files.readAllBytes(p);
            } catch (IOException e) {
                throw new InputFormatException(p + ": cannot read: " + e.getMessage(), e);
            }
            Matcher m = FRAME.matcher(p.getFileName().toString());
            if (m.matches()) {
                into.picture(p.getFileName().toString(), bytes);
                into.framePicture(p.getFileName().toString(), Long.parseLong(m.group(1)), m.group(2) != null);
            } else {
                into.picture(p.getFileName().toString(), bytes);
            }
        }
        return into.build();
    }

    private static void readNotes(Path file, Collector into) {
        try (BufferedReader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            String line;
            int n = 0;
            while ((line = r.readLine()) != null) {
                n++;
                if (line.isBlank()) {
                    continue;
                }
                if (line.length() > MAX_LINE_CHARS) {
                    throw new InputFormatException(file + ": line " + n + ": longer than " + MAX_LINE_CHARS + " characters");
                }
                into.note(annotation(file, n, line));
            }
        } catch (IOException e) {
            throw new InputFormatException(file + ": cannot read: " + e.getMessage(), e);
        }
    }

    /**
     * One line of annotations.jsonl.
     *
     * @param file  for messages
     * @param line  line number, for messages
     * @param text  the line
     * @return the annotation
     * @throws InputFormatException naming the file, line and key when the line is not one
     */
    static Annotation annotation(Path file, int line, String text) {
        String where = file + ": line " + line;
        JsonValue o;
        try {
            o = JsonReader.parse(where, text);
        } catch (JsonParseException e) {
            throw new InputFormatException(e.getMessage(), e);
        }
        if (!o.isObject()) {
            throw new InputFormatException(where + ": expected a JSON object (an annotation)");
        }
        long start = integer(o, "start_fs", where);
        long end = integer(o, "end_fs", where);
        Severity sev;
        try {
            sev = Severity.valueOf(text(o, "severity", where).toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new InputFormatException(where + ": \"severity\" must be info, warning or error", e);
        }
        Map<String, Field> fields = new LinkedHashMap<>();
        JsonValue fs = o.get("fields");
        if (fs != null && fs.isObject()) {
            fs.members().forEach((k, v) -> fields.put(k, field(v, where + ": field \"" + k + "\"")));
        }
        try {
            return new Annotation(start, end, text(o, "track", where), text(o, "kind", where), text(o, "label", where), sev, fields);
        } catch (IllegalArgumentException e) {
            throw new InputFormatException(where + ": " + e.getMessage(), e);
        }
    }

    private static Field field(JsonValue v, String where) {
        JsonValue type = v.isObject() ? v.get("type") : null;
        JsonValue value = v.isObject() ? v.get("value") : null;
        if (type == null || !type.isString() || value == null) {
            throw new InputFormatException(where + ": expected an object with \"type\" and \"value\"");
        }
        JsonValue unit = v.get("unit");
        return switch (type.asString()) {
            case "number" -> Field.number(value.isNumber() ? value.asDouble() : Double.NaN, unit != null && unit.isString() ? unit.asString() : "");
            case "text" -> Field.text(value.isString() ? value.asString() : value.toString());
            case "enum" -> Field.enumValue(value.isString() ? value.asString() : value.toString());
            case "bytes" -> Field.bytes(hex(value.isString() ? value.asString() : "", where));
            default -> throw new InputFormatException(where + ": unknown type '" + type.asString() + "' (expected number, text, enum or bytes)");
        };
    }

    private static byte[] hex(String s, String where) {
        if (s.length() % 2 != 0 || !s.matches("[0-9a-f]*")) {
            throw new InputFormatException(where + ": expected lower-case hexadecimal, two digits a byte");
        }
        byte[] b = new byte[s.length() / 2];
        for (int i = 0; i < b.length; i++) {
            b[i] = (byte) Integer.parseInt(s.substring(2 * i, 2 * i + 2), 16);
        }
        return b;
    }

    private static long integer(JsonValue o, String key, String where) {
        JsonValue v = o.get(key);
        if (v == null || !v.isNumber() || v.asDouble() != Math.rint(v.asDouble())) {
            throw new InputFormatException(where + ": \"" + key + "\" must be an integer number of femtoseconds");
        }
        return (long) v.asDouble();
    }

    private static String text(JsonValue o, String key, String where) {
        JsonValue v = o.get(key);
        if (v == null || !v.isString()) {
            throw new InputFormatException(where + ": \"" + key + "\" must be a string");
        }
        return v.asString();
    }

    /** A frame read back from its PNG has no times in the file; it is placed at 0. */
    static Frame frameOf(String name, long index, boolean partial, java.awt.image.BufferedImage img) {
        int w = img.getWidth();
        int h = img.getHeight();
        return new Frame(name, 0, 0, index, w, h, img.getRGB(0, 0, w, h, null, 0, w), partial, false);
    }
}
