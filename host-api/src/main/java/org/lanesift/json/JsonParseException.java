package org.lanesift.json;

/**
 * JSON text that does not follow RFC 8259 (or exceeds a reader limit). The message reads
 * {@code source:line:column: reason}; the parts are also available one by one, so that a caller
 * can phrase its own message.
 */
public final class JsonParseException extends IllegalArgumentException {
    /** Serialization version. */
    private static final long serialVersionUID = 1L;
    /** What the text was called. */
    private final String source;
    /** Line, from 1. */
    private final int line;
    /** Column, from 1. */
    private final int column;
    /** What was wrong and what was expected. */
    private final String reason;

    /**
     * Creates the exception.
     *
     * @param source what the text is called (a file name)
     * @param line   line, counting from 1
     * @param column column, counting characters from 1
     * @param reason what was found and what was expected
     */
    public JsonParseException(String source, int line, int column, String reason) {
        super(source + ":" + line + ":" + column + ": " + reason);
        this.source = source;
        this.line = line;
        this.column = column;
        this.reason = reason;
    }

    /**
     * What the text is called in the message.
     *
     * @return the source name
     */
    public String source() {
        return source;
    }

    /**
     * The line of the fault, counting from 1.
     *
     * @return the line
     */
    public int line() {
        return line;
    }

    /**
     * The column of the fault, counting characters (UTF-16 units) from 1.
     *
     * @return the column
     */
    public int column() {
        return column;
    }

    /**
     * What was wrong, without the position.
     *
     * @return the reason
     */
    public String reason() {
        return reason;
    }
}
