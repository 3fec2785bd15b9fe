package org.lanesift.runner;

import java.nio.file.Path;
import java.util.Map;

/**
 * What {@code inspect} needs from the capture readers: a summary of one capture file as text
 * and as JSON. Kept as an interface so the command line does not depend on how the readers
 * analyse a capture.
 */
interface CaptureInspector {
    /**
     * Summarises a capture.
     *
     * @param file    the capture
     * @param options reader options such as {@code rate}
     * @param json    true for the JSON form, false for text
     * @return the summary
     */
    String inspect(Path file, Map<String, String> options, boolean json);
}
