package org.lanesift.plugins.serial;

import java.io.IOException;
import java.io.Reader;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Properties;

/** File names and small property files of a spool directory (docs/spool.md). */
final class SpoolFiles {
    static final String HEADER = "spool.properties";
    static final String CLOSED = "spool.closed";
    static final String DECODE_POS = "decode.pos";
    static final int MAX_SEGMENTS = 999_999;

    private SpoolFiles() {
    }

    static Path segment(Path dir, int n) {
        return dir.resolve(String.format("seg-%06d.bin", n));
    }

    static Path index(Path dir, int n) {
        return dir.resolve(String.format("seg-%06d.idx", n));
    }

    static Path segmentInfo(Path dir, int n) {
        return dir.resolve(String.format("seg-%06d.properties", n));
    }

    static Path segmentClosed(Path dir, int n) {
        return dir.resolve(String.format("seg-%06d.closed", n));
    }

    static void writeAtomically(Path file, Properties p) throws IOException {
        Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
        try (Writer w = Files.newBufferedWriter(tmp, StandardCharsets.UTF_8)) {
            p.store(w, null);
        }
        Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
    }

    static Properties read(Path file) throws IOException {
        byte[] b = org.lanesift.plugin.InputFiles.readAtMost(file, file.toString(), 65536);
        if (b.length > 65536) {
            throw new DeviceException(file + ": larger than 64 KiB, not a spool property file");
        }
        Properties p = new Properties();
        try (Reader r = new java.io.StringReader(new String(b, StandardCharsets.UTF_8))) {
            p.load(r);
        }
        return p;
    }
}
