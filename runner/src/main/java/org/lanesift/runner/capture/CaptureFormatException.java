package org.lanesift.runner.capture;

import java.nio.file.Path;

/**
 * A capture file (CSV, VCD, raw binary or its JSON sidecar) that cannot be read as documented in
 * {@code docs/capture-*.md}. The message starts with the file name and, where there is one, the
 * line ({@code capture.csv line 17: expected 4 fields, found 3}) or the field of the sidecar
 * ({@code capture.bin.json /rateHz: ...}), and says what was expected.
 */
public class CaptureFormatException extends org.lanesift.plugin.InputFormatException {
    private static final long serialVersionUID = 1L;
    private final transient Path file;
    private final long line;

    /**
     * Creates the exception; the message is prefixed with the file name and line.
     *
     * @param file   the offending file
     * @param line   1-based line number, or 0 when the problem has no line
     * @param detail what was wrong and what was expected
     */
    public CaptureFormatException(Path file, long line, String detail) {
        super(prefix(file, line) + detail);
        this.file = file;
        this.line = line;
    }

    /**
     * Creates the exception with a cause (an I/O error).
     *
     * @param file   the offending file
     * @param line   1-based line, or 0
     * @param detail what was wrong
     * @param cause  the underlying error
     */
    public CaptureFormatException(Path file, long line, String detail, Throwable cause) {
        super(prefix(file, line) + detail, cause);
        this.file = file;
        this.line = line;
    }

    /**
     * A JSON file of a capture (a sidecar) that the JSON reader refused; the message is the
     * reader's, naming the file, line, column and JSON pointer, like every other JSON input's.
     *
     * @param file the JSON file
     * @param e    the reader's fault
     */
    public CaptureFormatException(Path file, org.lanesift.json.JsonParseException e) {
        super(e.getMessage(), e);
        this.file = file;
        this.line = e.line();
    }

    private static String prefix(Path file, long line) {
        String name = file == null ? "(capture)" : String.valueOf(file.getFileName() == null ? file : file.getFileName());
        return name + (line > 0 ? " line " + line + ": " : ": ");
    }

    /**
     * The offending file.
     *
     * @return path as given to the reader
     */
    public Path file() {
        return file;
    }

    /**
     * The offending line.
     *
     * @return 1-based line number, or 0 if the problem is not tied to a line
     */
    public long line() {
        return line;
    }

    /**
     * Refuses a capture or sidecar path that is a directory, pipe, device or socket (host-api
     * {@link org.lanesift.plugin.InputFiles}), before it is opened.
     *
     * @param file the path
     * @throws CaptureFormatException naming the file
     */
    public static void requireRegular(Path file) {
        String why = org.lanesift.plugin.InputFiles.whyNotRegular(file);
        if (why != null) {
            throw new CaptureFormatException(file, 0, why);
        }
    }
}
