package org.lanesift.runner.capture;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Locale;

/**
 * Chooses the source plugin for a capture file: by extension first ({@code .csv .tsv .txt} csv,
 * {@code .vcd} vcd, {@code .bin .raw .dat} raw), then by content (a file starting with a VCD
 * {@code $} keyword is vcd; a file with a {@code FILE.json} sidecar beside it is raw; text of
 * numbers and separators is csv). A raw file whose sidecar declares a packed logic format
 * ({@code logic8}, {@code logic16le}, {@code logic16be}) is packed-logic; a {@code .json} file of
 * format {@code lanesift-capture-set/1} is a capture set.
 */
public final class Captures {
    private Captures() {
    }

    /**
     * The plugin id that reads a file.
     *
     * @param file the capture
     * @return "csv", "vcd", "raw", "packed-logic" or "capture-set"
     * @throws CaptureFormatException when the file is missing or its kind cannot be told, naming the known extensions
     */
    public static String pluginFor(Path file) {
        String name = String.valueOf(file.getFileName()).toLowerCase(Locale.ROOT);
        if (!Files.exists(file)) {
            throw new CaptureFormatException(file, 0, "file not found");
        }
        if (name.endsWith(".csv") || name.endsWith(".tsv") || name.endsWith(".txt")) {
            return "csv";
        }
        if (name.endsWith(".vcd")) {
            return "vcd";
        }
        if (name.endsWith(".json") && CaptureSetFile.declaresSet(file)) {
            return "capture-set";
        }
        if (name.endsWith(".bin") || name.endsWith(".raw") || name.endsWith(".dat") || Files.exists(Path.of(file + ".json"))) {
            return PackedLogicSidecar.declaresPacked(Path.of(file + ".json")) ? "packed-logic" : "raw";
        }
        byte[] head;
        CaptureFormatException.requireRegular(file);
        try (InputStream in = Files.newInputStream(file)) {
            head = in.readNBytes(4096);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, "file not found");
        } catch (IOException e) {
            throw new CaptureFormatException(file, 0, "cannot read: " + e.getMessage(), e);
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
        throw new CaptureFormatException(file, 0, "cannot tell the capture format; known extensions: .csv .tsv .txt (csv),"
                + " .vcd (vcd), .bin .raw .dat (raw binary with a FILE.json sidecar)");
    }

    /**
     * The descriptor of a capture reader plugin.
     *
     * @param plugin "csv", "vcd", "raw", "packed-logic" or "capture-set"
     * @return its descriptor
     */
    static org.lanesift.plugin.PluginDescriptor descriptor(String plugin) {
        return switch (plugin) {
            case "csv" -> CsvSource.DESCRIPTOR;
            case "vcd" -> VcdSource.DESCRIPTOR;
            case "packed-logic" -> PackedLogicSource.DESCRIPTOR;
            case "capture-set" -> CaptureSetSource.DESCRIPTOR;
            default -> RawSource.DESCRIPTOR;
        };
    }

    /**
     * Opens the reader of a capture reader plugin with validated options.
     *
     * @param plugin as from {@link #pluginFor}
     * @param ov     options validated against {@link #descriptor}
     * @return the reader, positioned at the start
     * @throws IOException if the file cannot be read
     */
    static CaptureReader open(String plugin, org.lanesift.plugin.OptionValues ov) throws IOException {
        return switch (plugin) {
            case "csv" -> CsvSource.reader(ov);
            case "vcd" -> VcdSource.reader(ov, false);
            case "packed-logic" -> PackedLogicSource.reader(ov, false);
            case "capture-set" -> new CaptureSetReader(CaptureSetFile.read(Path.of(ov.getString("file"))), false);
            default -> RawSource.reader(ov, false);
        };
    }
}
