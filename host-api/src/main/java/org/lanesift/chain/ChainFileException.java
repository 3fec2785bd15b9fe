package org.lanesift.chain;

/**
 * A chain file that cannot be read: a JSON syntax error (with line, column and pointer), a field of the
 * wrong type, an unknown key, a missing field. {@link #getMessage()} is one line that starts with
 * the file and the location, such as {@code chain.json /wires/2/to: expected a string}.
 */
public final class ChainFileException extends ChainException {
    private static final long serialVersionUID = 1L;
    /** The chain file as the user named it. */
    private final String file;
    /** 1-based line of a syntax error, or 0. */
    private final long line;

    /**
     * Creates the exception.
     *
     * @param file    the chain file as the user named it
     * @param pointer JSON pointer of the offending value, or null
     * @param line    1-based line, or 0 when the location is a pointer
     * @param column  1-based column, or 0
     * @param what    what is wrong and what was expected
     */
    public ChainFileException(String file, String pointer, long line, long column, String what) {
        super(where(file, pointer, line, column) + ": " + what, pointer);
        this.file = file;
        this.line = line;
    }

    /**
     * A chain file that is not acceptable JSON; the message is the JSON reader's, which names the
     * file, line, column and JSON pointer, so it reads the same as for every other JSON input.
     *
     * @param e the reader's fault
     */
    public ChainFileException(org.lanesift.json.JsonParseException e) {
        super(e.getMessage(), e.pointer(), e);
        this.file = e.source();
        this.line = e.line();
    }

    private static String where(String file, String pointer, long line, long column) {
        StringBuilder sb = new StringBuilder(file);
        if (line > 0) {
            sb.append(" line ").append(line);
            if (column > 0) {
                sb.append(" column ").append(column);
            }
        } else if (pointer != null) {
            // RFC 6901: "" is the whole document ("/" would be a member with an empty name)
            sb.append(' ').append(pointer.isEmpty() ? "at the top level" : pointer);
        }
        return sb.toString();
    }

    /**
     * The chain file.
     *
     * @return the name as given
     */
    public String file() {
        return file;
    }

    /**
     * The line of a syntax error.
     *
     * @return 1-based line, or 0 if the location is a pointer
     */
    public long line() {
        return line;
    }
}
