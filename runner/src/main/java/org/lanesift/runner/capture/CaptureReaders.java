package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.Path;
import org.lanesift.plugin.OptionValues;
import org.lanesift.plugin.PluginDescriptor;

/**
 * The runner's capture reader plugins by id, as {@link org.lanesift.capture.Captures#pluginFor}
 * names them: their descriptors and readers, for the commands that read a capture without a chain
 * ({@code inspect}, {@code plan}) and for the acquisitions of a capture set.
 */
final class CaptureReaders {
    private CaptureReaders() {
    }

    /**
     * The descriptor of a capture reader plugin.
     *
     * @param plugin "csv", "vcd", "raw", "packed-logic" or "capture-set"
     * @return its descriptor
     */
    static PluginDescriptor descriptor(String plugin) {
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
     * @param plugin as from {@link org.lanesift.capture.Captures#pluginFor}
     * @param ov     options validated against {@link #descriptor}
     * @return the reader, positioned at the start
     * @throws IOException if the file cannot be read
     */
    static CaptureReader open(String plugin, OptionValues ov) throws IOException {
        return switch (plugin) {
            case "csv" -> CsvSource.reader(ov);
            case "vcd" -> VcdSource.reader(ov, false);
            case "packed-logic" -> PackedLogicSource.reader(ov, false);
            case "capture-set" -> new CaptureSetReader(CaptureSetFile.read(Path.of(ov.getString("file"))), false);
            default -> RawSource.reader(ov, false);
        };
    }
}
