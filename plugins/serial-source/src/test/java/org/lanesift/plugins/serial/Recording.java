package org.lanesift.plugins.serial;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.HexFormat;

/** A device-side link that hashes (SHA-256) everything the device sends, and spool hashing. */
final class Recording implements SerialLink {
    private final SerialLink inner;
    private final MessageDigest md;
    private long bytes;

    Recording(SerialLink inner) {
        this.inner = inner;
        try {
            md = MessageDigest.getInstance("SHA-256");
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    @Override
    public int read(byte[] b, int off, int len) {
        return inner.read(b, off, len);
    }

    @Override
    public synchronized void write(byte[] b) {
        inner.write(b);
        md.update(b);
        bytes += b.length;
    }

    synchronized long bytes() {
        return bytes;
    }

    synchronized String digest() {
        try {
            return HexFormat.of().formatHex(((MessageDigest) md.clone()).digest());
        } catch (CloneNotSupportedException e) {
            throw new IllegalStateException(e);
        }
    }

    @Override
    public String name() {
        return inner.name();
    }

    @Override
    public void close() {
        inner.close();
    }

    /** SHA-256 over the spool's segments in order, from the files on disk. */
    static String spoolDigest(Path dir, int fromSegment, int toSegment) throws Exception {
        MessageDigest md = MessageDigest.getInstance("SHA-256");
        byte[] buf = new byte[1 << 16];
        for (int s = fromSegment; s <= toSegment; s++) {
            try (InputStream in = Files.newInputStream(SpoolFiles.segment(dir, s))) {
                int n;
                while ((n = in.read(buf)) > 0) {
                    md.update(buf, 0, n);
                }
            } catch (IOException e) {
                throw e;
            }
        }
        return HexFormat.of().formatHex(md.digest());
    }
}
