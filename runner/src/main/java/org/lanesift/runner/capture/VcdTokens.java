package org.lanesift.runner.capture;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;

/**
 * Splits a VCD file into whitespace-separated tokens (IEEE 1364-2005 clause 18.2: tokens are
 * separated by white space), keeping the line number, with a bounded token length.
 */
final class VcdTokens {
    static final int MAX_TOKEN = 1 << 16;
    private final InputStream in;
    private final Path file;
    private final byte[] buf = new byte[1 << 16];
    private int pos;
    private int len;
    private boolean eof;
    /** The current token. */
    final byte[] tok = new byte[MAX_TOKEN];
    /** Its length; 0 at end of file. */
    int tokLen;
    /** Line of the current token, 1-based. */
    long tokLine;
    private long line = 1;
    private long bytesRead;

    VcdTokens(InputStream in, Path file) {
        this.in = in;
        this.file = file;
    }

    long bytesRead() {
        return bytesRead - (len - pos);
    }

    private int read() throws IOException {
        if (pos >= len) {
            if (eof) {
                return -1;
            }
            len = in.read(buf, 0, buf.length);
            pos = 0;
            if (len <= 0) {
                len = 0;
                eof = true;
                return -1;
            }
            bytesRead += len;
        }
        return buf[pos++] & 0xff;
    }

    /** Reads the next token; returns false at end of file. */
    boolean next() throws IOException {
        int c;
        do {
            c = read();
            if (c == '\n') {
                line++;
            }
        } while (c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == 0x0b);
        if (c < 0) {
            tokLen = 0;
            return false;
        }
        tokLine = line;
        int n = 0;
        while (c > ' ') {
            if (n >= MAX_TOKEN) {
                throw new CaptureFormatException(file, tokLine, "token longer than " + MAX_TOKEN + " bytes; expected a keyword,"
                        + " identifier code or value");
            }
            tok[n++] = (byte) c;
            c = read();
        }
        if (c == '\n') {
            line++;
        }
        tokLen = n;
        return true;
    }

    boolean is(String s) {
        if (tokLen != s.length()) {
            return false;
        }
        for (int i = 0; i < tokLen; i++) {
            if (tok[i] != s.charAt(i)) {
                return false;
            }
        }
        return true;
    }

    String text() {
        return new String(tok, 0, tokLen, StandardCharsets.ISO_8859_1);
    }

    String text(int from) {
        return new String(tok, from, tokLen - from, StandardCharsets.ISO_8859_1);
    }

    String shown() {
        return tokLen > 40 ? new String(tok, 0, 40, StandardCharsets.ISO_8859_1) + "..." : text();
    }

    /** A format error at the current token's line. */
    CaptureFormatException error(String msg) {
        return new CaptureFormatException(file, tokLine, msg);
    }

    /** The file ended inside a section opened by {@code kw}. */
    CaptureFormatException truncated(String kw) {
        return new CaptureFormatException(file, tokLine, "truncated: the file ends inside " + kw + "; expected $end");
    }

    /** Reads the {@code $end} that must follow {@code kw} directly. */
    void expectEnd(String kw) throws IOException {
        if (!next()) {
            throw truncated(kw);
        }
        if (!is("$end")) {
            throw error(kw + ": expected $end, found '" + shown() + "'");
        }
    }

    /** Skips everything up to and including the next {@code $end}. */
    void skipToEnd(String kw) throws IOException {
        while (true) {
            if (!next()) {
                throw truncated(kw);
            }
            if (is("$end")) {
                return;
            }
        }
    }
}
