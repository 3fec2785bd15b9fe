package org.lanesift.data;

import java.util.Objects;

/**
 * A named file a plugin produced, such as a timing report in JSON, an init sequence as a C array,
 * or an eye diagram as PNG. Hosts decide where it goes: the command line writes it under
 * {@code --out}, a GUI may show it.
 *
 * @param channel   producing instance or subject
 * @param startFs   start of the span it describes
 * @param endFs     end of the span it describes
 * @param fileName  a relative file name with extension, no directories ({@code "timing.json"})
 * @param mediaType an IANA media type ({@code "application/json"}, {@code "image/png"}, {@code "text/csv"})
 * @param content   the bytes
 */
public record Artifact(String channel, long startFs, long endFs, String fileName, String mediaType, byte[] content)
        implements Block {

    /**
     * Checks the file name is a plain name.
     *
     * @param channel producing instance or subject
     * @param startFs start of the span it describes
     * @param endFs end of the span it describes
     * @param fileName a relative file name with extension, no directories ({@code "timing.json"})
     * @param mediaType an IANA media type ({@code "application/json"}, {@code "image/png"}, {@code "text/csv"})
     * @param content the bytes
     */
    public Artifact {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(content, "content");
        if (fileName == null || fileName.isEmpty() || fileName.contains("/") || fileName.contains("\\") || fileName.startsWith(".")) {
            throw new IllegalArgumentException("artifact file name must be a plain relative name, got '" + fileName + "'");
        }
    }

    @Override
    public DataKind kind() {
        return DataKind.ARTIFACT;
    }

    @Override
    public String toString() {
        return "Artifact[" + fileName + ", " + content.length + " bytes]";
    }
}
