package org.lanesift.capture;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Locale;
import org.lanesift.plugin.InputFiles;
import org.lanesift.plugin.InputFormatException;

/**
 * Chooses the source plugin for a capture file: by extension first ({@code .csv .tsv .txt} csv,
 * {@code .vcd} vcd, {@code .bin .raw .dat} raw), then by content (a file starting with a VCD
 * {@code $} keyword is vcd; a file with a {@code FILE.json} sidecar beside it is raw; text of
 * numbers and separators is csv).
 */
public final class Captures {
    private Captures() {
    }

    /**
     * The plugin id that reads a file.
     *
     * @param file the capture
     * @return "csv", "vcd" or "raw"
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
        if (name.endsWith(".bin") || name.endsWith(".raw") || name.endsWith(".dat")) {
            return "raw";
        }
        if (Files.exists(Path.of(file + ".json"))) {
            return "raw";
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

    /** The same message a capture reader gives: the file name, then what is wrong. */
    private static InputFormatException fault(Path file, String detail) {
        return new InputFormatException(name(file) + ": " + detail);
    }

    private static String name(Path file) {
        return String.valueOf(file.getFileName() == null ? file : file.getFileName());
    }
}
