package org.lanesift.json;

/**
 * JSON text that does not follow RFC 8259 (or exceeds a reader limit). The message reads
 * {@code source line L column C at POINTER: reason}, POINTER being the RFC 6901 JSON pointer of the
 * offending place, or {@code the top level} for the whole text; the parts are also available one by
 * one, so that a caller can phrase its own message.
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
    /** RFC 6901 pointer of the place, "" for the whole text. */
    private final String pointer;
    /** What was wrong and what was expected. */
    private final String reason;

    /**
     * Creates the exception.
     *
     * @param source  what the text is called (a file name)
     * @param line    line, counting from 1
     * @param column  column, counting characters from 1
     * @param pointer RFC 6901 JSON pointer of the offending place, "" for the whole text
     * @param reason  what was found and what was expected
     */
    public JsonParseException(String source, int line, int column, String pointer, String reason) {
        super(source + " line " + line + " column " + column + " at " + (pointer.isEmpty() ? "the top level" : pointer)
                + ": " + reason);
        this.source = source;
        this.line = line;
        this.column = column;
        this.pointer = pointer;
        this.reason = reason;
    }

    /**
     * The RFC 6901 JSON pointer of the offending place: the member or element being read, or the
     * container in which a separator or name was expected.
     *
     * @return the pointer, "" for the whole text
     */
    public String pointer() {
        return pointer;
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
