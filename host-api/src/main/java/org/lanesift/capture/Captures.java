package org.lanesift.capture;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Set;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;
import org.lanesift.plugin.InputException;
import org.lanesift.plugin.InputFiles;
import org.lanesift.plugin.InputFormatException;

/**
 * Chooses the source plugin for a capture file: by extension first ({@code .csv .tsv .txt} csv,
 * {@code .vcd} vcd, {@code .bin .raw .dat} raw), then by content (a file starting with a VCD
 * {@code $} keyword is vcd; a file with a {@code FILE.json} sidecar beside it is raw; text of
 * numbers and separators is csv). A raw file whose sidecar declares a packed logic format
 * ({@code logic8}, {@code logic16le}, {@code logic16be}) is packed-logic; a {@code .json} file of
 * format {@code lanesift-capture-set/1} is a capture set.
 */
public final class Captures {
    /** The {@code format} of a capture-set file. */
    public static final String SET_FORMAT = "lanesift-capture-set/1";
    /** The {@code format} values of a raw sidecar that make the file packed logic. */
    public static final Set<String> PACKED_FORMATS = Set.of("logic8", "logic16le", "logic16be");

    private Captures() {
    }

    /**
     * The plugin id that reads a file.
     *
     * @param file the capture
     * @return "csv", "vcd", "raw", "packed-logic" or "capture-set"
     * @throws InputFormatException when the file is missing or its kind cannot be told, naming the known extensions
     */
    public static String pluginFor(Path file) {
        String name = String.valueOf(file.getFileName()).toLowerCase(Locale.ROOT);
        if (!Files.exists(file)) {
            throw fault(file, "file not found");
        }
        if (name.endsWith(".csv") || name.endsWith(".tsv") || name.endsWith(".txt")) {
            return "csv";
        }
        if (name.endsWith(".vcd")) {
            return "vcd";
        }
        if (name.endsWith(".json") && SET_FORMAT.equals(declaredFormat(file))) {
            return "capture-set";
        }
        if (name.endsWith(".bin") || name.endsWith(".raw") || name.endsWith(".dat") || Files.exists(Path.of(file + ".json"))) {
            String format = declaredFormat(Path.of(file + ".json"));
            return format != null && PACKED_FORMATS.contains(format) ? "packed-logic" : "raw";
        }
        byte[] head;
        String notRegular = InputFiles.whyNotRegular(file);
        if (notRegular != null) {
            throw fault(file, notRegular);
        }
        try (InputStream in = Files.newInputStream(file)) {
            head = in.readNBytes(4096);
        } catch (NoSuchFileException e) {
            throw fault(file, "file not found");
        } catch (IOException e) {
            throw new InputFormatException(name(file) + ": cannot read: " + e.getMessage(), e);
        }
        int i = 0;
        while (i < head.length && (head[i] == ' ' || head[i] == '\t' || head[i] == '\r' || head[i] == '\n')) {
            i++;
        }
        if (i < head.length && head[i] == '$') {
            return "vcd";
        }
        boolean text = head.length > 0;
        boolean sep = false;
        for (byte b : head) {
            int c = b & 0xff;
            if (c < 0x20 && c != '\t' && c != '\r' && c != '\n') {
                text = false;
                break;
            }
            sep |= c == ',' || c == ';' || c == '\t';
        }
        if (text && sep) {
            return "csv";
        }
        throw fault(file, "cannot tell the capture format; known extensions: .csv .tsv .txt (csv),"
                + " .vcd (vcd), .bin .raw .dat (raw binary with a FILE.json sidecar)");
    }

    /**
     * The {@code format} member of a JSON file (a raw sidecar, a capture set), for telling capture
     * files apart.
     *
     * @param file a file
     * @return the member's text, or null when the file is missing, unreadable, not a JSON object or has no text format
     */
    public static String declaredFormat(Path file) {
        try {
            JsonValue root = JsonReader.read(file, name(file));
            JsonValue f = root.isObject() ? root.get("format") : null;
            return f != null && f.isString() ? f.asString() : null;
        } catch (IOException | JsonParseException | InputException e) {
            return null;
        }
    }

    /** The same message a capture reader gives: the file name, then what is wrong. */
    private static InputFormatException fault(Path file, String detail) {
        return new InputFormatException(name(file) + ": " + detail);
    }

    private static String name(Path file) {
        return String.valueOf(file.getFileName() == null ? file : file.getFileName());
    }
}
