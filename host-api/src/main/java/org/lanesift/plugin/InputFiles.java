package org.lanesift.plugin;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.Arrays;

/**
 * The one rule for opening a file the user named as input (a capture, a sidecar, a chain file, a
 * skew table, a mapping or mask file, a spool): only a regular file (or a link to one) is read as a
 * file; a directory, a named pipe (FIFO), a device or a socket is refused with one line before it is
 * opened, because opening a pipe waits for a writer and a device such as {@code /dev/zero} never
 * ends. Size limits count the bytes actually read, never the size the file system reports (0 for a
 * device, and a file may grow while it is read).
 */
public final class InputFiles {
    private InputFiles() {
    }

    /**
     * Refuses a path that exists and is not a regular file. A missing file passes, so the caller
     * reports it as it always has (a {@link java.nio.file.NoSuchFileException} when it opens it).
     *
     * @param file  the path
     * @param shown what to call it in the message (as the user named it)
     * @throws InputFormatException if it is a directory, pipe, device or socket
     */
    public static void requireRegular(Path file, String shown) {
        String why = whyNotRegular(file);
        if (why != null) {
            throw new InputFormatException(Echo.of(shown, 200) + ": " + why);
        }
    }

    /**
     * Why a path that exists cannot be read as a file, for readers that throw their own
     * {@link InputFormatException} subtype.
     *
     * @param file the path
     * @return the reason, such as "a directory, not a regular file; expected a file (...)", or null
     *         when it is a regular file, a link to one, or missing
     */
    public static String whyNotRegular(Path file) {
        BasicFileAttributes a;
        try {
            a = Files.readAttributes(file, BasicFileAttributes.class);
        } catch (IOException e) {
            return null; // missing or unreadable: the open that follows names it
        }
        if (a.isRegularFile()) {
            return null;
        }
        return kind(a) + ", not a regular file; expected a file (pipes, devices and directories are not read as files)";
    }

    private static String kind(BasicFileAttributes a) {
        if (a.isDirectory()) {
            return "a directory";
        }
        return "a pipe, device or socket";
    }

    /**
     * Reads a regular file, stopping after {@code maxBytes + 1} bytes.
     *
     * @param file     the file
     * @param shown    what to call it in messages
     * @param maxBytes the most bytes the caller accepts
     * @return the bytes read: the whole file, or {@code maxBytes + 1} bytes when it is longer
     * @throws InputFormatException if it is not a regular file
     * @throws IOException          if it cannot be read
     */
    public static byte[] readAtMost(Path file, String shown, int maxBytes) throws IOException {
        requireRegular(file, shown);
        int cap = maxBytes + 1;
        byte[] buf = new byte[Math.min(cap, 1 << 16)];
        int n = 0;
        try (InputStream in = Files.newInputStream(file)) {
            while (n < cap) {
                if (n == buf.length) {
                    buf = Arrays.copyOf(buf, (int) Math.min(cap, 2L * buf.length));
                }
                int r = in.read(buf, n, buf.length - n);
                if (r < 0) {
                    break;
                }
                n += r;
            }
        }
        return n == buf.length ? buf : Arrays.copyOf(buf, n);
    }
}
