package org.lanesift.runner.capture;

import java.io.IOException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import org.lanesift.json.JsonParseException;
import org.lanesift.json.JsonReader;
import org.lanesift.json.JsonValue;

/**
 * Reads the JSON file of a capture (a sidecar, a capture set) with the project's one JSON reader,
 * turning every failure into a {@link CaptureFormatException} naming the file: the reader's own
 * message for a syntax or limit error, {@code notFound} for a missing file.
 */
final class CaptureJson {
    private CaptureJson() {
    }

    static JsonValue read(Path file, String notFound) {
        try {
            return JsonReader.read(file, String.valueOf(file.getFileName() == null ? file : file.getFileName()));
        } catch (JsonParseException e) {
            throw new CaptureFormatException(file, e);
        } catch (NoSuchFileException e) {
            throw new CaptureFormatException(file, 0, notFound);
        } catch (IOException e) {
            throw new CaptureFormatException(file, 0, "cannot read: " + e.getMessage(), e);
        }
    }
}
